/**
 * A purchase order for one supplier: what the workshop wants, in the supplier's packs, with the prices of the
 * workshop's price list and the delivery hoped for. A tagged PDF in the house Lora and walnut.
 */
import PDFDocument from 'pdfkit';
import { LORA, registerLora } from './pdf-fonts';
import { formatDate, formatMoney, formatNumber, pdfText } from './pdf-format';
import { Flow, INK, STYLE, TAGGED_PDF, drawTable, type TableRow } from './pdf-layout';

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

const MARGIN = { top: 60, bottom: 60, left: 56, right: 56 };

export async function renderPurchaseOrderPdf(o: PurchaseOrderDocument): Promise<Buffer> {
  const doc = new PDFDocument({
    ...TAGGED_PDF,
    size: o.paperSize === 'Letter' ? 'LETTER' : 'A4',
    margins: { ...MARGIN },
    bufferPages: true,
    info: { Title: pdfText(`Purchase order ${o.number}`), Author: pdfText(o.workshop.name), Subject: pdfText(`Order for ${o.supplier}`), Creator: 'Shellwright' },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  registerLora(doc);
  doc.font(LORA.regular);
  const flow = new Flow(doc);
  flow.y = flow.top;
  const money = (a: string) => formatMoney(a, o.currency);

  flow.label(pdfText(o.workshop.name).toUpperCase(), flow.left, flow.y, flow.width);
  flow.y += 14;
  flow.paragraph(`Purchase order ${o.number}`, { font: LORA.semibold, size: 20, color: INK.walnut }, { after: 4 });
  flow.paragraph(`For ${o.supplier} · ordered on ${formatDate(o.date)}`, STYLE.smallMuted, { after: 18 });

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

  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const fy = doc.page.height - 40;
    flow.hRule(MARGIN.left, doc.page.width - MARGIN.right, fy - 8, INK.rule, 0.5);
    const contact = [o.workshop.name, o.workshop.phone, o.workshop.email].filter(Boolean).join(' · ');
    flow.textAt(contact, MARGIN.left, fy, doc.page.width - MARGIN.left - MARGIN.right - 90, { ...STYLE.smallMuted, size: 8 }, { oneLine: true, ellipsis: true });
    flow.textAt(`Page ${i - range.start + 1} of ${range.count}`, doc.page.width - MARGIN.right - 90, fy, 90, { ...STYLE.smallMuted, size: 8 }, { align: 'right', oneLine: true });
  }
  doc.end();
  return done;
}
