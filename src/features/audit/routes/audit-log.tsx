import { ArrowRight, FilterX } from 'lucide-react';
import { Link } from 'react-router-dom';
import { AUDIT_ENTITY_LABELS, type AuditEntryDto, type AuditQuery } from '@shared/schemas/audit';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { PagedTable } from '@/components/paged-table';
import { useWorkshop } from '@/lib/workshop';
import { formatChange, formatDate, formatDateTime, formatMoney } from '@/lib/format';
import { useTableState } from '@/lib/use-table-state';
import { useAudit, useAuditFilters } from '../api/audit';

const PAGE_SIZE = 25;

const ACTION_WORDS: Record<string, string> = {
  create: 'added',
  update: 'changed',
  archive: 'archived',
  restore: 'restored',
  apply: 'applied',
  password_reset: 'reset the password of',
  revise: 'revised',
  reprice: 'repriced',
  state: 'moved on',
  calibrate: 'calibrated',
  cancel: 'cancelled',
  book: 'booked',
  move: 'moved',
  'session-done': 'logged a session of',
  send: 'sent',
  accept: 'accepted',
  decline: 'declined',
  withdraw: 'withdrew',
  deposit_paid: 'received the deposit for',
  caption: 'captioned',
};

/** Whole actions whose words depend on the record more than on the verb. */
const WHOLE_ACTIONS: Record<string, string> = {
  'photo.add': 'added photos to',
  'photo.delete': 'removed a photo from',
  'stock.update': 'counted the stock of',
  'quote.accept': 'the customer accepted',
  'quote.decline': 'the customer declined',
  'user.password_reset_requested': 'a password link was asked for',
  'user.password_reset_by_link': 'set a new password by link:',
};

function describeAction(action: string): string {
  if (WHOLE_ACTIONS[action]) return WHOLE_ACTIONS[action];
  const [, verb = action] = action.split('.');
  return ACTION_WORDS[verb] ?? verb.replace(/[-_]/g, ' ');
}

/** Internal working the log keeps for the record but never shows: payment-session ids, outbox ids, price-list hashes. */
const HIDDEN = new Set(['outbox', 'catalogVersion', 'photos', 'photo', 'copiedFrom', 'key']);
/** A value that is a machine's reference (a payment session "cs_…"), not words: kept, not shown. */
const MACHINE_ID = /^[a-z]{2,6}_[A-Za-z0-9_]{8,}$/;

function show(v: unknown, key = '', currency = ''): string {
  if (v === null || v === undefined) return '—';
  const leafKey = key.split('.').at(-1) ?? key;
  // Money the payment provider counts in minor units (pence) reads as money.
  if (leafKey === 'amountMinor' && currency && /^-?\d+$/.test(String(v))) {
    const minor = BigInt(String(v));
    const sign = minor < 0n ? '-' : '';
    const abs = minor < 0n ? -minor : minor;
    return formatMoney(`${sign}${abs / 100n}.${String(abs % 100n).padStart(2, '0')}`, currency);
  }
  if ((leafKey === 'total' || leafKey === 'deposit' || leafKey === 'amount') && currency && /^-?\d+(\.\d+)?$/.test(String(v))) return formatMoney(String(v), currency);
  if (Array.isArray(v)) return `${v.length} item${v.length === 1 ? '' : 's'}`;
  if (typeof v === 'object') return JSON.stringify(v).slice(0, 60);
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  const leaf = key.split('.').at(-1) ?? key;
  if ((leaf === 'price' || leaf === 'perHour') && currency && /^\d+(\.\d+)?$/.test(String(v))) return formatMoney(String(v), currency) + (leaf === 'perHour' ? ' an hour' : '');
  if (leaf === 'changePct') return formatChange(String(v));
  if (/Pct$/.test(leaf)) return `${String(v)} %`;
  if (/^\d{4}-\d{2}-\d{2}$/.test(String(v))) return formatDate(String(v));
  return String(v);
}

/** Field names as the page says them. */
const FIELD_WORDS: Record<string, string> = {
  price: 'price',
  effectiveFrom: 'from',
  changePct: 'change',
  source: 'source',
  perHour: 'rate',
  supplierCode: 'supplier code',
  amountMinor: 'amount',
  ip: 'from the address',
  to: 'sent to',
  discountPct: 'discount',
};
function fieldWords(k: string): string {
  return (
    FIELD_WORDS[k] ??
    k
      .replace(/^settings\./, '')
      .split('.')
      .map((seg) => seg.replace(/Pct$/, ' %').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase())
      .join(' › ')
  );
}
const FIRST = ['price', 'perHour', 'effectiveFrom', 'changePct'];

const CONTEXT_KEYS = ['material', 'pack', 'name'];

/** The change as "field: old → new" lines; fields that only name the thing come first as context. */
export function ChangeSummary({ before, after, currency }: { before: unknown; after: unknown; currency: string }) {
  const b = (before && typeof before === 'object' ? before : {}) as Record<string, unknown>;
  const a = (after && typeof after === 'object' ? after : {}) as Record<string, unknown>;
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])];
  // JSONB keeps keys in its own order: put the naming fields and the price first.
  const context = CONTEXT_KEYS.filter((k) => keys.includes(k) && JSON.stringify(a[k] ?? b[k]) === JSON.stringify(b[k] ?? a[k]));
  const rank = (k: string) => (FIRST.includes(k) ? FIRST.indexOf(k) : FIRST.length);
  const changed = keys.filter((k) => !context.includes(k) && !HIDDEN.has(k) && !MACHINE_ID.test(String(a[k] ?? b[k])) && JSON.stringify(a[k]) !== JSON.stringify(b[k])).sort((x, y) => rank(x) - rank(y));
  return (
    <div className="max-w-xl text-sm">
      {context.length > 0 && <p className="font-medium text-walnut-800">{context.map((k) => show(a[k] ?? b[k], k, currency)).join(', ')}</p>}
      <ul className="space-y-0.5">
        {changed.slice(0, 8).map((k) => (
          <li key={k} className="flex flex-wrap items-center gap-1 text-walnut-700">
            <span className="text-xs text-walnut-500">{fieldWords(k)}</span>
            {k in b && <span className="num rounded bg-parchment-100 px-1 line-through decoration-walnut-300">{show(b[k], k, currency)}</span>}
            {k in b && <ArrowRight className="h-3 w-3 text-walnut-400" aria-label="to" />}
            <span className="num rounded bg-amber-50 px-1 font-medium text-walnut-900">{k in a ? show(a[k], k, currency) : '(removed)'}</span>
          </li>
        ))}
        {changed.length > 8 && <li className="text-xs text-walnut-500">and {changed.length - 8} more</li>}
      </ul>
    </div>
  );
}

export function AuditLogPage() {
  const table = useTableState({ sort: 'at', dir: 'desc', filters: ['entityType', 'userId', 'from', 'to'] });
  const filters = useAuditFilters();
  const currency = useWorkshop().data?.settings.pricing.currency ?? '';
  const f = table.state.filters;
  const query: Partial<AuditQuery> = {
    entityType: f.entityType || undefined,
    userId: f.userId ? Number(f.userId) : undefined,
    from: f.from || undefined,
    to: f.to || undefined,
    dir: table.state.dir,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const log = useAudit(query);
  const columns: Column<AuditEntryDto>[] = [
    { key: 'at', header: 'When', sortKey: 'at', render: (e) => <span className="whitespace-nowrap text-walnut-700">{formatDateTime(e.at)}</span> },
    { key: 'who', header: 'Who', render: (e) => e.userName ?? <span className="text-walnut-400">the system</span> },
    {
      key: 'what',
      header: 'What',
      render: (e) => (
        <span className="whitespace-nowrap">
          {describeAction(e.action)} <span className="rounded bg-parchment-100 px-1.5 py-0.5 text-xs text-walnut-700">{AUDIT_ENTITY_LABELS[e.entityType] ?? e.entityType}</span>
          {e.subject && (
            <Link to={e.subject.path} className="ml-1.5 font-medium text-walnut-800 underline decoration-walnut-300 underline-offset-2 hover:decoration-walnut-700">
              {e.subject.label}
            </Link>
          )}
        </span>
      ),
    },
    { key: 'change', header: 'From → to', render: (e) => <ChangeSummary before={e.before} after={e.after} currency={currency} /> },
  ];
  const filtered = Object.values(f).some(Boolean);
  return (
    <>
      <PageHeader title="Audit log" description="Who changed which price, rate, setting, system, species or user, from what to what, and when. Entries are written with the change itself and never edited." />
      <form className="mb-4 flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()} aria-label="Filter the audit log">
        <label className="text-sm text-walnut-700">
          <span className="mb-1 block font-medium">Record</span>
          <select value={f.entityType} onChange={(e) => table.setFilter('entityType', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
            <option value="">All records</option>
            {(filters.data?.entityTypes ?? []).map((t) => <option key={t} value={t}>{AUDIT_ENTITY_LABELS[t] ?? t}</option>)}
          </select>
        </label>
        <label className="text-sm text-walnut-700">
          <span className="mb-1 block font-medium">Person</span>
          <select value={f.userId} onChange={(e) => table.setFilter('userId', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-2 text-sm">
            <option value="">Everyone</option>
            {(filters.data?.users ?? []).map((u) => <option key={u.id} value={u.id}>{u.name}</option>)}
          </select>
        </label>
        <label className="text-sm text-walnut-700">
          <span className="mb-1 block font-medium">From (date)</span>
          <input type="date" value={f.from} onChange={(e) => table.setFilter('from', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-1.5 text-sm" />
        </label>
        <label className="text-sm text-walnut-700">
          <span className="mb-1 block font-medium">To (date, included)</span>
          <input type="date" value={f.to} onChange={(e) => table.setFilter('to', e.target.value)} className="rounded-md border border-walnut-200 bg-white px-3 py-1.5 text-sm" />
        </label>
        {filtered && (
          <Button variant="ghost" onClick={() => ['entityType', 'userId', 'from', 'to'].forEach((k) => table.setFilter(k, ''))}>
            <FilterX className="h-4 w-4" aria-hidden /> Clear filters
          </Button>
        )}
      </form>
      <PagedTable
        caption="Audit log"
        columns={columns}
        rowKey={(e) => e.id}
        query={log}
        table={table}
        pageSize={PAGE_SIZE}
        empty="No entry matches these filters."
        errorTitle="The audit log could not be loaded"
        sort="at"
      />
    </>
  );
}

export const Component = AuditLogPage;
