/**
 * What every Shellwright document shares: a tagged PDF in the house Lora on A4 or Letter, its bytes gathered as it is
 * drawn, the letterhead (the workshop's name, the title, a line of references) and the footer on every page (the
 * workshop's contact details and the page count). Each document draws only what is its own in between.
 */
import PDFDocument from 'pdfkit';
import { LORA, registerLora } from './pdf-fonts';
import { pdfText } from './pdf-format';
import { Flow, INK, STYLE, TAGGED_PDF } from './pdf-layout';

export interface Margins {
  top: number;
  bottom: number;
  left: number;
  right: number;
}

/** The margins of the one- and two-page documents (receipts, invoices, acceptance records, purchase orders). */
export const LETTER_MARGINS: Margins = { top: 60, bottom: 60, left: 56, right: 56 };

export interface PdfInfo {
  title: string;
  author: string;
  subject: string;
  keywords?: string;
}

export interface OpenPdf {
  doc: PDFKit.PDFDocument;
  flow: Flow;
  /** Ends the document; resolves with its bytes. */
  finish(): Promise<Buffer>;
}

export function openPdf(paperSize: 'A4' | 'Letter', info: PdfInfo, margins: Margins = LETTER_MARGINS): OpenPdf {
  const doc = new PDFDocument({
    ...TAGGED_PDF,
    size: paperSize === 'Letter' ? 'LETTER' : 'A4',
    margins: { ...margins },
    bufferPages: true,
    autoFirstPage: true,
    info: {
      Title: pdfText(info.title),
      Author: pdfText(info.author),
      Subject: pdfText(info.subject),
      Creator: 'Shellwright',
      ...(info.keywords ? { Keywords: pdfText(info.keywords) } : {}),
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  registerLora(doc);
  doc.font(LORA.regular);
  const flow = new Flow(doc);
  flow.y = flow.top;
  return {
    doc,
    flow,
    finish() {
      doc.end();
      return done;
    },
  };
}

/** The head of a one- or two-page document: the workshop's name, the title, then a muted line of references. */
export function drawLetterhead(flow: Flow, workshopName: string, title: string, references: string): void {
  flow.label(pdfText(workshopName), flow.left, flow.y, flow.width);
  flow.y += 14;
  flow.paragraph(title, { font: LORA.semibold, size: 20, color: INK.walnut }, { after: 4 });
  flow.paragraph(references, STYLE.smallMuted, { after: 18 });
}

export interface WorkshopContact {
  name: string;
  phone: string | null;
  email: string | null;
}

/**
 * The footer of every page, drawn once the page count is known: the workshop's contact details on the left and the
 * page label (by default "Page 2 of 3") on the right.
 */
export function drawContactFooter(
  flow: Flow,
  workshop: WorkshopContact,
  pageLabel: (page: number, pages: number) => string = (page, pages) => `Page ${page} of ${pages}`,
  labelWidth = 90,
  margins: Margins = LETTER_MARGINS,
): void {
  const { doc } = flow;
  const range = doc.bufferedPageRange();
  const contact = [workshop.name, workshop.phone, workshop.email].filter(Boolean).join(' · ');
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const fy = doc.page.height - 40;
    const right = doc.page.width - margins.right;
    flow.hRule(margins.left, right, fy - 8, INK.rule, 0.5);
    flow.textAt(contact, margins.left, fy, right - margins.left - labelWidth, { ...STYLE.smallMuted, size: 8 }, { oneLine: true, ellipsis: true });
    flow.textAt(pageLabel(i - range.start + 1, range.count), right - labelWidth, fy, labelWidth, { ...STYLE.smallMuted, size: 8 }, { align: 'right', oneLine: true });
  }
}
