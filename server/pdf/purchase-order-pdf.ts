/**
 * A purchase order for one supplier: what the workshop wants, in the supplier's packs, with the prices of the
 * workshop's price list and the delivery hoped for. A tagged PDF in the house Lora and walnut.
 */
import { drawContactFooter, drawLetterhead, openPdf } from './pdf-document';
import { formatDate, formatMoney, formatNumber } from './pdf-format';
import { STYLE, drawTable, type TableRow } from './pdf-layout';

export interface PurchaseOrderDocument {
  paperSize: 'A4' | 'Letter';
  workshop: { name: string; address: string | null; email: string | null; phone: string | null };
  number: string;
  supplier: string;
  /** ISO date the order was made. */
  date: string;
  expectedOn: string | null;
  currency: string;
  lines: { material: string; pack: string; code: string | null; packs: number; packPrice: string; amount: string }[];
  total: string;
  note: string;
}

export async function renderPurchaseOrderPdf(o: PurchaseOrderDocument): Promise<Buffer> {
  const { flow, finish } = openPdf(o.paperSize, { title: `Purchase order ${o.number}`, author: o.workshop.name, subject: `Order for ${o.supplier}` });
  const money = (a: string) => formatMoney(a, o.currency);

  drawLetterhead(flow, o.workshop.name, `Purchase order ${o.number}`, `For ${o.supplier} · ordered on ${formatDate(o.date)}`);

  flow.heading('Delivery', 80);
  drawTable(flow, {
    columns: [
      { header: '', width: 170 },
      { header: '', width: 0 },
    ],
    rows: [
      ['Deliver to', [o.workshop.name, o.workshop.address].filter(Boolean).join('\n')],
      ['Wanted by', o.expectedOn ? formatDate(o.expectedOn) : 'as soon as you can'],
      ['Questions to', [o.workshop.phone, o.workshop.email].filter(Boolean).join(' · ') || o.workshop.name],
    ],
  });
  flow.gap(20);

  flow.heading('What we would like', 120);
  const rows: TableRow[] = o.lines.map((l): TableRow => [
    { text: l.material, style: STYLE.cellStrong, note: l.code ? `Your code ${l.code}` : '' },
    l.pack,
    formatNumber(l.packs),
    money(l.packPrice),
    money(l.amount),
  ]);
  drawTable(flow, {
    columns: [
      { header: 'Material', width: 0 },
      { header: 'Pack', width: 90 },
      { header: 'Packs', width: 50, align: 'right' },
      { header: 'Each', width: 75, align: 'right' },
      { header: `Amount (${o.currency})`, width: 90, align: 'right' },
    ],
    rows,
    footer: [[{ text: 'Total at our listed prices', style: STYLE.cellStrong }, '', '', '', { text: money(o.total), style: STYLE.cellStrong }]],
    footerStyle: STYLE.cellStrong,
    continuedLabel: 'What we would like, continued',
  });
  flow.gap(12);
  flow.paragraph('Prices are those on our list; please tell us before sending if yours differ. Shellac flakes, spirit and solvents are flammable: pack and carry them as the regulations for such goods require.', STYLE.smallItalic);
  if (o.note.trim()) {
    flow.gap(10);
    flow.paragraph(o.note, STYLE.body);
  }

  drawContactFooter(flow, o.workshop);
  return finish();
}
