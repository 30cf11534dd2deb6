/** The purchase order is a tagged PDF (poppler's pdfinfo) that carries its number, supplier and lines as text. */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { renderPurchaseOrderPdf } from '../../server/pdf/purchase-order-pdf';

const tmp = mkdtempSync(join(tmpdir(), 'po-pdf-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('purchase order PDF', () => {
  it('is tagged and reads as the order', async () => {
    const pdf = await renderPurchaseOrderPdf({
      paperSize: 'A4',
      workshop: { name: 'Elmcroft Polishing', address: '4 Lantern Yard\nBrackley BK1 2VC', email: 'bench@elmcroft.invalid', phone: '01234 000111' },
      number: 'PO-2026-0007',
      supplier: 'Hollowmere Finishes',
      date: '2026-12-02',
      expectedOn: '2026-12-09',
      currency: 'GBP',
      lines: Array.from({ length: 40 }, (_, i) => ({ material: `Blonde shellac flakes ${i + 1}`, pack: '500 g bag', code: `HF-${i}`, packs: 2, packPrice: '18.40', amount: '36.80' })),
      total: '1472.00',
      note: 'Please leave at the side door.',
    });
    const file = join(tmp, 'po.pdf');
    writeFileSync(file, pdf);
    expect(execFileSync('pdfinfo', [file], { encoding: 'utf8' })).toMatch(/Tagged:\s+yes/);
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    expect(text).toContain('Purchase order PO-2026-0007');
    expect(text).toContain('Hollowmere Finishes');
    expect(text).toContain('Blonde shellac flakes 40');
    expect(text).toContain('£1,472.00');
    expect(text).toContain('9 December 2026');
  });
});
