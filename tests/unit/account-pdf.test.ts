/**
 * Receipts, invoices and credit notes are tagged PDFs in the house layout: title, language, headings in reading
 * order, every figure printed as issued, the safety note, and a long invoice running onto further pages with its
 * number on each. Read with poppler's pdfinfo and pdftotext.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DocumentContent } from '../../server/models/accounts';
import { renderAccountPdf } from '../../server/pdf/account-pdf';

let tmp = '';
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'account-pdf-'));
});
afterAll(() => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

const INVOICE: DocumentContent = {
  kind: 'invoice',
  number: 'INV-00012',
  issuedOn: '2026-12-02',
  paperSize: 'A4',
  workshop: { name: 'Larkspur Lane Polishing Workshop', address: 'Unit 4, Tannery Yard\nMiddlecombe MC4 7KV', email: 'hello@larkspur.example', phone: '01632 960 418' },
  customer: { name: 'Perpetua Langstroth', address: '4 Varnish Row\nOldbury OK1 4MK', email: 'perpetua@example.com' },
  quoteNumber: 'Q-2026-0042',
  jobNumbers: ['JOB-0007'],
  currency: 'GBP',
  lines: [{ description: 'Walnut upright piano', note: 'Full repolish, as quoted in Q-2026-0042', amount: '1234.56' }],
  total: '1234.56',
  net: '1028.80',
  tax: '205.76',
  taxLabel: 'VAT',
  taxPct: 20,
  payments: [
    { label: 'Deposit paid by card', date: '2026-11-20', amount: '308.64' },
    { label: 'Paid by cash (Till slip 0042)', date: '2026-12-01', amount: '400.00' },
  ],
  credits: [],
  balanceDue: '525.92',
  agreedTotal: '1234.56',
  receivedToDate: '708.64',
  reason: null,
  againstNumber: null,
  refund: null,
  note: null,
};

async function write(content: DocumentContent, name: string): Promise<string> {
  const file = join(tmp, `${name}.pdf`);
  writeFileSync(file, await renderAccountPdf(content));
  return file;
}
const info = (file: string) => execFileSync('pdfinfo', [file], { encoding: 'utf8' });
const text = (file: string) => execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');

describe('account documents', () => {
  it('a tax invoice is tagged, titled, and prints every figure, the deductions and the balance due', async () => {
    const file = await write(INVOICE, 'invoice');
    const i = info(file);
    expect(i).toMatch(/^Tagged:\s+yes$/m);
    expect(i).toMatch(/^Title:\s+Tax invoice INV-00012$/m);
    const t = text(file);
    for (const s of ['Tax invoice INV-00012', 'Issued 2 December 2026', 'quote Q-2026-0042', 'job JOB-0007', 'Perpetua Langstroth', 'Net of VAT £1,028.80', 'VAT at 20% £205.76', '£1,234.56', 'Deposit paid by card -£308.64', '-£400.00', 'Balance due £525.92']) {
      expect(t).toContain(s);
    }
    expect(t).toMatch(/flammable/);
    expect(t.indexOf('The work')).toBeLessThan(t.indexOf('Paid so far, and the balance'));
    const tree = execFileSync('pdfinfo', ['-struct-text', file], { encoding: 'utf8' });
    expect(tree).toMatch(/H2[\s\S]*"The work"/);
  });

  it('a credit note names its invoice, its reason and the refund; a receipt the payment and what is left', async () => {
    const credit = text(await write({ ...INVOICE, kind: 'credit-note', number: 'CN-00003', againstNumber: 'INV-00012', lines: [{ description: 'Credit against invoice INV-00012', note: 'Castor cups not fitted', amount: '50.00' }], total: '50.00', net: '41.67', tax: '8.33', reason: 'Castor cups not fitted', refund: { method: 'bank transfer', amount: '50.00' }, balanceDue: '0.00' }, 'credit'));
    for (const s of ['Credit note CN-00003', 'against invoice INV-00012', 'Reason: Castor cups not fitted', 'Refunded by bank transfer £50.00', 'VAT at 20% £8.33']) expect(credit).toContain(s);
    const receipt = text(await write({ ...INVOICE, kind: 'receipt', number: 'RC-00009', lines: [{ description: 'Paid by cash (Till slip 0042)', note: 'Received on 1 December 2026', amount: '400.00' }], total: '400.00', net: '333.33', tax: '66.67', balanceDue: '525.92' }, 'receipt'));
    for (const s of ['Receipt RC-00009', 'RECEIVED FROM', 'Amount received £400.00', 'Tax included in this payment: £66.67', 'Still to pay £525.92']) expect(receipt).toContain(s);
  });

  it('a long invoice runs onto more pages, tagged, with its number and page on each', async () => {
    const lines = Array.from({ length: 60 }, (_, n) => ({ description: `Dining chair ${n + 1}`, note: 'Re-body and refresh', amount: '20.00' }));
    const file = await write({ ...INVOICE, lines, total: '1200.00', net: '1000.00', tax: '200.00' }, 'long');
    const pages = Number(/^Pages:\s+(\d+)/m.exec(info(file))?.[1]);
    expect(pages).toBeGreaterThan(1);
    expect(info(file)).toMatch(/^Tagged:\s+yes$/m);
    const t = text(file);
    expect(t).toContain('Dining chair 60');
    expect(t).toContain(`INV-00012 · page ${pages} of ${pages}`);
  });
});
