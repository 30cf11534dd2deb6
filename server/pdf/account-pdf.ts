/**
 * Receipts, tax invoices and credit notes, in the quote's Lora and walnut: who issues it and to whom, its number and
 * date, what it is for, the tax in it, what has been paid and what is still owed. Drawn from the content stored when
 * the document was issued, so a copy printed later is the same document.
 */
import type { DocumentContent } from '../models/accounts';
import { drawContactFooter, drawLetterhead, openPdf } from './pdf-document';
import { LORA } from './pdf-fonts';
import { formatDate, formatMoney, formatPercent } from './pdf-format';
import { INK, STYLE, drawTable, type TableRow } from './pdf-layout';

const TITLES: Record<DocumentContent['kind'], string> = { receipt: 'Receipt', invoice: 'Tax invoice', 'credit-note': 'Credit note' };

export async function renderAccountPdf(c: DocumentContent): Promise<Buffer> {
  const title = `${TITLES[c.kind]} ${c.number}`;
  const { flow, finish } = openPdf(c.paperSize, { title, author: c.workshop.name, subject: `${TITLES[c.kind]} for quote ${c.quoteNumber}` });
  const money = (a: string) => formatMoney(a, c.currency);
  const tax = `${c.taxLabel} at ${formatPercent(c.taxPct)}`;

  const refs = [`Issued ${formatDate(c.issuedOn)}`, `quote ${c.quoteNumber}`, ...(c.jobNumbers.length ? [`job ${c.jobNumbers.join(', ')}`] : []), ...(c.againstNumber ? [`against invoice ${c.againstNumber}`] : [])];
  drawLetterhead(flow, c.workshop.name, title, refs.join(' · '));

  // From and to, side by side.
  const half = (flow.width - 20) / 2;
  const top = flow.y;
  flow.label('From', flow.left, top, half);
  flow.label(c.kind === 'receipt' ? 'Received from' : 'To', flow.left + half + 20, top, half);
  const from = [c.workshop.name, c.workshop.address, c.workshop.phone, c.workshop.email].filter(Boolean).join('\n');
  const to = [c.customer.name, c.customer.address, c.customer.email].filter(Boolean).join('\n');
  const h1 = flow.textAt(from, flow.left, top + 12, half, STYLE.small);
  const h2 = flow.textAt(to, flow.left + half + 20, top + 12, half, STYLE.small);
  flow.y = top + 12 + Math.max(h1, h2) + 18;

  const head = c.kind === 'receipt' ? 'Payment received' : c.kind === 'invoice' ? 'The work' : 'What is credited';
  flow.heading(head, 100);
  const rows: TableRow[] = c.lines.map((l): TableRow => [{ text: l.description, style: STYLE.cellStrong, ...(l.note ? { note: l.note } : {}) }, money(l.amount)]);
  const footer: TableRow[] = [];
  if (c.kind !== 'receipt') {
    footer.push([`Net of ${c.taxLabel}`, money(c.net)]);
    footer.push([tax, money(c.tax)]);
  }
  footer.push([
    { text: c.kind === 'invoice' ? 'Total, tax included' : c.kind === 'receipt' ? 'Amount received' : 'Total credited, tax included', style: { font: LORA.semibold, size: 11, color: INK.walnut } },
    { text: money(c.total), style: { font: LORA.bold, size: 11.5, color: INK.walnut } },
  ]);
  drawTable(flow, {
    columns: [
      { header: 'Item', width: 0 },
      { header: `Amount (${c.currency.toUpperCase()})`, width: 130, align: 'right' },
    ],
    rows,
    footer,
    footerStyle: STYLE.cellStrong,
  });
  if (c.kind === 'receipt') {
    flow.gap(4);
    flow.paragraph(`Tax included in this payment: ${money(c.tax)} (${tax}).`, STYLE.smallMuted);
  }
  if (c.reason) {
    flow.gap(6);
    flow.paragraph(`Reason: ${c.reason}`, STYLE.bodyItalic);
  }
  flow.gap(18);

  flow.heading(c.kind === 'invoice' ? 'Paid so far, and the balance' : 'The account', 90);
  const account: TableRow[] = [['Agreed total', money(c.agreedTotal)]];
  if (c.kind === 'invoice') {
    for (const p of c.payments) account.push([{ text: p.label, note: formatDate(p.date) }, money(negate(p.amount))]);
    for (const cr of c.credits) account.push([{ text: `Credit note ${cr.number}`, note: formatDate(cr.date) }, money(negate(cr.amount))]);
  } else {
    account.push(['Received to date', money(c.receivedToDate)]);
    if (c.refund) account.push([`Refunded by ${c.refund.method}`, money(c.refund.amount)]);
  }
  drawTable(flow, {
    columns: [
      { header: '', width: 0 },
      { header: '', width: 130, align: 'right' },
    ],
    rows: account,
    footer: [[{ text: c.kind === 'invoice' ? 'Balance due' : 'Still to pay', style: { font: LORA.semibold, size: 11, color: INK.walnut } }, { text: money(c.balanceDue), style: { font: LORA.bold, size: 11.5, color: INK.walnut } }]],
  });
  if (c.note) {
    flow.gap(10);
    flow.paragraph(c.note, STYLE.body);
  }
  flow.gap(16);
  flow.paragraph(
    c.kind === 'invoice'
      ? Number(c.balanceDue) > 0
        ? 'Please pay the balance by card through the link on your quote page, or by bank transfer quoting the invoice number.'
        : 'Paid in full: thank you.'
      : c.kind === 'receipt'
        ? 'Thank you for your payment. Please keep this receipt.'
        : 'This credit note reduces the invoice named above. Please keep it with that invoice.',
    STYLE.smallItalic,
  );
  flow.gap(8);
  flow.paragraph(
    'Safety: shellac polish and the spirit it is made with are flammable, methanol in it is toxic, and oily rags can self-ignite. The work was done under the workshop\u2019s ventilation and fire precautions, in keeping with local fire codes, the workplace-safety regulator and licensed practice.',
    STYLE.smallMuted,
  );

  drawContactFooter(flow, c.workshop, (page, pages) => `${c.number} · page ${page} of ${pages}`, 140);
  return finish();
}

/** "−120.00" for a deduction shown in the account table (pdfText turns the minus sign into one the font has). */
function negate(amount: string): string {
  return amount.startsWith('-') ? amount.slice(1) : `-${amount}`;
}
