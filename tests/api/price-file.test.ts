import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rootDir } from '../../server/config';
import { AuditEntry, Material, MaterialPack, PackPrice, PriceFilePreview } from '../../server/models';
import { detectDelimiter, fileDecimalSeparator, priceFlag, readDate, readDecimal, separatorOf } from '../../server/services/price-file';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
let sales: Session;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
  sales = await signInAs(app, 'sales');
});

const upload = (s: Session, content: string | Buffer, name = 'prices.csv') =>
  s.agent.post('/api/price-list/price-files').set('x-csrf-token', s.csrf).attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), name);
const apply = (s: Session, id: string, contentHash: string) => s.agent.post(`/api/price-list/price-files/${id}/apply`).set('x-csrf-token', s.csrf).send({ contentHash });

async function packId(materialKey: string, size: number) {
  const material = await Material.findOne({ where: { key: materialKey } });
  return (await MaterialPack.findOne({ where: { materialId: material!.id, size: String(size) } }))!.id;
}

describe('reading supplier numbers', () => {
  it('reads decimal commas, thousands and currency signs', () => {
    expect(readDecimal('12,50')).toBe('12.50');
    expect(readDecimal('1.234,50')).toBe('1234.50');
    expect(readDecimal('1,234.50')).toBe('1234.50');
    expect(readDecimal('£ 7.25')).toBe('7.25');
    expect(readDecimal('12.5 EUR')).toBe('12.5');
    expect(readDecimal('twelve')).toBeUndefined();
    expect(readDate('2027-01-15')).toBe('2027-01-15');
    expect(readDate('15/01/2027')).toBe('2027-01-15');
    expect(readDate('31/02/2027')).toBeUndefined();
    expect(detectDelimiter('a;b;c\n1,5;2;3')).toBe(';');
    expect(detectDelimiter('a,b,"c;d"\n')).toBe(',');
  });
});

describe('the file\'s decimal separator and negative amounts', () => {
  it('reads "1,234" by the file\'s separator: what its other numbers prove, else the delimiter\'s convention', () => {
    expect(separatorOf('1,234')).toBeUndefined();
    expect(separatorOf('12,50')).toBe(',');
    expect(separatorOf('1.234,50')).toBe(',');
    expect(readDecimal('1,234', '.')).toBe('1234');
    expect(readDecimal('1,234', ',')).toBe('1.234');
    expect(fileDecimalSeparator(['1,234', '7.50', '12.00'], ';')).toBe('.');
    expect(fileDecimalSeparator(['1,234', '7,50'], ',')).toBe(',');
    expect(fileDecimalSeparator(['1,234'], ';')).toBe(',');
    expect(fileDecimalSeparator(['1,234'], ',')).toBe('.');
    // Grouping must be in threes: "1,23,4" is not a number in a point-decimal file.
    expect(readDecimal('1,23,4', '.')).toBeUndefined();
  });

  it('reads accountants\' brackets and trailing minus signs as negative', () => {
    expect(readDecimal('(5.00)', '.')).toBe('-5.00');
    expect(readDecimal('£(5.00)', '.')).toBe('-5.00');
    expect(readDecimal('(£5.00)', '.')).toBe('-5.00');
    expect(readDecimal('5.00)', '.')).toBeUndefined();
    expect(readDecimal('5.00-', '.')).toBe('-5.00');
    expect(readDecimal('-5,00', ',')).toBe('-5.00');
  });

  it('flags absurd prices: far from the price in force, or more per unit than any finishing material costs', () => {
    expect(priceFlag('9.95', '9.50', 200, 'g')).toBeNull();
    expect(priceFlag('995.00', '9.95', 200, 'g')).toMatch(/100× the price in force/);
    expect(priceFlag('0.99', '9.95', 200, 'g')).toMatch(/% of the price in force/);
    expect(priceFlag('12000', null, 250, 'g')).toMatch(/per g.*for one pack|for one pack/);
    expect(priceFlag('12.35', null, 250, 'g')).toBeNull();
  });

  it('refuses (5.00) row by row, reads 1,234 by the stated rule, flags a decimal slip in the preview, and changes nothing', async () => {
    const csv = [
      'supplier,supplier_code,pack_size,unit,price,effective_date',
      'Quillby Finishing Supplies,WAX-200,200,g,(5.00),2026-11-28',
      'Quillby Finishing Supplies,WAX-400,400,g,995.00,2026-11-28',
      'Quillby Finishing Supplies,PUMICE-1000,"1,000",g,16.00,2026-02-30',
    ].join('\n');
    const before = await PackPrice.count();
    const res = await upload(owner, csv, 'odd.csv').expect(201);
    expect(res.body.decimalSeparator).toBe('.');
    expect(res.body.canApply).toBe(false);
    expect(res.body.errors.map((e: { line: number }) => e.line)).toEqual([2, 4]);
    expect(res.body.errors[0].reason).toMatch(/price "\(5\.00\)" is negative/);
    expect(res.body.errors[1].reason).toMatch(/effective date "2026-02-30" is not a date/);
    const wax400 = res.body.matched.find((m: { supplierCode: string }) => m.supplierCode === 'WAX-400');
    expect(wax400.flag).toMatch(/Check this price/);
    expect(await PackPrice.count()).toBe(before);

    // "1,000" in a comma-separated file of point decimals is a thousand grams: the 1 kg pack.
    const semi = await upload(owner, 'supplier,supplier_code,pack_size,unit,price\nQuillby Finishing Supplies,PUMICE-1000,"1,000",g,16.00\n').expect(201);
    expect(semi.body.errors).toEqual([]);
    expect([...semi.body.matched, ...semi.body.unchanged][0]).toMatchObject({ packSize: '1000' });
  });

  it('refuses a file holding a NUL character with 400, and a date outside the bounds row by row', async () => {
    const nul = await upload(owner, 'supplier,supplier_code,price\nQuillby\u0000,WAX-200,9.00\n');
    expect(nul.status).toBe(400);
    expect(JSON.parse(nul.text)).toMatchObject({ field: 'file' });
    const far = await upload(owner, 'supplier,supplier_code,price,effective_date\nQuillby Finishing Supplies,WAX-200,9.00,2099-01-01\n').expect(201);
    expect(far.body.errors[0].reason).toMatch(/effective date "2099-01-01" must be at most 2 years from today/);
  });
});

describe('supplier price file', () => {
  it('previews matched packs with old and new price and change, new items and unknown columns, then applies in one go', async () => {
    const csv = [
      'Supplier,Supplier code,Description,Pack size,Unit,Price,Effective date,Colour',
      'Quillby Finishing Supplies,POLISHING-OIL-250,Rubber oil light,250,mL,"5,15",2026-11-25,pale',
      'Quillby Finishing Supplies,POLISHING-OIL-500,Rubber oil light,0.5,L,8.40,25/11/2026,pale',
      'Grindlewick Abrasives,ABRASIVE-SHEET-10,Abrasive sheets,10,sheet,7.50,2026-09-01,grey',
      'Thimbledown Textiles,,Cotton wadding for rubbers,1,kg,19.90,2026-11-25,white',
      'Thimbledown Textiles,TT-MUTTON-1,Mutton cloth roll,1,each,6.75,2026-11-25,white',
    ].join('\r\n');
    const res = await upload(owner, csv, 'thimble-nov.csv').expect(201);
    const p = res.body;
    expect(p).toMatchObject({ fileName: 'thimble-nov.csv', delimiter: ',', rowCount: 5, unknownColumns: ['Colour'], errors: [], canApply: true, currency: 'GBP' });
    expect(p.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(p.matched).toHaveLength(2);
    expect(p.matched[0]).toMatchObject({ line: 2, materialName: 'Rubber oil, light', packSize: '250', oldPrice: '4.80', newPrice: '5.15', changePct: '7.3', effectiveFrom: '2026-11-25' });
    expect(p.matched[1]).toMatchObject({ line: 3, packSize: '500', oldPrice: '7.90', newPrice: '8.40', changePct: '6.3' });
    // Same price on the same date: nothing to do for that row.
    expect(p.unchanged).toHaveLength(1);
    expect(p.newItems).toEqual([
      expect.objectContaining({ line: 5, kind: 'new-pack', materialName: 'Cotton wadding for rubbers', packSize: '1000', unit: 'g', newPrice: '19.90' }),
      expect.objectContaining({ line: 6, kind: 'new-material', materialName: 'Mutton cloth roll', materialKey: 'mutton-cloth-roll', unit: 'each', supplierCode: 'TT-MUTTON-1' }),
    ]);
    // Nothing changed yet.
    const oil250 = await packId('polishing-oil', 250);
    expect(await PackPrice.count({ where: { packId: oil250, price: '5.15' } })).toBe(0);

    // The preview is stored, not kept in memory: it reads back by id.
    const again = await owner.agent.get(`/api/price-list/price-files/${p.id}`).expect(200);
    expect(again.body.matched).toEqual(p.matched);

    const wrongHash = await apply(owner, p.id, '0'.repeat(64));
    expect(wrongHash.status).toBe(409);
    expect(JSON.parse(wrongHash.text).code).toBe('price_file_changed');

    const applied = await apply(owner, p.id, p.contentHash).expect(200);
    expect(applied.body).toMatchObject({ pricesAdded: 4, packsAdded: 2, materialsAdded: 1 });
    expect(applied.body.catalogVersion).toHaveProperty('changed');
    const row = await PackPrice.findOne({ where: { packId: oil250, price: '5.15' } });
    expect(row).toMatchObject({ effectiveFrom: '2026-11-25', source: 'file: thimble-nov.csv' });
    const mutton = await Material.findOne({ where: { key: 'mutton-cloth-roll' } });
    expect(mutton).toMatchObject({ kind: 'other', unit: 'each' });
    const summary = await AuditEntry.findOne({ where: { action: 'price-file.apply', entityId: p.id } });
    expect(summary?.after).toMatchObject({ fileName: 'thimble-nov.csv', pricesAdded: 4 });
    const priceAudit = await AuditEntry.findOne({ where: { action: 'pack-price.create', entityId: String(oil250) }, order: [['id', 'DESC']] });
    expect(priceAudit?.before).toMatchObject({ price: '4.80' });
    expect(priceAudit?.after).toMatchObject({ price: '5.15', source: 'file: thimble-nov.csv' });

    const twice = await apply(owner, p.id, p.contentHash);
    expect(JSON.parse(twice.text).code).toBe('price_file_applied');
  });

  it('a file with a bad row applies nothing, and lists each row it cannot read with its line and reason', async () => {
    const csv = [
      'supplier;supplier_code;pack_size;unit;price;effective_date',
      'Quillby Finishing Supplies;WAX-200;200;g;9,95;2026-11-28',
      'Quillby Finishing Supplies;WAX-400;400;g;zwölf;2026-11-28',
      'Quillby Finishing Supplies;NO-SUCH-CODE;;g;3,00;2026-11-28',
      'Quillby Finishing Supplies;WAX-200;200;mL;9,95;2026-11-28',
      ';PUMICE-250;250;g;6,10;2026-11-28',
      'Quillby Finishing Supplies;PUMICE-1000;1000;g;16,00;2026-13-01',
    ].join('\n');
    const res = await upload(owner, csv, 'broken.csv').expect(201);
    expect(res.body.delimiter).toBe(';');
    expect(res.body.canApply).toBe(false);
    expect(res.body.matched).toHaveLength(1);
    expect(res.body.errors.map((e: { line: number }) => e.line)).toEqual([3, 4, 5, 6, 7]);
    expect(res.body.errors[0].reason).toMatch(/price "zwölf" is not an amount/);
    expect(res.body.errors[1].reason).toMatch(/NO-SUCH-CODE is not in the price list/);
    expect(res.body.errors[2].reason).toMatch(/unit mL does not fit a material counted in g/);
    expect(res.body.errors[3].reason).toMatch(/supplier is empty/);
    expect(res.body.errors[4].reason).toMatch(/effective date "2026-13-01" is not a date/);

    const wax200 = await packId('wax', 200);
    const before = await PackPrice.count();
    const refused = await apply(owner, res.body.id, res.body.contentHash);
    expect(refused.status).toBe(409);
    expect(JSON.parse(refused.text).code).toBe('price_file_has_errors');
    expect(await PackPrice.count()).toBe(before);
    expect(await PackPrice.count({ where: { packId: wax200, price: '9.95' } })).toBe(0);
  });

  it('applies nothing when a previewed old price moved before confirmation', async () => {
    const csv = 'supplier,supplier_code,price,effective_date\nGrindlewick Abrasives,BURNISHING-CREAM-250,10.40,2026-11-29\nGrindlewick Abrasives,BURNISHING-CREAM-500,17.60,2026-11-29\n';
    const res = await upload(owner, csv).expect(201);
    expect(res.body.canApply).toBe(true);
    const cream500 = await packId('burnishing-cream', 500);
    // Someone else prices the 500 mL pack in between.
    await owner.agent.post(`/api/price-list/packs/${cream500}/prices`).set('x-csrf-token', owner.csrf).send({ price: '17.00', effectiveFrom: '2026-11-28' }).expect(201);
    const before = await PackPrice.count();
    const refused = await apply(owner, res.body.id, res.body.contentHash);
    expect(refused.status).toBe(409);
    expect(JSON.parse(refused.text)).toMatchObject({ code: 'prices_moved' });
    expect(JSON.parse(refused.text).detail).toMatch(/Line 3/);
    expect(await PackPrice.count()).toBe(before);
    expect(await PreviewAppliedAt(res.body.id)).toBeNull();
  });

  it('refuses a file without the needed columns, an unreadable CSV, an empty upload, a large file and other roles', async () => {
    const cols = await upload(owner, 'name,cost\nWax,3\n');
    expect(cols.status).toBe(400);
    expect(JSON.parse(cols.text)).toMatchObject({ code: 'price_file_columns', field: 'file' });
    expect(JSON.parse(cols.text).detail).toMatch(/supplier, price/);
    const quotes = await upload(owner, 'supplier,supplier_code,price\n"Quillby,WAX-200,9.00\n');
    expect(JSON.parse(quotes.text)).toMatchObject({ status: 400, code: 'price_file_unreadable' });
    const none = await owner.agent.post('/api/price-list/price-files').set('x-csrf-token', owner.csrf).send({});
    expect(JSON.parse(none.text)).toMatchObject({ status: 400, field: 'file' });
    const big = await upload(owner, Buffer.alloc(600 * 1024, 'a'));
    expect(big.status).toBe(413);
    await upload(sales, 'supplier,supplier_code,price\nX,Y,1\n').expect(403);
    const badId = await apply(owner, 'not-a-uuid', 'a'.repeat(64));
    expect(JSON.parse(badId.text)).toMatchObject({ status: 400, field: 'id' });
  });

  it('reads the demo fixture: semicolons, decimal commas, litres and a kind column', async () => {
    const file = fs.readFileSync(path.join(rootDir, 'tests', 'fixtures', 'supplier-prices.csv'));
    const res = await upload(owner, file, 'supplier-prices.csv').expect(201);
    expect(res.body).toMatchObject({ delimiter: ';', errors: [], unknownColumns: ['vat_band'] });
    const spirit = res.body.matched.find((m: { supplierCode: string }) => m.supplierCode === 'SPIRIT-1000');
    expect(spirit).toMatchObject({ packSize: '1000', unit: 'mL', newPrice: '6.85' });
    expect(res.body.newItems[0]).toMatchObject({ materialName: 'Shellac flakes, amber button', materialKind: 'shellac' });
    // Previewing changes nothing (the browser test applies this file).
  });
});

async function PreviewAppliedAt(id: string) {
  return (await PriceFilePreview.findByPk(id))!.appliedAt;
}
