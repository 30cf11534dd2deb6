/**
 * A small page-flow layer over pdfkit for the customer's documents: the house palette, text styles, blocks that
 * move whole to the next page when they do not fit, and tables that repeat their header row after a page break.
 * Nothing is ever drawn below the bottom margin: fixed-position text is drawn with a height so that pdfkit never
 * adds a page by itself, and callers reserve space first.
 */
import { LORA, type LoraFace } from './pdf-fonts';
import { pdfText } from './pdf-format';

/** Shellwright's document palette: walnut browns and an amber accent on warm paper. */
export const INK = {
  text: '#2e1f16',
  walnut: '#3a2418',
  walnutSoft: '#66412c',
  amber: '#bf7720',
  muted: '#85705f',
  rule: '#dccdb9',
  hairline: '#ebe1d3',
  cream: '#f8f2e9',
  danger: '#9b3a1f',
} as const;

export interface TextStyle {
  font: LoraFace;
  size: number;
  color: string;
  lineGap?: number;
  characterSpacing?: number;
}

export const STYLE = {
  body: { font: LORA.regular, size: 10, color: INK.text, lineGap: 2.6 },
  bodyItalic: { font: LORA.italic, size: 10, color: INK.walnutSoft, lineGap: 2.6 },
  small: { font: LORA.regular, size: 8.8, color: INK.text, lineGap: 1.8 },
  smallMuted: { font: LORA.regular, size: 8.5, color: INK.muted, lineGap: 1.6 },
  smallItalic: { font: LORA.italic, size: 8.5, color: INK.muted, lineGap: 1.6 },
  label: { font: LORA.semibold, size: 7, color: INK.amber, characterSpacing: 0.6 },
  tableHead: { font: LORA.semibold, size: 7, color: INK.walnutSoft, characterSpacing: 0.5 },
  cell: { font: LORA.regular, size: 9.2, color: INK.text, lineGap: 1.6 },
  cellStrong: { font: LORA.semibold, size: 9.2, color: INK.walnut, lineGap: 1.6 },
  cellNote: { font: LORA.italic, size: 8.3, color: INK.muted, lineGap: 1.4 },
  heading: { font: LORA.semibold, size: 15, color: INK.walnut },
} satisfies Record<string, TextStyle>;

export type Align = 'left' | 'right' | 'center';

export interface TextBoxOptions {
  align?: Align;
  /** Draw on one line, no wrapping; with `ellipsis` cut to the width. */
  oneLine?: boolean;
  ellipsis?: boolean;
}

/**
 * What makes a document accessible to a screen reader: a tagged PDF (every piece of text in a structure element, in
 * the order it is read), its language, and the title shown instead of the file name. Spread into `new PDFDocument`.
 */
export const TAGGED_PDF = { tagged: true, lang: 'en-GB', displayTitle: true, pdfVersion: '1.7' } as const satisfies PDFKit.PDFDocumentOptions;

/**
 * Lays out text and rules on the pages. On a tagged document every text it draws becomes a structure element (a
 * paragraph, or a heading) under one Document element, in the order drawn, which is the reading order; rules and
 * fills are marked as layout artifacts that a screen reader skips.
 */
export class Flow {
  private readonly root: PDFKit.PDFStructureElement | undefined;
  /** The structure type of the next text drawn (a heading sets it for its title). */
  private role: 'P' | 'H1' | 'H2' = 'P';

  constructor(readonly doc: PDFKit.PDFDocument) {
    if ((doc.options as PDFKit.PDFDocumentOptions).tagged) {
      this.root = doc.struct('Document');
      doc.addStructure(this.root);
    }
  }

  /** Draws text inside a structure element of the current role (untagged documents just draw). */
  private tag(draw: () => void): void {
    if (!this.root) return draw();
    const element = this.doc.struct(this.role, {}, [draw]);
    this.root.add(element);
    element.end();
  }

  /** Draws decoration (rules, fills, bars) as a layout artifact, which a screen reader skips. */
  artifact(draw: () => void): void {
    if (!this.root) return draw();
    this.doc.markContent('Artifact', { type: 'Layout' });
    draw();
    this.doc.endMarkedContent();
  }

  get left(): number {
    return this.doc.page.margins.left;
  }
  get right(): number {
    return this.doc.page.width - this.doc.page.margins.right;
  }
  get width(): number {
    return this.right - this.left;
  }
  get top(): number {
    return this.doc.page.margins.top;
  }
  get bottom(): number {
    return this.doc.page.height - this.doc.page.margins.bottom;
  }
  get y(): number {
    return this.doc.y;
  }
  set y(value: number) {
    this.doc.y = value;
  }
  /** Height of the content area of a page. */
  get pageBody(): number {
    return this.bottom - this.top;
  }
  get atPageTop(): boolean {
    return this.doc.y <= this.top + 0.5;
  }

  newPage(): void {
    this.doc.addPage();
    this.doc.x = this.left;
    this.doc.y = this.top;
  }

  /** Starts a new page unless `height` fits below the current position (or we are already at a page's top). */
  ensure(height: number): boolean {
    if (this.doc.y + height > this.bottom - 0.5 && !this.atPageTop) {
      this.newPage();
      return true;
    }
    return false;
  }

  gap(points: number): void {
    if (!this.atPageTop) this.doc.y = Math.min(this.doc.y + points, this.bottom);
  }

  use(style: TextStyle): this {
    this.doc.font(style.font).fontSize(style.size).fillColor(style.color);
    return this;
  }

  private textOptions(style: TextStyle, width: number, opts: TextBoxOptions = {}): PDFKit.Mixins.TextOptions {
    return {
      width,
      align: opts.align ?? 'left',
      lineGap: style.lineGap ?? 0,
      characterSpacing: style.characterSpacing ?? 0,
      lineBreak: !opts.oneLine,
      ...(opts.ellipsis ? { ellipsis: true } : {}),
    };
  }

  /** Height the text takes at this width. */
  measure(text: string, style: TextStyle, width: number, opts: TextBoxOptions = {}): number {
    const clean = pdfText(text);
    if (!clean) return 0;
    this.use(style);
    if (opts.oneLine) return this.doc.currentLineHeight(true) + (style.lineGap ?? 0);
    return this.doc.heightOfString(clean, this.textOptions(style, width, opts));
  }

  /** The style, shrunk (down to `minSize`) until the text fits on one line of this width. */
  fitted(text: string, style: TextStyle, width: number, minSize: number): TextStyle {
    let size = style.size;
    while (size > minSize && this.textWidth(text, { ...style, size }) > width) size -= 0.25;
    return { ...style, size };
  }

  textWidth(text: string, style: TextStyle): number {
    this.use(style);
    return this.doc.widthOfString(pdfText(text), { characterSpacing: style.characterSpacing ?? 0 });
  }

  /**
   * Draws text at a fixed place without ever starting a page; returns the height used. The caller has reserved
   * the space.
   */
  textAt(text: string, x: number, y: number, width: number, style: TextStyle, opts: TextBoxOptions = {}): number {
    const clean = pdfText(text);
    if (!clean) return 0;
    const h = this.measure(clean, style, width, opts);
    this.use(style);
    const box = this.textOptions(style, width, opts);
    // With a height pdfkit stops instead of adding a page; one-line text with an ellipsis is cut at the width.
    box.height = opts.oneLine ? h * 1.5 : h + this.doc.page.height;
    const { x: keepX, y: keepY } = this.doc;
    this.tag(() => this.doc.text(clean, x, y, box));
    this.doc.x = keepX;
    this.doc.y = keepY;
    return h;
  }

  /**
   * A paragraph in the flow: kept whole on the page when it fits, otherwise continued line by line onto the next
   * page (never fewer than two lines left behind).
   */
  paragraph(text: string, style: TextStyle, opts: { indent?: number; width?: number; align?: Align; after?: number } = {}): void {
    const clean = pdfText(text);
    if (!clean) return;
    const x = this.left + (opts.indent ?? 0);
    const width = opts.width ?? this.right - x;
    const h = this.measure(clean, style, width, { align: opts.align });
    this.use(style);
    const line = this.doc.currentLineHeight(true) + (style.lineGap ?? 0);
    if (h <= this.pageBody) this.ensure(h);
    else this.ensure(line * 2);
    if (this.doc.y + h <= this.bottom) {
      const y = this.doc.y;
      this.textAt(clean, x, y, width, style, { align: opts.align });
      this.doc.y = y + h;
    } else {
      // Too long for what is left of the page: let pdfkit flow it on, line by line.
      this.use(style);
      this.tag(() => this.doc.text(clean, x, this.doc.y, this.textOptions(style, width, { align: opts.align })));
    }
    this.doc.x = this.left;
    this.gap(opts.after ?? 0);
  }

  hRule(x1: number, x2: number, y: number, color: string = INK.rule, width = 0.5): void {
    this.artifact(() => this.doc.save().moveTo(x1, y).lineTo(x2, y).lineWidth(width).strokeColor(color).stroke().restore());
  }

  vRule(x: number, y1: number, y2: number, color: string = INK.rule, width = 0.5): void {
    this.artifact(() => this.doc.save().moveTo(x, y1).lineTo(x, y2).lineWidth(width).strokeColor(color).stroke().restore());
  }

  fillRect(x: number, y: number, w: number, h: number, color: string): void {
    this.artifact(() => this.doc.save().rect(x, y, w, h).fill(color).restore());
  }

  /** A section title: a short amber bar, then the title. Kept with at least `keepWith` points of what follows. */
  heading(title: string, keepWith = 90): void {
    const h = this.measure(title, STYLE.heading, this.width);
    this.ensure(10 + h + keepWith);
    const y = this.doc.y;
    this.fillRect(this.left, y, 22, 1.8, INK.amber);
    this.role = 'H2';
    try {
      this.textAt(title, this.left, y + 8, this.width, STYLE.heading);
    } finally {
      this.role = 'P';
    }
    this.doc.y = y + 8 + h + 8;
  }

  /** A small spaced-capitals label (e.g. "PREPARED FOR") at a fixed place; returns the height used. */
  label(text: string, x: number, y: number, width: number, style: TextStyle = STYLE.label, align: Align = 'left'): number {
    return this.textAt(text.toUpperCase(), x, y, width, style, { align, oneLine: true, ellipsis: true });
  }
}

export interface TableColumn {
  header: string;
  /** Points; 0 takes the width left over (one column should). */
  width: number;
  align?: Align;
}

export interface TableCell {
  text: string;
  style?: TextStyle;
  /** A second, smaller line under the text (e.g. a description). */
  note?: string;
}

export type TableRow = (TableCell | string)[];

export interface TableSpec {
  columns: TableColumn[];
  rows: TableRow[];
  /** Rows after a stronger rule (totals); kept together with the last body row. */
  footer?: TableRow[];
  footerStyle?: TextStyle;
  /** Shown in italics above the repeated header on the following pages, e.g. "Stages, continued". */
  continuedLabel?: string;
  zebra?: boolean;
}

const PAD_X = 6;
const PAD_Y = 5;

interface LaidCell {
  text: string;
  style: TextStyle;
  note: string;
  h: number;
}

interface TableLayout {
  widths: number[];
  xs: number[];
  tableRight: number;
  headH: number;
  body: { cells: LaidCell[]; h: number }[];
  foot: { cells: LaidCell[]; h: number }[];
  footH: number;
}

function layoutTable(flow: Flow, spec: TableSpec): TableLayout {
  const fixed = spec.columns.reduce((t, c) => t + c.width, 0);
  const flexCount = spec.columns.filter((c) => c.width === 0).length;
  const flexWidth = flexCount > 0 ? Math.max(40, (flow.width - fixed) / flexCount) : 0;
  const widths = spec.columns.map((c) => (c.width === 0 ? flexWidth : c.width));
  const xs: number[] = [];
  let x = flow.left;
  for (const w of widths) {
    xs.push(x);
    x += w;
  }

  const layRow = (row: TableRow, fallback: TextStyle): { cells: LaidCell[]; h: number } => {
    const cells = spec.columns.map((col, i): LaidCell => {
      const raw = row[i] ?? '';
      const cell: TableCell = typeof raw === 'string' ? { text: raw } : raw;
      const style = cell.style ?? fallback;
      const inner = widths[i] - PAD_X * 2;
      const note = cell.note ?? '';
      let h = flow.measure(cell.text, style, inner, { align: col.align });
      if (note) h += (cell.text ? 2 : 0) + flow.measure(note, STYLE.cellNote, inner, { align: col.align });
      return { text: cell.text, style, note, h };
    });
    return { cells, h: Math.max(...cells.map((c) => c.h), 8) + PAD_Y * 2 };
  };

  const body = spec.rows.map((r) => layRow(r, STYLE.cell));
  const foot = (spec.footer ?? []).map((r) => layRow(r, spec.footerStyle ?? STYLE.cellStrong));
  return {
    widths,
    xs,
    tableRight: x,
    headH: flow.measure('X', STYLE.tableHead, 100, { oneLine: true }) + PAD_Y * 2 + 2,
    body,
    foot,
    footH: foot.reduce((t, r) => t + r.h, 0) + (foot.length ? 3 : 0),
  };
}

/** Height the table takes when drawn on one page. */
export function tableHeight(flow: Flow, spec: TableSpec): number {
  const t = layoutTable(flow, spec);
  return t.headH + t.body.reduce((sum, r) => sum + r.h, 0) + t.footH;
}

/** Draws a table in the flow; header row repeated on every page it runs onto. */
export function drawTable(flow: Flow, spec: TableSpec): void {
  const { widths, xs, tableRight, headH, body, foot, footH } = layoutTable(flow, spec);
  const headStyle = STYLE.tableHead;

  const drawHeader = (continued: boolean): void => {
    if (continued && spec.continuedLabel) {
      const h = flow.textAt(spec.continuedLabel, flow.left, flow.y, flow.width, STYLE.smallItalic);
      flow.y += h + 3;
    }
    const y = flow.y;
    flow.fillRect(flow.left, y, tableRight - flow.left, headH, INK.cream);
    spec.columns.forEach((col, i) => {
      flow.textAt(col.header.toUpperCase(), xs[i] + PAD_X, y + PAD_Y + 1.5, widths[i] - PAD_X * 2, headStyle, {
        align: col.align,
        oneLine: true,
        ellipsis: true,
      });
    });
    flow.hRule(flow.left, tableRight, y + headH, INK.walnutSoft, 0.7);
    flow.y = y + headH;
  };

  const drawRow = (laid: { cells: LaidCell[]; h: number }, index: number, footer: boolean): void => {
    const y = flow.y;
    if (spec.zebra && !footer && index % 2 === 1) flow.fillRect(flow.left, y, tableRight - flow.left, laid.h, '#fcf8f2');
    laid.cells.forEach((cell, i) => {
      const inner = widths[i] - PAD_X * 2;
      const align = spec.columns[i].align;
      const h = flow.textAt(cell.text, xs[i] + PAD_X, y + PAD_Y, inner, cell.style, { align });
      if (cell.note) flow.textAt(cell.note, xs[i] + PAD_X, y + PAD_Y + h + (cell.text ? 2 : 0), inner, STYLE.cellNote, { align });
    });
    if (!footer) flow.hRule(flow.left, tableRight, y + laid.h, INK.hairline, 0.5);
    flow.y = y + laid.h;
  };

  // Header plus the first row (or the footer when there are no rows) must start on the same page.
  flow.ensure(headH + (body[0]?.h ?? footH) + (body.length <= 1 ? footH : 0));
  drawHeader(false);

  body.forEach((laid, i) => {
    const last = i === body.length - 1;
    const need = laid.h + (last ? footH : 0);
    if (flow.y + need > flow.bottom - 0.5) {
      flow.newPage();
      drawHeader(true);
    }
    drawRow(laid, i, false);
  });

  if (foot.length) {
    if (flow.y + footH > flow.bottom - 0.5) {
      flow.newPage();
      drawHeader(true);
    }
    flow.hRule(flow.left, tableRight, flow.y + 1, INK.walnut, 0.9);
    flow.y += 3;
    foot.forEach((laid, i) => drawRow(laid, i, true));
  }
  flow.doc.x = flow.left;
}
