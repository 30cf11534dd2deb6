import { ArrowLeft, CircleAlert, CircleCheck, CirclePlus, CircleX, Equal, FileQuestion, FileUp, ListChecks, RefreshCw } from 'lucide-react';
import { useCallback, useRef, useState, type FormEvent, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { PRICE_FILE_COLUMNS, type PriceFileMatch, type PriceFileNewItem, type PriceFilePreview, type PriceFileRowError } from '@shared/schemas/price-list';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { DataTable, type Column } from '@/components/data-table';
import { paths } from '@/config/paths';
import { formatDate, formatDateTime, formatMoney } from '@/lib/format';
import { useLocalTable } from '@/lib/use-local-table';
import { RepriceNotice } from '@/features/reprice/components/reprice-notice';
import { useApplyPriceFile, useUploadPriceFile } from '@/features/price-list/api/price-files';
import { ChangeBadge } from '@/features/price-list/components/change-badge';

function Stat({ icon, label, value, tone }: { icon: ReactNode; label: string; value: number; tone: string }) {
  return (
    <div className={`flex items-center gap-3 rounded-lg border px-4 py-3 ${tone}`}>
      {icon}
      <div>
        <p className="num text-2xl font-semibold leading-none">{value}</p>
        <p className="mt-1 text-xs uppercase tracking-wide">{label}</p>
      </div>
    </div>
  );
}

/** A price the server flagged as looking wrong (a decimal slip, a pack mix-up): shown beside the price. */
function PriceFlag({ flag }: { flag?: string | null }) {
  if (!flag) return null;
  return (
    <span className="mt-0.5 flex items-center justify-end gap-1 text-xs font-medium text-brick-700">
      <CircleAlert className="h-3.5 w-3.5 shrink-0" aria-hidden /> {flag}
    </span>
  );
}

const matchValue = (r: PriceFileMatch, key: string) =>
  key === 'material' ? `${r.materialName} ${r.packSize.padStart(8, '0')}` : key === 'changePct' ? (r.changePct === null ? null : Number(r.changePct)) : key === 'newPrice' ? Number(r.newPrice) : r.line;

function MatchedTable({ rows, currency, caption }: { rows: PriceFileMatch[]; currency: string; caption: string }) {
  const t = useLocalTable(rows, { sort: 'line', value: matchValue });
  const columns: Column<PriceFileMatch>[] = [
    { key: 'line', header: 'Line', sortKey: 'line', align: 'right', render: (r) => r.line },
    { key: 'material', header: 'Material and pack', sortKey: 'material', render: (r) => <span><span className="font-medium text-walnut-900">{r.materialName}</span>, <span className="num">{r.packSize} {r.unit}</span></span> },
    { key: 'code', header: 'Supplier · code', render: (r) => <span className="text-walnut-600">{r.supplier} <span className="font-mono text-xs text-walnut-400">{r.supplierCode}</span></span> },
    { key: 'old', header: `Old price (${currency})`, align: 'right', render: (r) => (r.oldPrice ? formatMoney(r.oldPrice, currency) : <span className="text-walnut-400">none</span>) },
    { key: 'newPrice', header: `New price (${currency})`, sortKey: 'newPrice', align: 'right', render: (r) => <span><span className="font-semibold text-walnut-900">{formatMoney(r.newPrice, currency)}</span><PriceFlag flag={r.flag} /></span> },
    { key: 'changePct', header: 'Change', sortKey: 'changePct', align: 'right', render: (r) => <ChangeBadge pct={r.changePct} /> },
    { key: 'from', header: 'From', render: (r) => <span className="whitespace-nowrap">{formatDate(r.effectiveFrom)}</span> },
  ];
  return <DataTable caption={caption} columns={columns} rowKey={(r) => r.line} {...t} />;
}

function NewItemsTable({ rows, currency }: { rows: PriceFileNewItem[]; currency: string }) {
  const t = useLocalTable(rows, { sort: 'line', value: (r, k) => (k === 'material' ? r.materialName : r.line) });
  const columns: Column<PriceFileNewItem>[] = [
    { key: 'line', header: 'Line', sortKey: 'line', align: 'right', render: (r) => r.line },
    {
      key: 'kind',
      header: 'Adds',
      render: (r) => (
        <span className="inline-flex items-center gap-1 whitespace-nowrap rounded-full bg-amber-50 px-2 py-0.5 text-xs font-medium text-amber-800">
          <CirclePlus className="h-3.5 w-3.5" aria-hidden /> {r.kind === 'new-material' ? 'New material' : 'New pack'}
        </span>
      ),
    },
    { key: 'material', header: 'Material and pack', sortKey: 'material', render: (r) => <span><span className="font-medium text-walnut-900">{r.materialName}</span>, <span className="num">{r.packSize} {r.unit}</span></span> },
    { key: 'code', header: 'Supplier · code', render: (r) => <span className="text-walnut-600">{r.supplier} <span className="font-mono text-xs text-walnut-400">{r.supplierCode ?? ''}</span></span> },
    { key: 'price', header: `Price (${currency})`, align: 'right', render: (r) => <span><span className="font-semibold">{formatMoney(r.newPrice, currency)}</span><PriceFlag flag={r.flag} /></span> },
    { key: 'from', header: 'From', render: (r) => <span className="whitespace-nowrap">{formatDate(r.effectiveFrom)}</span> },
  ];
  return <DataTable caption="New items" columns={columns} rowKey={(r) => r.line} {...t} />;
}

function ErrorsTable({ rows }: { rows: PriceFileRowError[] }) {
  const t = useLocalTable(rows, { sort: 'line', value: (r) => r.line });
  const columns: Column<PriceFileRowError>[] = [
    { key: 'line', header: 'Line', sortKey: 'line', align: 'right', render: (r) => <span className="inline-flex items-center gap-1 font-semibold text-brick-700"><CircleX className="h-3.5 w-3.5" aria-hidden />{r.line}</span> },
    { key: 'reason', header: 'Why it cannot be read', render: (r) => r.reason },
  ];
  return <DataTable caption="Rows that cannot be read" columns={columns} rowKey={(r) => r.line} {...t} />;
}

function ColumnGuide() {
  return (
    <Card title="What the file should hold">
      <p className="mb-3 text-sm text-walnut-600">
        A CSV file with a header line, separated by commas or semicolons, up to 512 KB. Prices may use a decimal point or a decimal comma (12.50 or 12,50). Columns
        may come in any order; header names are matched without regard to case, spaces or underscores. Other columns are listed and ignored.
      </p>
      <table className="w-full text-sm">
        <caption className="sr-only">Columns of a supplier price file</caption>
        <thead className="text-left text-xs uppercase tracking-wide text-walnut-500">
          <tr>
            <th scope="col" className="py-1 pr-3">Column</th>
            <th scope="col" className="py-1 pr-3">Needed</th>
            <th scope="col" className="py-1">Holds</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {PRICE_FILE_COLUMNS.map((c) => (
            <tr key={c.name}>
              <td className="break-all py-1.5 pr-3 font-mono text-walnut-900">{c.name}</td>
              <td className="py-1.5 pr-3">{c.required ? <span className="inline-flex items-center gap-1 text-walnut-800"><CircleCheck className="h-3.5 w-3.5 text-amber-600" aria-hidden /> required</span> : <span className="text-walnut-500">optional</span>}</td>
              <td className="py-1.5 text-walnut-600">{c.text}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-3 text-xs text-walnut-500">
        Example: <span className="break-all font-mono">supplier;supplier_code;pack_size;unit;price;effective_date</span> then{' '}
        <span className="break-all font-mono">Quillby Finishing Supplies;SHELLAC-FLAKES-250;250;g;12,35;2027-01-04</span>
      </p>
    </Card>
  );
}

export function PriceFilePage() {
  const upload = useUploadPriceFile();
  const apply = useApplyPriceFile();
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string>();
  const [preview, setPreview] = useState<PriceFilePreview | null>(null);
  const input = useRef<HTMLInputElement>(null);

  const reset = useCallback(() => {
    setPreview(null);
    setFile(null);
    setFileError(undefined);
    upload.reset();
    apply.reset();
    if (input.current) input.current.value = '';
  }, [upload, apply]);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!file) return setFileError('Choose a CSV file first.');
    if (file.size > 512 * 1024) return setFileError('The file is larger than 512 KB.');
    setFileError(undefined);
    apply.reset();
    upload.mutate(file, { onSuccess: setPreview, onError: (err) => setFileError(err.message) });
  };

  const changes = preview ? preview.matched.length + preview.newItems.length : 0;
  return (
    <>
      <Link to={paths.priceList} className="mb-3 inline-flex items-center gap-1 text-sm text-walnut-600 hover:text-walnut-900">
        <ArrowLeft className="h-4 w-4" aria-hidden /> Price list
      </Link>
      <PageHeader
        title="Supplier price file"
        description="Read a supplier's price list, check every change it would make, then apply it in one go. Nothing changes until you confirm, and a file with an unreadable row changes nothing."
      />
      <div className={`grid grid-cols-1 gap-6 ${preview ? '' : 'xl:grid-cols-[minmax(0,1fr)_28rem]'}`}>
        <div className="space-y-6">
          <Card title="1. Choose the file">
            <form onSubmit={submit} noValidate className="flex flex-wrap items-end gap-3">
              <div className="min-w-0 max-w-full space-y-1">
                <label htmlFor="price-file" className="block text-sm font-medium text-walnut-800">CSV file</label>
                <input
                  id="price-file"
                  ref={input}
                  type="file"
                  accept=".csv,text/csv"
                  aria-invalid={fileError ? true : undefined}
                  onChange={(e) => {
                    setFile(e.target.files?.[0] ?? null);
                    setPreview(null);
                    setFileError(undefined);
                  }}
                  className="block w-full max-w-full text-sm text-walnut-700 file:mr-3 file:rounded-md file:border file:border-walnut-200 file:bg-parchment-100 file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-walnut-800 hover:file:bg-parchment-200"
                />
              </div>
              <Button type="submit" busy={upload.isPending}>
                <FileUp className="h-4 w-4" aria-hidden /> Read and preview
              </Button>
              {fileError && (
                <p className="basis-full text-sm text-brick-700" role="alert">
                  <span aria-hidden>▲</span> {fileError}
                </p>
              )}
            </form>
          </Card>

          {preview && (
            <Card title={`2. Check the preview of ${preview.fileName}`} actions={<span className="text-xs text-walnut-500">{preview.rowCount} rows · separated by “{preview.delimiter}”{preview.decimalSeparator ? ` · decimals with a ${preview.decimalSeparator === ',' ? 'comma' : 'point'}` : ''} · preview valid until {formatDateTime(preview.expiresAt)}</span>}>
              <div className="mb-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                <Stat icon={<RefreshCw className="h-5 w-5 text-amber-600" aria-hidden />} label="Prices to change" value={preview.matched.length} tone="border-amber-200 bg-amber-50 text-walnut-800" />
                <Stat icon={<CirclePlus className="h-5 w-5 text-amber-600" aria-hidden />} label="New items" value={preview.newItems.length} tone="border-parchment-300 bg-parchment-50 text-walnut-800" />
                <Stat icon={<Equal className="h-5 w-5 text-walnut-500" aria-hidden />} label="Unchanged" value={preview.unchanged.length} tone="border-parchment-200 bg-white text-walnut-700" />
                <Stat icon={<CircleX className="h-5 w-5 text-brick-600" aria-hidden />} label="Unreadable rows" value={preview.errors.length} tone={preview.errors.length ? 'border-brick-600/40 bg-brick-100 text-brick-700' : 'border-parchment-200 bg-white text-walnut-700'} />
              </div>
              <div className="space-y-4">
                {preview.unknownColumns.length > 0 && (
                  <Alert tone="info" title="Columns not used">
                    <FileQuestion className="mr-1 inline h-3.5 w-3.5" aria-hidden />
                    {preview.unknownColumns.join(', ')} — these are ignored.
                  </Alert>
                )}
                {[...preview.matched, ...preview.newItems].some((r) => r.flag) && (
                  <Alert tone="warning" title={`${[...preview.matched, ...preview.newItems].filter((r) => r.flag).length} price(s) look wrong`}>
                    Check the flagged prices below before applying: a misplaced decimal point or a price for another pack size is easy to miss.
                  </Alert>
                )}
                {preview.errors.length > 0 && (
                  <>
                    <Alert tone="error" title={`${preview.errors.length} row${preview.errors.length > 1 ? 's' : ''} cannot be read`}>
                      Nothing from this file can be applied until they are fixed. Correct the file and read it again.
                    </Alert>
                    <ErrorsTable rows={preview.errors} />
                  </>
                )}
                {preview.matched.length > 0 && (
                  <section aria-labelledby="matched-heading">
                    <h3 id="matched-heading" className="mb-2 text-base font-semibold text-walnut-800">Prices that change</h3>
                    <MatchedTable rows={preview.matched} currency={preview.currency} caption="Prices that change" />
                  </section>
                )}
                {preview.newItems.length > 0 && (
                  <section aria-labelledby="new-heading">
                    <h3 id="new-heading" className="mb-2 text-base font-semibold text-walnut-800">New items</h3>
                    <NewItemsTable rows={preview.newItems} currency={preview.currency} />
                  </section>
                )}
                {preview.unchanged.length > 0 && (
                  <details className="rounded-lg border border-parchment-200 bg-parchment-50 px-4 py-2 text-sm">
                    <summary className="cursor-pointer text-walnut-700">{preview.unchanged.length} row{preview.unchanged.length > 1 ? 's' : ''} at the price already in force</summary>
                    <div className="mt-2"><MatchedTable rows={preview.unchanged} currency={preview.currency} caption="Unchanged prices" /></div>
                  </details>
                )}
              </div>
            </Card>
          )}

          {preview && (
            <Card title="3. Apply">
              {apply.isSuccess ? (
                <div className="space-y-3">
                  <Alert tone="info" title="Price list updated">
                    {apply.data.pricesAdded} price{apply.data.pricesAdded === 1 ? '' : 's'} recorded, {apply.data.packsAdded} pack{apply.data.packsAdded === 1 ? '' : 's'} and {apply.data.materialsAdded} material{apply.data.materialsAdded === 1 ? '' : 's'} added. The old prices stay in each pack's history.
                  </Alert>
                  <RepriceNotice />
                  <div className="flex gap-2">
                    <Link to={paths.priceList} className="inline-flex items-center gap-2 rounded-md bg-walnut-800 px-4 py-2 text-sm font-medium text-parchment-50 hover:bg-walnut-700">
                      <ListChecks className="h-4 w-4" aria-hidden /> See the price list
                    </Link>
                    <Button variant="secondary" onClick={reset}>Upload another file</Button>
                  </div>
                </div>
              ) : (
                <div className="flex flex-wrap items-center gap-3">
                  <Button variant="accent" disabled={!preview.canApply} busy={apply.isPending} onClick={() => apply.mutate(preview)}>
                    <CircleCheck className="h-4 w-4" aria-hidden /> Apply {changes} change{changes === 1 ? '' : 's'}
                  </Button>
                  <Button variant="secondary" onClick={reset}>Discard</Button>
                  <p className="text-sm text-walnut-600">
                    {preview.canApply
                      ? 'Applies exactly what is shown above, in one step. If someone changes one of these prices meanwhile, nothing is applied and you are asked to read the file again.'
                      : preview.errors.length
                        ? 'Fix the unreadable rows first.'
                        : 'This file changes no price.'}
                  </p>
                  {apply.isError && <div className="basis-full"><Alert tone="error" title="Not applied — nothing changed">{apply.error.message}</Alert></div>}
                </div>
              )}
            </Card>
          )}
        </div>
        <div>
          <ColumnGuide />
        </div>
      </div>
    </>
  );
}

export const Component = PriceFilePage;
