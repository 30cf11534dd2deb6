/**
 * The acceptance record: what the customer agreed to (the work, the extras they ticked, the agreed total, deposit and
 * balance), who accepted (the typed name), when, and from which network address. One page for the customer's and
 * the workshop's files, in the quote's Lora and walnut.
 */
import { drawContactFooter, drawLetterhead, openPdf } from './pdf-document';
import { LORA } from './pdf-fonts';
import { formatHours, formatMoney, formatPercent } from './pdf-format';
import { INK, STYLE, drawTable, type TableRow } from './pdf-layout';

export interface AcceptanceRecord {
  paperSize: 'A4' | 'Letter';
  workshop: { name: string; address: string | null; email: string | null; phone: string | null };
  quoteNumber: string;
  estimateNumber: string;
  customerName: string;
  piece: string;
  systemName: string;
  currency: string;
  taxLabel: string;
  /** The quoted total before extras. */
  quotedTotal: string;
  extrasTaken: { label: string; hours: number; price: string }[];
  extrasDeclined: string[];
  /**
   * A quote of several pieces or with options: the work chosen, piece by piece, and the options not taken. The quoted
   * total above is then the sum of the chosen lines.
   */
  choices?: { piece: string; option: string; hours: number; total: string }[];
  optionsDeclined?: string[];
  agreedTotal: string;
  depositPct: number;
  deposit: string;
  balance: string;
  acceptedName: string;
  /** ISO date-time. */
  acceptedAt: string;
  acceptedIp: string;
  depositPaidAt: string | null;
  terms: string[];
}

const when = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit', second: '2-digit', timeZone: 'UTC', timeZoneName: 'short' });

export async function renderAcceptancePdf(r: AcceptanceRecord): Promise<Buffer> {
  const { flow, finish } = openPdf(r.paperSize, {
    title: `Acceptance of quote ${r.quoteNumber}`,
    author: r.workshop.name,
    subject: `What ${r.acceptedName} agreed to for ${r.piece}`,
  });
  const money = (a: string) => formatMoney(a, r.currency);

  drawLetterhead(flow, r.workshop.name, `Acceptance of quote ${r.quoteNumber}`, `${r.piece} · estimate ${r.estimateNumber} · ${r.systemName}`);

  flow.heading('Who accepted, and when', 80);
  drawTable(flow, {
    columns: [
      { header: '', width: 170 },
      { header: '', width: 0 },
    ],
    rows: [
      ['Quote prepared for', r.customerName],
      ['Accepted by (typed name)', { text: r.acceptedName, style: STYLE.cellStrong }],
      ['Accepted on', when.format(new Date(r.acceptedAt))],
      ['From the network address', r.acceptedIp || 'not recorded'],
      ['Deposit', r.depositPaidAt ? `Paid on ${when.format(new Date(r.depositPaidAt))}` : 'Not paid yet'],
    ],
  });
  flow.gap(20);

  flow.heading('What was agreed', 120);
  const rows: TableRow[] = r.choices
    ? r.choices.map((c): TableRow => [{ text: c.piece, style: STYLE.cellStrong, note: `${c.option}, ${r.taxLabel || 'tax'} included` }, formatHours(c.hours), money(c.total)])
    : [[`The finishing work as quoted, ${r.taxLabel || 'tax'} included`, '', money(r.quotedTotal)]];
  for (const x of r.extrasTaken) rows.push([{ text: `Extra: ${x.label}`, style: STYLE.cellStrong }, formatHours(x.hours), money(x.price)]);
  drawTable(flow, {
    columns: [
      { header: 'Item', width: 0 },
      { header: 'Hands-on', width: 70, align: 'right' },
      { header: `Amount (${r.currency.toUpperCase()})`, width: 120, align: 'right' },
    ],
    rows,
    footer: [
      [{ text: 'Agreed total', style: { font: LORA.semibold, size: 11, color: INK.walnut } }, '', { text: money(r.agreedTotal), style: { font: LORA.bold, size: 11.5, color: INK.walnut } }],
      [`Deposit (${formatPercent(r.depositPct)})`, '', money(r.deposit)],
      ['Balance when the piece is ready', '', money(r.balance)],
    ],
    footerStyle: STYLE.cellStrong,
  });
  if (r.optionsDeclined && r.optionsDeclined.length > 0) {
    flow.gap(6);
    flow.paragraph(`Options offered and not chosen: ${r.optionsDeclined.join('; ')}.`, STYLE.smallItalic);
  }
  if (r.extrasDeclined.length > 0) {
    flow.gap(6);
    flow.paragraph(`Extras offered and not taken: ${r.extrasDeclined.join(', ')}.`, STYLE.smallItalic);
  }
  flow.gap(20);

  flow.heading('Terms accepted', 60);
  r.terms.forEach((t, i) => flow.paragraph(`${i + 1}. ${t}`, { ...STYLE.small, size: 9 }, { after: 3 }));
  flow.gap(14);
  flow.paragraph(
    'The customer accepted by typing their name and ticking that they had read the quote, its terms and the safety notes, through the private link sent to them.',
    STYLE.smallItalic,
  );

  drawContactFooter(flow, r.workshop);
  return finish();
}
