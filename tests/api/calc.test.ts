import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MaterialPack, PackPrice, Material } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app, caches } = getTestApp();
afterAll(closeTestApp);

let s: Session;
beforeAll(async () => {
  s = await signInAs(app, 'sales');
});

const preview = (body: unknown) => s.agent.post('/api/calc/preview').set('x-csrf-token', s.csrf).send(body as object);
const smallest = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' };

describe('POST /api/calc/preview', () => {
  it('answers the smallest request with totals first, cautions and the detail', async () => {
    const res = await preview(smallest).expect(200);
    expect(Object.keys(res.body)[0]).toBe('totals');
    const t = res.body.totals;
    for (const key of ['areaM2', 'coats', 'labourHours', 'flakesG', 'spiritL', 'calendarDays']) expect(typeof t[key]).toBe('number');
    expect(t.price).toMatch(/^\d+\.\d{2}$/);
    expect(t.currency).toBe('GBP');
    expect(res.body.cautions.length).toBeGreaterThan(0);
    expect(res.body.cautions.map((c: { code: string }) => c.code)).toEqual(expect.arrayContaining(['flammable-vapour', 'oily-rags']));
    expect(JSON.stringify(res.body.cautions)).toMatch(/local fire codes/i);
    expect(res.body.catalogVersion).toMatch(/^pl-[0-9a-f]{12}$/);
    expect(res.body.parts.length).toBeGreaterThan(10);
    expect(res.body.calendar.sessions.length).toBeGreaterThan(5);
    expect(res.body.ventilation).toBeTruthy();
  });

  it('reads prices from the database: a new shellac price changes the materials line', async () => {
    const before = await preview(smallest).expect(200);
    const flakes = await Material.findOne({ where: { key: 'shellac-flakes' } });
    const packs = await MaterialPack.findAll({ where: { materialId: flakes!.id } });
    const added = await Promise.all(packs.map((p) => PackPrice.create({ packId: p.id, price: '999.00', effectiveFrom: '2026-11-01', userId: null, source: 'test' })));
    // Written straight to the table: the app hears of it through the database's notification.
    await caches.settle();
    try {
      const after = await preview(smallest).expect(200);
      const line = (r: typeof before) => Number(r.body.price.lines.find((l: { code: string }) => l.code === 'materials').amount);
      expect(line(after)).toBeGreaterThan(line(before) + 500);
      expect(after.body.catalogVersion).not.toBe(before.body.catalogVersion);
    } finally {
      await Promise.all(added.map((p) => p.destroy()));
      await caches.settle();
    }
  });

  const bad: [string, unknown, string][] = [
    ['a negative length', { piece: { template: 'grand', dimensions: { length: '-190 cm' } } }, 'piece.dimensions.length'],
    ['NaN as a length', { piece: { template: 'grand', dimensions: { length: 'NaN' } } }, 'piece.dimensions.length'],
    ['1e308', { piece: { template: 'grand', dimensions: { length: 1e308 } } }, 'piece.dimensions.length'],
    ['a string where a number belongs', { ...smallest, discountPct: 'ten' }, 'discountPct'],
    ['an empty parts list', { parts: [] }, 'parts'],
    ['an unknown system', { ...smallest, system: 'lacquer-spray' }, 'system'],
    ['an unknown template', { piece: { template: 'harpsichord', dimensions: {} } }, 'piece.template'],
    ['gibberish units', { piece: { template: 'grand', dimensions: { length: 'six furlongs' } } }, 'piece.dimensions.length'],
    ['a body that is not an object', [1, 2, 3], '(body)'],
    ['a template grown past the part limits (a lid edge over 100 m)', { piece: { template: 'grand', dimensions: { length: '90 m', width: '40 m' } } }, 'piece.dimensions.length'],
    ['parts too large for the calendar to place', { parts: [{ name: 'Floor', shape: { kind: 'rectangle', length: '100 m', width: '100 m' }, count: 1000 }] }, 'parts'],
    ['a comma between feet and inches', { piece: { template: 'grand', dimensions: { length: '6 ft, 3 in' } } }, 'piece.dimensions.length'],
  ];
  for (const [what, body, field] of bad) {
    it(`answers 400 naming the field for ${what}`, async () => {
      const res = await preview(body);
      expect(res.status).toBe(400);
      const problem = JSON.parse(res.text);
      expect(problem.field).toBe(field);
      expect(problem.errors.map((e: { field: string }) => e.field)).toContain(field);
      // The detail is a whole sentence in plain words, not "path: message".
      expect(problem.detail).toMatch(/^[A-Z].*\.$/);
      expect(problem.detail).not.toContain(`${field}:`);
    });
  }

  it('reads imperial lengths with fractions as workshops write them: 6\' 3-1/2" is 75.5 in', async () => {
    const a = await preview({ piece: { template: 'grand', dimensions: { length: '6\' 3-1/2"' } }, system: 'full-repolish' });
    const b = await preview({ piece: { template: 'grand', dimensions: { length: '1917.7 mm' } }, system: 'full-repolish' });
    expect(a.status).toBe(200);
    expect(a.body.totals.areaM2).toBe(b.body.totals.areaM2);
    expect(JSON.parse(a.text).detail ?? '').not.toMatch(/decimals/);
    const comma = await preview({ piece: { template: 'grand', dimensions: { length: '6 ft, 3 in' } } });
    expect(JSON.parse(comma.text).detail).toMatch(/without a comma/);
  });

  it('flags implausible input instead of pricing it silently: a grand 5 mm long', async () => {
    const res = await preview({ piece: { template: 'grand', dimensions: { length: '5 mm' } }, system: 'full-repolish' });
    expect(res.status).toBe(200);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('implausible-size');
  });

  it('answers 400 for 10 000 parts, never a 500', async () => {
    const parts = Array.from({ length: 10_000 }, (_, i) => ({ name: `p${i}`, shape: { kind: 'rectangle', length: 100, width: 100 } }));
    const res = await preview({ parts });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).field).toBe('parts');
  });

  it('ignores a total sent by the client', async () => {
    const res = await preview({ ...smallest, totals: { price: '1.00' } });
    if (res.status === 200) expect(res.body.totals.price).not.toBe('1.00');
    else expect(res.status).toBe(400);
  });
});

describe('GET /api/calc/catalog', () => {
  it('gives the client the catalog and settings to run the engine live, with no hidden fields', async () => {
    const res = await s.agent.get('/api/calc/catalog').expect(200);
    expect(res.body.catalog.systems.map((x: { key: string }) => x.key)).toEqual(expect.arrayContaining(['full-repolish', 're-body', 'revive', 'new-work']));
    expect(res.body.catalog.materials.find((m: { key: string }) => m.key === 'spirit').packs[0].price).toMatch(/^\d+\.\d{2}$/);
    expect(res.body.settings.pricing.taxPct).toBe(20);
  });
});
