import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, unlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { QuoteDocument } from '../../server/pdf/quote-document';
import { renderQuotePdf } from '../../server/pdf/quote-pdf';

const ARTIFACTS = fileURLToPath(new URL('../artifacts/pdf/', import.meta.url));
let tmp = '';

beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'quote-pdf-'));
  mkdirSync(ARTIFACTS, { recursive: true });
});
afterAll(() => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

async function photo(): Promise<Buffer> {
  // A warm brown board with a lighter worn band, 4:3.
  const band = await sharp({ create: { width: 640, height: 90, channels: 3, background: '#c8955e' } }).png().toBuffer();
  return sharp({ create: { width: 640, height: 480, channels: 3, background: '#6b3f22' } })
    .composite([{ input: band, top: 250, left: 0 }])
    .png()
    .toBuffer();
}

const CAUTIONS: QuoteDocument['cautions'] = [
  {
    code: 'flammable-vapour',
    severity: 'danger',
    text: 'Spirit is highly flammable: its flash point is about 13 °C, below room temperature, so it gives off an ignitable vapour at any workshop temperature.',
  },
  { code: 'ignition-sources', severity: 'danger', text: 'No naked flames, smoking, heaters with exposed elements or sparking tools where spirit or polish is open or drying.' },
  {
    code: 'ventilation',
    severity: 'warning',
    text: 'Ventilate the finishing room: the busiest session evaporates about 4.2 mL of spirit a minute, which needs at least 1740 m³/h (1025 ft³/min) of fresh air with mixing factor 3 to stay below 1000 ppm; the room supplies 2100 m³/h.',
  },
  { code: 'oily-rags', severity: 'danger', text: 'Rags and rubbers with oil can heat up and catch fire on their own: spread them flat or hang them to dry outdoors, or keep them in a closed metal can of water until they can be.' },
  { code: 'gloves-eyes', severity: 'warning', text: 'Wear solvent-resistant gloves and eye protection when stripping, mixing polish and handling spirit.' },
  { code: 'local-rules', severity: 'info', text: 'Local fire codes, the workplace-safety regulator and licensed practice come first: these figures do not replace them.' },
];

async function baseQuote(): Promise<QuoteDocument> {
  return {
    paperSize: 'A4',
    workshop: {
      name: 'Hollowbrook Polishing Rooms',
      address: 'Unit 4, Tanyard Mews\nLower Wickham Lane, Elmsford EL4 7QT',
      email: 'studio@hollowbrook.example',
      phone: '+44 1632 960 418',
    },
    quote: {
      number: 'Q-2027-0007',
      estimateNumber: 'E-2027-0031',
      issuedOn: '2027-02-10',
      validUntil: '2027-03-12',
      message:
        'Dear Mrs Farthingale,\n\nThank you for bringing your grand piano to us. Having looked at it closely, we recommend taking the case back to the wood and French-polishing it in full: the old finish has crazed across the lid and worn through along the keyslip, and patching it would not last.\n\nThe figures below set out the work stage by stage, what it costs and how long the piece will stay with us. If anything is unclear we are happy to walk you through it at the workshop.',
      currency: 'GBP',
      pricesIncludeTax: true,
      taxLabel: 'VAT',
      preparedBy: 'Tobias Wrenfield',
    },
    customer: {
      name: 'Imogen Farthingale',
      address: '12 Quillon Terrace\nHarrowdene HD2 9LS',
      email: 'imogen.farthingale@example.net',
      phone: '07700 900 183',
    },
    piece: {
      description: 'Boudoir grand piano in figured rosewood',
      kind: 'Grand piano',
      maker: 'Aldwyn & Petherick',
      year: 'c. 1912',
      serial: '41 207',
      photo: await photo(),
      photoCaption: 'Lid and fallboard on arrival: crazing and a worn band along the keyslip.',
    },
    work: {
      systemName: 'Full French polish, traditional shellac',
      areaM2: 8.83,
      areaText: '8.83 m²',
      totalCoats: 24,
      labourHours: 46.5,
      calendarDays: 21,
      startDate: '2027-03-15',
      readyDate: '2027-04-05',
      datesBooked: true,
      stages: [
        { name: 'Strip and clean', sessions: 2, coats: null, hours: 9, restText: '1 day to dry out' },
        { name: 'Fill the grain', sessions: 1, coats: 2, hours: 5.5, restText: '2 days' },
        { name: 'Bodying up', sessions: 4, coats: 12, hours: 18, restText: '1 day between sessions' },
        { name: 'Spiriting off', sessions: 2, coats: 8, hours: 9, restText: '7 days to harden' },
        { name: 'Burnish and wax', sessions: 1, coats: 2, hours: 5, restText: 'none' },
      ],
    },
    price: {
      lines: [
        { label: 'Materials', amount: '312.40' },
        { label: 'The work: about 46.5 h of hands-on polishing', amount: '3563.71' },
        { label: 'VAT (20 %)', amount: '775.22' },
        { label: 'Rounding', amount: '0.67' },
      ],
      total: '4994.00',
      depositPct: 30,
      deposit: '1498.20',
      balance: '3495.80',
      agreed: null,
    },
    extras: [
      { label: 'Regild the lid lettering', description: 'Gold leaf over the original name board lettering, sealed under the polish.', hours: 3.5, price: '285.00' },
      { label: 'New castor cups', description: 'A set of three turned walnut castor cups with felt bases.', hours: 1, price: '96.00' },
    ],
    terms: [
      'The price is for the work described; anything further is quoted before we start it.',
      'A deposit is due on acceptance and the balance when the piece is ready for collection.',
      'We keep the piece insured while it is in the workshop.',
      'Dates depend on the drying weather; we will tell you at once if they move.',
    ],
    cautions: CAUTIONS,
    ventilationText: 'fresh air of at least 1 740 m³/h while polishing',
  };
}

async function longQuote(paperSize: QuoteDocument['paperSize']): Promise<QuoteDocument> {
  const q = await baseQuote();
  const names = ['Strip and clean', 'Fill the grain', 'Colour and stain', 'Bodying up', 'Stiffen', 'Spiriting off', 'Glaze', 'Burnish'];
  q.paperSize = paperSize;
  // One paragraph longer than a page, which has to flow on line by line.
  const longParagraph = Array.from({ length: 60 }, (_, i) => `Sentence ${i + 1} of the long paragraph explains how the case parts are worked one at a time.`).join(' ');
  q.quote.message = [q.quote.message, ...Array.from({ length: 3 }, (_, i) => `Paragraph ${i + 3}: the case parts are worked one at a time so that each rests before the next coat, and the drying room is kept warm and dry throughout the job.`), longParagraph].join('\n\n');
  q.work.stages = Array.from({ length: 40 }, (_, i) => ({
    name: `${names[i % names.length]} — ${['lid', 'case sides', 'legs and lyre', 'music desk', 'fallboard'][i % 5]}`,
    sessions: 1 + (i % 3),
    coats: i % 4,
    hours: 1.5 + (i % 5) * 0.5,
    restText: i % 7 === 0 ? '7 days to harden before burnishing' : i % 3 === 0 ? '1 day' : `${1 + (i % 3)} days`,
  }));
  q.work.labourHours = q.work.stages.reduce((t, s) => t + s.hours, 0);
  q.work.calendarDays = 96;
  q.price.lines = Array.from({ length: 30 }, (_, i) => ({ label: `Materials and labour, part ${i + 1} of 30`, amount: (120 + i * 7.25).toFixed(2) }));
  q.price.total = '6753.75';
  q.price.deposit = '2026.13';
  q.price.balance = '4727.62';
  q.extras = Array.from({ length: 10 }, (_, i) => ({
    label: `Optional extra number ${i + 1}`,
    description: 'A further piece of work on the case, done alongside the main job and finished to match it.',
    hours: 1 + i,
    price: (80 + i * 45).toFixed(2),
  }));
  q.terms = Array.from({ length: 12 }, (_, i) => `Term ${i + 1}: a condition of the quote written out in full so that it wraps onto a second line of the list at this width.`);
  return q;
}

interface Rendered {
  text: string;
  info: string;
  pages: number;
  words: { page: number; width: number; height: number; xMin: number; yMin: number; xMax: number; yMax: number; text: string }[];
}

/** Writes the PDF under the temp folder, reads it back with poppler and renders the first pages to PNG. */
function inspect(pdf: Buffer, name: string, pngPages = 3): Rendered {
  const file = join(tmp, `${name}.pdf`);
  writeFileSync(file, pdf);
  const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
  const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
  const pages = Number(/^Pages:\s+(\d+)/m.exec(info)?.[1] ?? 0);
  const html = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8' });
  const words: Rendered['words'] = [];
  let page = 0;
  let width = 0;
  let height = 0;
  for (const m of html.matchAll(/<page width="([\d.]+)" height="([\d.]+)">|<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)) {
    if (m[1]) {
      page++;
      width = Number(m[1]);
      height = Number(m[2]);
    } else {
      words.push({ page, width, height, xMin: Number(m[3]), yMin: Number(m[4]), xMax: Number(m[5]), yMax: Number(m[6]), text: m[7] });
    }
  }
  for (const f of readdirSync(ARTIFACTS)) if (f.startsWith(`${name}-`) && f.endsWith('.png')) unlinkSync(join(ARTIFACTS, f));
  if (pngPages > 0) {
    execFileSync('pdftoppm', ['-r', '60', '-png', '-f', '1', '-l', String(pngPages), file, join(ARTIFACTS, name)]);
    writeFileSync(join(ARTIFACTS, `${name}.pdf`), pdf);
  }
  return { text, info, pages, words };
}

const squash = (s: string): string => s.replace(/\s+/g, ' ');

/** Every word lies inside the side margins and either above the bottom margin or in the footer band. */
function expectInsideMargins(r: Rendered): void {
  for (const w of r.words) {
    expect(w.xMin, `"${w.text}" on page ${w.page}`).toBeGreaterThanOrEqual(50);
    expect(w.xMax, `"${w.text}" on page ${w.page}`).toBeLessThanOrEqual(w.width - 50);
    const inBody = w.yMax <= w.height - 70 + 1;
    const inFooter = w.yMin >= w.height - 50 && w.yMax <= w.height - 25;
    expect(inBody || inFooter, `"${w.text}" on page ${w.page} at y ${w.yMin}–${w.yMax}`).toBe(true);
  }
}

describe('renderQuotePdf', () => {
  it('renders a one-job quote a customer can read', async () => {
    const q = await baseQuote();
    const pdf = await renderQuotePdf(q);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const r = inspect(pdf, 'quote-a4');
    const flat = squash(r.text);

    expect(r.pages).toBeGreaterThanOrEqual(1);
    expect(r.info).toMatch(/^Title:\s+Quote Q-2027-0007 for Imogen Farthingale$/m);
    expect(r.info).toMatch(/^Author:\s+Hollowbrook Polishing Rooms$/m);
    expect(r.info).toMatch(/^Subject:\s+\S/m);
    expect(r.info).toMatch(/595\.\d+ x 841\.\d+ pts \(A4\)/);

    expect(flat).toContain('£4,994.00');
    expect(flat).toContain('£1,498.20');
    expect(flat).toContain('£3,495.80');
    expect(flat).toContain('30%');
    expect(flat).toContain('12 March 2027');
    expect(flat).toContain('Imogen Farthingale');
    expect(flat).toContain('Q-2027-0007');
    expect(flat).toContain('E-2027-0031');
    expect(flat).toContain('Aldwyn & Petherick');
    expect(flat).toContain('8.83 m²');
    expect(flat).toContain('46.5 h');
    expect(flat).toContain('21 days');
    expect(flat).toContain('not included in the total above');
    expect(flat).toContain('Lid and fallboard on arrival');
    for (const c of q.cautions) expect(flat).toContain(squash(c.text));
    expect(flat).toContain('Local fire codes');
    expect(flat.toLowerCase()).toContain('local fire codes');
    expect(flat).toContain('1 740 m³/h');
    expect(flat).toContain(`Page 1 of ${r.pages}`);
    expect(flat).toContain(`Page ${r.pages} of ${r.pages}`);
    expectInsideMargins(r);
  });

  it('runs a long job over several pages, repeating table headers', async () => {
    const r = inspect(await renderQuotePdf(await longQuote('A4')), 'quote-long-a4', 8);
    const flat = squash(r.text);
    expect(r.pages).toBeGreaterThanOrEqual(4);
    for (let n = 1; n <= r.pages; n++) expect(flat).toContain(`Page ${n} of ${r.pages}`);
    const lastPage = r.text.split('\f').filter((p) => p.trim()).at(-1) ?? '';
    expect(squash(lastPage)).toContain(`Page ${r.pages} of ${r.pages}`);
    // The stages and price tables each run onto a second page, header row and all.
    expect(flat.match(/SESSIONS\s+COATS\s+HANDS-ON/g)?.length ?? 0).toBeGreaterThanOrEqual(2);
    expect(flat).toContain('The work, continued');
    for (let i = 1; i <= 40; i++) expect(flat).toMatch(new RegExp(`\\b${i}\\. `));
    expect(flat).toContain('part 30 of 30');
    expect(flat).toContain('Optional extra number 10');
    expect(flat).toContain('£6,753.75');
    for (let i = 1; i <= 60; i++) expect(flat).toContain(`Sentence ${i} of the long paragraph`);
    expectInsideMargins(r);
  });

  it('sizes the pages for A4 or US Letter', async () => {
    const a4 = inspect(await renderQuotePdf(await longQuote('A4')), 'size-a4', 0);
    const letter = inspect(await renderQuotePdf(await longQuote('Letter')), 'quote-long-letter', 8);
    expect(a4.info).toMatch(/Page size:\s+595\.\d+ x 841\.\d+ pts \(A4\)/);
    expect(letter.info).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
    expect(letter.pages).toBeGreaterThanOrEqual(a4.pages);
    expect(squash(letter.text)).toContain(`Page ${letter.pages} of ${letter.pages}`);
    expectInsideMargins(letter);
  });

  it('renders without a photo, extras or optional details', async () => {
    const q = await baseQuote();
    q.paperSize = 'Letter';
    q.workshop = { name: 'Hollowbrook Polishing Rooms', address: null, email: null, phone: null };
    q.customer = { name: 'Imogen Farthingale', address: null, email: null, phone: null };
    q.piece = { ...q.piece, maker: null, year: null, serial: null, photo: null, photoCaption: null };
    q.work.startDate = null;
    q.work.readyDate = null;
    q.work.datesBooked = false;
    q.extras = [];
    q.cautions = CAUTIONS.filter((c) => c.code !== 'local-rules');
    q.quote.currency = 'USD';
    q.quote.pricesIncludeTax = false;
    q.quote.taxLabel = 'Sales tax';
    const r = inspect(await renderQuotePdf(q), 'quote-plain-letter', 2);
    const flat = squash(r.text);
    expect(flat).toContain('US$4,994.00');
    expect(flat).not.toContain('Optional extras');
    // No dates are promised before the job is booked.
    expect(flat).toContain('the dates are fixed when we book the work');
    expect(flat).not.toMatch(/we start on|reserved/i);
    expect(flat).toContain('Local fire codes, the workplace-safety regulator and licensed practice come first');
    expect(flat).toContain(`Page 1 of ${r.pages}`);
    expectInsideMargins(r);
  });
});
