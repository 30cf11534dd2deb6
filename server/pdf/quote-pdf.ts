/**
 * The customer's quote as a PDF: who it is from and for, the piece, the covering message, the work in plain words,
 * the price with deposit and balance, optional extras, terms and the safety notes. Lora throughout, walnut and
 * amber on white, A4 or US Letter; running header, workshop name and "Page N of M" on every page.
 */
import sharp from 'sharp';
import { pdfJob } from '../services/image-jobs';
import type { QuoteDocument, QuoteDocumentLine } from './quote-document';
import { openPdf } from './pdf-document';
import { LORA } from './pdf-fonts';
import { formatDate, formatDays, formatHours, formatMoney, formatNumber, formatPercent, paragraphs, pdfText } from './pdf-format';
import { type Flow, INK, STYLE, drawTable, tableHeight, type TableRow, type TableSpec, type TextStyle } from './pdf-layout';

const MARGIN = { top: 66, bottom: 70, left: 56, right: 56 };

/** Renders the quote; resolves with the PDF's bytes. */
export async function renderQuotePdf(q: QuoteDocument): Promise<Buffer> {
  const several = (q.lines?.length ?? 0) > 1;
  const photo = q.piece.photo && !several ? await preparePhoto(q.piece.photo) : null;
  const linePhotos = several ? await Promise.all(q.lines!.map((l) => (l.piece.photo ? preparePhoto(l.piece.photo) : Promise.resolve(null)))) : [];
  // Laid out synchronously: one PDF at a time, so other requests are answered between them.
  return pdfJob(() => layOut(q, photo, linePhotos));
}

function layOut(q: QuoteDocument, photo: Photo | null, linePhotos: (Photo | null)[]): Promise<Buffer> {
  const several = (q.lines?.length ?? 0) > 1;
  const { flow, finish } = openPdf(
    q.paperSize,
    {
      title: `Quote ${q.quote.number} for ${q.customer.name}`,
      author: q.workshop.name,
      subject: `Quote for the French polishing of ${several ? [...new Set(q.lines!.map((l) => l.piece.description))].join(', ') : q.piece.description}`,
      keywords: `quote, ${q.quote.number}, ${q.quote.estimateNumber}`,
    },
    MARGIN,
  );

  drawMasthead(flow, q);
  drawParties(flow, q, photo);
  drawMessage(flow, q);
  if (several) drawLines(flow, q, linePhotos);
  else drawWork(flow, q);
  drawPrice(flow, q);
  drawExtras(flow, q);
  drawTerms(flow, q);
  drawSafety(flow, q);
  drawPageFurniture(flow, q);

  return finish();
}

interface Photo {
  data: Buffer;
  width: number;
  height: number;
}

/** The condition photo upright, at most 1400 px, as JPEG (small, and any PNG or JPEG the upload held). */
async function preparePhoto(bytes: Buffer): Promise<Photo | null> {
  try {
    // From the photo's bounded working copy: small work, not queued behind uploads in the image gate.
    const { data, info } = await sharp(bytes)
      .rotate()
      .resize({ width: 1400, height: 1400, fit: 'inside', withoutEnlargement: true })
      .flatten({ background: '#ffffff' })
      .jpeg({ quality: 82 })
      .toBuffer({ resolveWithObject: true });
    return { data, width: info.width, height: info.height };
  } catch {
    return null; // An unreadable photo leaves the quote without one rather than failing it.
  }
}

const money = (q: QuoteDocument, amount: string): string => formatMoney(amount, q.quote.currency);

/** Label and value in two columns at a fixed place; returns the height used. */
function pair(flow: Flow, label: string, value: string, x: number, y: number, labelW: number, width: number, valueStyle: TextStyle = STYLE.small): number {
  if (!value) return 0;
  const hv = flow.measure(value, valueStyle, width - labelW);
  flow.textAt(label, x, y + 0.6, labelW - 4, STYLE.smallMuted, { oneLine: true, ellipsis: true });
  flow.textAt(value, x + labelW, y, width - labelW, valueStyle);
  return Math.max(hv, flow.measure(label, STYLE.smallMuted, labelW, { oneLine: true })) + 2.5;
}

// ---------------------------------------------------------------------------------------------------------------
// 1. Masthead: the workshop, and the quote's references.

function drawMasthead(flow: Flow, q: QuoteDocument): void {
  const { doc } = flow;
  // A walnut edge with an amber thread along the top of the first page.
  flow.fillRect(0, 0, doc.page.width, 7, INK.walnut);
  flow.fillRect(0, 7, doc.page.width, 1.2, INK.amber);

  const top = flow.top - 10;
  const refW = 196;
  const leftW = flow.width - refW - 24;

  // The workshop.
  let y = top;
  const nameStyle = flow.fitted(q.workshop.name, { font: LORA.semibold, size: 21, color: INK.walnut, lineGap: 0 }, leftW, 16);
  y += flow.textAt(q.workshop.name, flow.left, y, leftW, nameStyle) + 5;
  const detailStyle: TextStyle = { font: LORA.regular, size: 8.8, color: INK.walnutSoft, lineGap: 2 };
  if (q.workshop.address) y += flow.textAt(q.workshop.address.replace(/\s*\n\s*/g, ', '), flow.left, y, leftW, detailStyle) + 1;
  const contact = [q.workshop.email, q.workshop.phone].filter((v): v is string => !!v).join('   ·   ');
  if (contact) y += flow.textAt(contact, flow.left, y, leftW, detailStyle);
  const leftBottom = y;

  // The quote's references, right-aligned.
  const rx = flow.right - refW;
  let ry = top + 2;
  ry += flow.label('Quote', rx, ry, refW, { ...STYLE.label, size: 8, characterSpacing: 3 }, 'right') + 2;
  ry += flow.textAt(q.quote.number, rx, ry, refW, { font: LORA.semibold, size: 16, color: INK.walnut }, { align: 'right' }) + 6;
  const refs: [string, string][] = [
    ['Estimate', q.quote.estimateNumber],
    ['Issued', formatDate(q.quote.issuedOn)],
    ['Valid until', formatDate(q.quote.validUntil)],
    ['Prepared by', q.quote.preparedBy],
  ];
  for (const [label, value] of refs) {
    if (!value) continue;
    const lw = 66;
    const h = flow.measure(value, STYLE.small, refW - lw, { align: 'right' });
    flow.textAt(label, rx, ry + 0.6, lw, STYLE.smallMuted, { oneLine: true });
    flow.textAt(value, rx + lw, ry, refW - lw, STYLE.small, { align: 'right' });
    ry += h + 1.5;
  }

  flow.y = Math.max(leftBottom, ry) + 14;
  flow.hRule(flow.left, flow.right, flow.y, INK.amber, 0.8);
  flow.y += 20;
}

// ---------------------------------------------------------------------------------------------------------------
// 2. Customer and piece, with the condition photo.

function drawParties(flow: Flow, q: QuoteDocument, photo: Photo | null): void {
  const gap = 22;
  const cols = photo ? [0.36, 0.34, 0.3] : [0.46, 0.54];
  const avail = flow.width - gap * (cols.length - 1);
  const widths = cols.map((c) => c * avail);
  const xs = widths.map((_, i) => flow.left + widths.slice(0, i).reduce((t, w) => t + w, 0) + gap * i);
  const top = flow.y;
  const nameStyle: TextStyle = { font: LORA.semibold, size: 12, color: INK.walnut, lineGap: 1 };

  // Customer.
  let y = top;
  y += flow.label('Prepared for', xs[0], y, widths[0]) + 5;
  y += flow.textAt(q.customer.name, xs[0], y, widths[0], nameStyle) + 3;
  if (q.customer.address) y += flow.textAt(q.customer.address, xs[0], y, widths[0], STYLE.small) + 2;
  if (q.customer.email) y += flow.textAt(q.customer.email, xs[0], y, widths[0], flow.fitted(q.customer.email, STYLE.small, widths[0], 7)) + 1;
  if (q.customer.phone) y += flow.textAt(q.customer.phone, xs[0], y, widths[0], STYLE.small) + 1;
  let bottom = y;

  // The piece (or, for several, the pieces by name: each is shown with its options below).
  y = top;
  y += flow.label(q.lines && q.lines.length > 1 ? 'The pieces' : 'The piece', xs[1], y, widths[1]) + 5;
  y += flow.textAt(q.piece.description, xs[1], y, widths[1], nameStyle) + 2;
  if (q.piece.kind) y += flow.textAt(q.piece.kind, xs[1], y, widths[1], { ...STYLE.bodyItalic, size: 9.2 }) + 5;
  const lw = 50;
  if (q.piece.maker) y += pair(flow, 'Maker', q.piece.maker, xs[1], y, lw, widths[1]);
  if (q.piece.year !== null) y += pair(flow, 'Year', String(q.piece.year), xs[1], y, lw, widths[1]);
  if (q.piece.serial) y += pair(flow, 'Serial no.', q.piece.serial, xs[1], y, lw, widths[1]);
  bottom = Math.max(bottom, y);

  // The photo, fitted into its column and framed with a thin mat.
  if (photo) {
    const w = widths[2];
    const x = xs[2];
    y = top;
    y += flow.label('Condition on arrival', x, y, w) + 7;
    const mat = 4;
    const boxW = w - mat * 2;
    const boxH = 150;
    const scale = Math.min(boxW / photo.width, boxH / photo.height);
    const pw = photo.width * scale;
    const ph = photo.height * scale;
    const px = x + mat;
    flow.doc.save().rect(px - mat, y, pw + mat * 2, ph + mat * 2).lineWidth(0.5).strokeColor(INK.rule).stroke().restore();
    flow.doc.image(photo.data, px, y + mat, { width: pw, height: ph });
    y += ph + mat * 2 + 5;
    if (q.piece.photoCaption) y += flow.textAt(q.piece.photoCaption, x, y, pw + mat * 2, STYLE.smallItalic);
    bottom = Math.max(bottom, y);
  }

  flow.y = bottom + 22;
}

// ---------------------------------------------------------------------------------------------------------------
// 3. The covering message.

function drawMessage(flow: Flow, q: QuoteDocument): void {
  const paras = paragraphs(q.quote.message);
  if (paras.length === 0) return;
  flow.ensure(60);
  flow.hRule(flow.left, flow.right, flow.y, INK.rule, 0.5);
  flow.y += 18;
  const style: TextStyle = { ...STYLE.body, size: 10.4, lineGap: 3.4 };
  const width = Math.min(flow.width, 440);
  for (const p of paras) flow.paragraph(p, style, { width, after: 8 });
  if (q.quote.preparedBy) {
    // The signature's two lines stay together.
    const sign: TextStyle = { ...STYLE.bodyItalic, size: 10.4, color: INK.walnut };
    flow.gap(2);
    flow.ensure(flow.measure(q.quote.preparedBy, sign, width) + flow.measure(q.workshop.name, STYLE.smallMuted, width));
    flow.paragraph(q.quote.preparedBy, sign, { width });
    flow.paragraph(q.workshop.name, STYLE.smallMuted, { width });
  }
  flow.gap(26);
}

// ---------------------------------------------------------------------------------------------------------------
// 4. The work in plain words.

function drawWork(flow: Flow, q: QuoteDocument, title = 'The work'): void {
  const w = q.work;
  const systemStyle: TextStyle = { font: LORA.semibold, size: 12, color: INK.walnut, lineGap: 1 };
  const introWidth = Math.min(flow.width, 460);
  const stageCount = w.stages.length;
  const intro =
    `We will finish ${w.areaText} of surface with ${w.systemName.trim()}, building the finish up in ` +
    `${formatNumber(w.totalCoats)} ${w.totalCoats === 1 ? 'coat' : 'coats'}` +
    (stageCount > 0 ? ` over ${stageCount} ${stageCount === 1 ? 'stage' : 'stages'}` : '') +
    '. Between stages the polish rests so that each layer can harden before the next goes on; ' +
    'that is why the piece stays with us longer than the hours of work alone would suggest.';
  // Heading, system, introduction and key figures stay together, with the first rows of the stages.
  const opening = 11 + flow.measure(w.systemName, systemStyle, flow.width) + 6 + flow.measure(intro, STYLE.body, introWidth) + 14 + FACTS_HEIGHT;
  flow.heading(title, opening + 16 + 80);

  const sy = flow.y;
  flow.label('Finishing system', flow.left, sy, flow.width);
  flow.y = sy + 11;
  flow.paragraph(w.systemName, systemStyle, { after: 6 });
  flow.paragraph(intro, STYLE.body, { width: introWidth, after: 14 });

  drawFacts(flow, [
    ['Surface', w.areaText],
    ['Coats', formatNumber(w.totalCoats)],
    ['Hands-on work', formatHours(w.labourHours)],
    ['With the workshop', formatDays(w.calendarDays)],
  ]);
  flow.gap(16);

  if (w.stages.length > 0) {
    const sum = (f: (s: QuoteDocument['work']['stages'][number]) => number): number =>
      Math.round(w.stages.reduce((t, s) => t + f(s), 0) * 100) / 100;
    const stageHours = sum((s) => s.hours);
    const rows: TableRow[] = w.stages.map((s, i) => [
      { text: `${i + 1}.`, style: { ...STYLE.cell, color: INK.muted } },
      { text: s.name, style: STYLE.cellStrong },
      formatNumber(s.sessions),
      s.coats === null ? { text: '—', style: { ...STYLE.cell, color: INK.muted } } : formatNumber(s.coats),
      formatHours(s.hours),
      { text: s.restText, style: { ...STYLE.cell, color: INK.walnutSoft } },
    ]);
    drawTable(flow, {
      columns: [
        { header: '', width: 30, align: 'right' },
        { header: 'Stage', width: 0 },
        { header: 'Sessions', width: 58, align: 'right' },
        { header: 'Coats', width: 46, align: 'right' },
        { header: 'Hands-on', width: 62, align: 'right' },
        { header: 'Rest afterwards', width: 118 },
      ],
      rows,
      footer: [['', 'Total', formatNumber(sum((s) => s.sessions)), formatNumber(sum((s) => s.coats ?? 0)), formatHours(stageHours), '']],
      continuedLabel: 'The work, continued',
    });
    if (Math.abs(stageHours - w.labourHours) > 0.05) {
      flow.gap(6);
      flow.paragraph(
        `With preparation and handling, the hands-on work comes to ${formatHours(w.labourHours)} in all.`,
        STYLE.smallItalic,
      );
    }
    flow.gap(14);
  }

  let timing = `Your piece stays with the workshop for about ${formatDays(w.calendarDays)}, counted in calendar days, to leave the finish the rest it needs.`;
  if (w.datesBooked && w.startDate && w.readyDate) timing += ` The work is booked: we start on ${formatDate(w.startDate)} and expect it to be ready on ${formatDate(w.readyDate)}.`;
  else timing += ' That is an estimate: the dates are fixed when we book the work into the drying room, after the deposit is paid, and we confirm them to you then.';
  flow.paragraph(timing, STYLE.body, { width: Math.min(flow.width, 460) });
  flow.gap(26);
}

const LETTERS = 'ABCDEFGHIJKLMNOPQRSTUVWX';

/**
 * A quote of several pieces or with options: each piece under its own heading with its photo, then each option's
 * work in plain words and its price; which option we recommend, and whether the piece may be left out.
 */
function drawLines(flow: Flow, q: QuoteDocument, photos: (Photo | null)[]): void {
  const lines = q.lines!;
  const groups = [...new Set(lines.map((l) => l.group))];
  groups.forEach((g, gi) => {
    const of = lines.map((l, i) => ({ l, photo: photos[i] ?? null })).filter((x) => x.l.group === g);
    const first = of[0]!.l;
    flow.heading(`Piece ${gi + 1}: ${first.piece.description}`, 180);
    const photo = of.find((x) => x.photo)?.photo ?? null;
    const intro =
      of.length > 1
        ? `We offer ${of.length} ways of doing this piece; you choose one on the quote page before accepting${first.groupOptional ? ', or leave the piece out' : ''}.`
        : first.groupOptional
          ? 'You may include this piece or leave it out when you accept.'
          : '';
    const y0 = flow.y;
    const textW = photo ? flow.width * 0.62 : Math.min(flow.width, 460);
    if (first.piece.kind) flow.paragraph(first.piece.kind, { ...STYLE.bodyItalic, size: 9.2 }, { width: textW, after: 4 });
    if (intro) flow.paragraph(intro, STYLE.body, { width: textW, after: 6 });
    if (photo) {
      const w = flow.width * 0.32;
      const boxH = 110;
      const scale = Math.min(w / photo.width, boxH / photo.height);
      const x = flow.right - w;
      flow.doc.image(photo.data, x, y0, { width: photo.width * scale, height: photo.height * scale });
      flow.y = Math.max(flow.y, y0 + photo.height * scale + 6);
      if (first.piece.photoCaption) flow.paragraph(first.piece.photoCaption, STYLE.smallItalic, { width: w, indent: flow.width - w });
    }
    flow.gap(8);
    of.forEach(({ l }, oi) => drawOption(flow, q, l, of.length > 1 ? `Option ${LETTERS[oi]}: ${l.label || l.work.systemName}` : l.label || 'The work'));
  });
}

function drawOption(flow: Flow, q: QuoteDocument, l: QuoteDocumentLine, title: string): void {
  const marks = [l.recommended && l.options > 1 ? 'recommended' : '', l.chosen === true ? 'your choice' : l.chosen === false ? 'not chosen' : ''].filter(Boolean);
  drawWork(flow, { ...q, work: l.work }, marks.length ? `${title} (${marks.join(', ')})` : title);
  flow.ensure(30);
  flow.paragraph(`Price for ${l.options > 1 ? 'this option' : 'this piece'}: ${money(q, l.total)}, ${q.quote.taxLabel.trim() || 'tax'} included.`, { font: LORA.semibold, size: 11, color: INK.walnut }, { after: 18 });
}

const FACTS_HEIGHT = 46;

/** A strip of key figures: small label above a larger value, separated by hairlines. */
function drawFacts(flow: Flow, facts: [string, string][]): void {
  const h = FACTS_HEIGHT;
  flow.ensure(h);
  const y = flow.y;
  const cellW = flow.width / facts.length;
  flow.hRule(flow.left, flow.right, y, INK.rule, 0.5);
  flow.hRule(flow.left, flow.right, y + h, INK.rule, 0.5);
  facts.forEach(([label, value], i) => {
    const x = flow.left + cellW * i;
    if (i > 0) flow.vRule(x, y + 9, y + h - 9, INK.rule, 0.5);
    const pad = i === 0 ? 0 : 12;
    flow.label(label, x + pad, y + 10, cellW - pad - 4, { ...STYLE.label, color: INK.muted });
    flow.textAt(value, x + pad, y + 21, cellW - pad - 4, { font: LORA.semibold, size: 13.5, color: INK.walnut }, { oneLine: true, ellipsis: true });
  });
  flow.y = y + h;
}

// ---------------------------------------------------------------------------------------------------------------
// 5. Price, deposit and balance; optional extras.

function drawPrice(flow: Flow, q: QuoteDocument): void {
  const p = q.price;
  const tax = q.quote.taxLabel.trim() || 'tax';
  const table: TableSpec = {
    columns: [
      { header: 'Item', width: 0 },
      { header: `Amount (${q.quote.currency.toUpperCase()})`, width: 130, align: 'right' },
    ],
    rows: p.lines.map((l) => [l.label, money(q, l.amount)]),
    footer: [
      [
        { text: `Total, ${tax} included`, style: { font: LORA.semibold, size: 11.5, color: INK.walnut } },
        { text: money(q, p.total), style: { font: LORA.bold, size: 12.5, color: INK.walnut } },
      ],
    ],
    footerStyle: STYLE.cellStrong,
    continuedLabel: 'The price, continued',
  };
  const taxNote = q.quote.pricesIncludeTax
    ? `Prices on this quote include ${tax}; the ${tax} line shows how much of the total it is.`
    : `Prices on this quote are before ${tax}, which is added as its own line above; the total includes it.`;

  // Payment: deposit, balance and how long the quote stands.
  const rows: [string, string][] = [
    ...(p.agreed
      ? p.agreed.extras.map((x): [string, string] => [`Extra you chose: ${x.label}`, money(q, x.price)]).concat([[`Agreed total${p.agreed.extras.length ? ' with the extras you chose' : ''}`, money(q, p.agreed.total)]])
      : []),
    [`Deposit on acceptance (${formatPercent(p.depositPct)})`, money(q, p.deposit)],
    ['Balance when the piece is ready', money(q, p.balance)],
  ];
  const validity = `This quote is valid until ${formatDate(q.quote.validUntil)}.`;
  const padX = 16;
  const padY = 12;
  const innerW = flow.width - padX * 2;
  const rowH = 24;
  const validityH = flow.measure(validity, STYLE.bodyItalic, innerW);
  const boxH = padY * 2 + rows.length * rowH + 6 + validityH;

  // The breakdown, its total and the payment terms belong together: start them on a fresh page if they would
  // fit there but not here.
  const whole = 40 + tableHeight(flow, table) + 4 + flow.measure(taxNote, STYLE.smallItalic, flow.width) + 14 + boxH;
  if (whole <= flow.pageBody) flow.ensure(whole);
  flow.heading('The price', 140);
  if (q.lines && q.lines.length > 1) {
    const which = q.lines.some((l) => l.chosen !== null)
      ? 'The price of the options you chose, with each piece\'s work added together.'
      : 'The price of the options we recommend, added together. Your total follows the options you choose on the quote page.';
    flow.paragraph(which, STYLE.bodyItalic, { width: Math.min(flow.width, 460), after: 8 });
  }
  drawTable(flow, table);
  flow.gap(4);
  flow.paragraph(taxNote, STYLE.smallItalic);
  flow.gap(14);

  flow.ensure(boxH);
  const y0 = flow.y;
  flow.fillRect(flow.left, y0, flow.width, boxH, INK.cream);
  flow.fillRect(flow.left, y0, 2.2, boxH, INK.amber);
  let y = y0 + padY;
  rows.forEach(([label, value], i) => {
    flow.textAt(label, flow.left + padX, y + 1, innerW - 140, { ...STYLE.body, color: INK.walnut });
    flow.textAt(value, flow.right - padX - 140, y, 140, { font: LORA.semibold, size: 11, color: INK.walnut }, { align: 'right', oneLine: true });
    if (i < rows.length - 1) flow.hRule(flow.left + padX, flow.right - padX, y + rowH - 5, INK.rule, 0.4);
    y += rowH;
  });
  y += 6;
  flow.textAt(validity, flow.left + padX, y, innerW, STYLE.bodyItalic);
  flow.y = y0 + boxH + 26;
}

function drawExtras(flow: Flow, q: QuoteDocument): void {
  if (q.extras.length === 0) return;
  flow.heading('Optional extras', 120);
  flow.paragraph(
    'Further work you may choose to add. Each is priced on its own and is not included in the total above; ' +
    'tell us which, if any, you would like and we will confirm the new total.',
    STYLE.body,
    { width: Math.min(flow.width, 460), after: 10 },
  );
  drawTable(flow, {
    columns: [
      { header: 'Extra', width: 0 },
      { header: 'Hands-on', width: 70, align: 'right' },
      { header: `Price (${q.quote.currency.toUpperCase()})`, width: 110, align: 'right' },
    ],
    rows: q.extras.map((e) => [{ text: e.label, style: STYLE.cellStrong, note: e.description }, formatHours(e.hours), money(q, e.price)]),
    continuedLabel: 'Optional extras, continued',
  });
  flow.gap(26);
}

// ---------------------------------------------------------------------------------------------------------------
// 6. Terms.

function drawTerms(flow: Flow, q: QuoteDocument): void {
  const terms = q.terms.map((t) => t.trim()).filter(Boolean);
  if (terms.length === 0) return;
  flow.heading('Terms', 60);
  drawNumbered(
    flow,
    terms.map((t, i) => ({ marker: `${i + 1}.`, text: t })),
    { ...STYLE.small, size: 9.2, lineGap: 2.2 },
    { font: LORA.semibold, size: 9.2, color: INK.amber },
    22,
  );
  flow.gap(26);
}

/** A list with a hanging marker; each item moves whole to the next page when it does not fit. */
function drawNumbered(flow: Flow, items: { marker: string; text: string; markerStyle?: TextStyle }[], style: TextStyle, markerStyle: TextStyle, indent: number): void {
  const width = Math.min(flow.width, 470) - indent;
  for (const item of items) {
    const h = flow.measure(item.text, style, width);
    if (h <= flow.pageBody) flow.ensure(h);
    const y = flow.y;
    flow.textAt(item.marker, flow.left, y, indent - 4, item.markerStyle ?? markerStyle, { oneLine: true });
    flow.paragraph(item.text, style, { indent, width });
    flow.gap(5);
  }
}

// ---------------------------------------------------------------------------------------------------------------
// 7. Safety.

const SEVERITY: Record<string, { label: string; color: string }> = {
  danger: { label: 'Hazard', color: INK.danger },
  warning: { label: 'Precaution', color: INK.amber },
  info: { label: 'Note', color: INK.walnutSoft },
};

function drawSafety(flow: Flow, q: QuoteDocument): void {
  flow.heading('Safety', 110);
  const width = Math.min(flow.width, 460);
  flow.paragraph(
    'French polishing builds a finish from shellac dissolved in a flammable spirit, applied with rubbers and ' +
      'rags that are soaked in spirit and a little oil. Spirit vapour can ignite, and oily rags can heat up and ' +
      'catch fire on their own if they are left crumpled.',
    STYLE.body,
    { width, after: 6 },
  );
  flow.paragraph(
    "All of this work is done in our workshop, under the workshop's own ventilation and fire precautions. These " +
      'are the precautions we work to on your piece:',
    STYLE.body,
    { width, after: 10 },
  );

  const localRule = q.cautions.find((c) => c.code === 'local-rules');
  const cautions = q.cautions.filter((c) => c !== localRule);
  const tagW = 76;
  const textW = width - tagW;
  for (const c of cautions) {
    const sev = SEVERITY[c.severity] ?? { label: c.severity || 'Note', color: INK.walnutSoft };
    const h = flow.measure(c.text, STYLE.small, textW);
    flow.ensure(h + 6);
    const y = flow.y;
    flow.fillRect(flow.left, y + 1, 1.6, Math.max(h - 2, 9), sev.color);
    flow.label(sev.label, flow.left + 8, y + 1.6, tagW - 10, { ...STYLE.label, color: sev.color });
    flow.textAt(c.text, flow.left + tagW, y, textW, { ...STYLE.small, size: 9.2, lineGap: 2 });
    flow.y = y + Math.max(flow.measure(c.text, { ...STYLE.small, size: 9.2, lineGap: 2 }, textW), 11) + 7;
  }
  flow.gap(6);

  const vent = pdfText(q.ventilationText).trim();
  const sentence = !vent
    ? ''
    : /^[A-Z]/.test(vent)
      ? /[.!?]$/.test(vent) ? vent : `${vent}.`
      : `While we work on your piece, the finishing room is ventilated with ${vent.replace(/[.\s]+$/, '')}.`;
  const closing =
    localRule?.text ??
    'Local fire codes, the workplace-safety regulator and licensed practice come first: these notes do not replace them.';
  const style: TextStyle = { ...STYLE.bodyItalic, color: INK.walnut };
  const h = flow.measure(closing, style, width - 14);
  // The ventilation figure and the closing word on local rules are read together.
  flow.ensure(flow.measure(sentence, STYLE.body, width) + 10 + h);
  if (sentence) flow.paragraph(sentence, STYLE.body, { width, after: 10 });

  flow.ensure(h + 4);
  const y = flow.y;
  flow.fillRect(flow.left, y, 1.6, h, INK.amber);
  flow.textAt(closing, flow.left + 14, y, width - 14, style);
  flow.y = y + h;
}

// ---------------------------------------------------------------------------------------------------------------
// 8. Running header (from page 2) and footer on every page, once the page count is known.

function drawPageFurniture(flow: Flow, q: QuoteDocument): void {
  const { doc } = flow;
  const range = doc.bufferedPageRange();
  const total = range.count;
  for (let i = range.start; i < range.start + total; i++) {
    doc.switchToPage(i);
    const n = i - range.start + 1;
    const W = doc.page.width;
    const H = doc.page.height;
    const left = MARGIN.left;
    const right = W - MARGIN.right;
    const width = right - left;
    const third = width / 3;

    if (n > 1) {
      const y = 30;
      flow.textAt(q.workshop.name, left, y, width / 2 - 10, { font: LORA.semibold, size: 8.5, color: INK.walnut }, { oneLine: true, ellipsis: true });
      flow.textAt(`Quote ${q.quote.number} · ${q.customer.name}`, left + width / 2, y + 0.5, width / 2, { ...STYLE.smallMuted, size: 8 }, { align: 'right', oneLine: true, ellipsis: true });
      flow.hRule(left, right, y + 16, INK.rule, 0.5);
    }

    const fy = H - 46;
    flow.hRule(left, right, fy - 9, INK.rule, 0.5);
    flow.fillRect(left, fy - 9.6, 22, 1.2, INK.amber);
    flow.textAt(q.workshop.name, left, fy, third + 30, { font: LORA.semibold, size: 8, color: INK.walnut }, { oneLine: true, ellipsis: true });
    flow.textAt(`Quote ${q.quote.number}`, left + third, fy, third, { ...STYLE.smallMuted, size: 8 }, { align: 'center', oneLine: true, ellipsis: true });
    flow.textAt(`Page ${n} of ${total}`, right - third, fy, third, { ...STYLE.smallMuted, size: 8, color: INK.walnutSoft }, { align: 'right', oneLine: true });
  }
  doc.switchToPage(range.start + total - 1);
}
