import { describe, expect, it } from 'vitest';
import { estimate, EstimateError } from '../../../shared/calc';
import { EstimateResultSchema } from '../../../shared/schemas/calc';
import type { EstimateInput, PartInput } from '../../../shared/schemas/calc';
import { money, sumMoney } from '../../../shared/money';
import { DEMO_CATALOG, demoCatalog } from '../../fixtures/catalog';

const GRAND: EstimateInput = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' };

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

const panel = (count: number, extra: Partial<PartInput> = {}): PartInput => ({
  name: 'Side panel', shape: { kind: 'rectangle', length: '1000 mm', width: '500 mm' }, faces: 2, count, species: 'walnut', ...extra,
});

describe('estimate', () => {
  const result = estimate(GRAND, DEMO_CATALOG);

  it('starts with totals and carries cautions', () => {
    expect(Object.keys(result).slice(0, 2)).toEqual(['totals', 'cautions']);
    expect(result.cautions.length).toBeGreaterThan(0);
    expect(result.totals.currency).toBe('GBP');
    expect(result.totals.price).toMatch(/^\d+\.\d{2}$/);
  });

  it('is plain JSON and matches EstimateResultSchema', () => {
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
    expect(() => EstimateResultSchema.parse(result)).not.toThrow();
  });

  it('totals agree with the detail', () => {
    const area = result.parts.reduce((t, p) => t + p.areaM2, 0);
    expect(result.totals.areaM2).toBeCloseTo(area, 2);
    expect(result.totals.coats).toBe(result.stages.reduce((t, s) => t + s.coats, 0));
    expect(result.totals.labourHours).toBeCloseTo(result.stages.reduce((t, s) => t + s.labourHours, 0), 1);
    expect(result.calendar.sessions).toHaveLength(result.stages.reduce((t, s) => t + s.sessions, 0));
    expect(sumMoney(result.price.lines.map((l) => l.amount)).toFixed(2)).toBe(result.totals.price);
  });

  it('the grand\u2019s bodying cut: 1.5 lb per US gallon = 1.5 × 453.59237 g / 3.785411784 L = 179.74 g/L', () => {
    // Pound (CFR-500.19 / YARD-POUND-1959) and US gallon (NIST-HB44), worked by hand.
    const body = result.stages.find((s) => s.kind === 'body')!;
    expect(body.cutGPerL).toBeCloseTo(179.74, 2);
    expect(body.cutBasis).toBe('us');
  });

  it('bodying 1 m² of flat walnut, worked by hand: 277.2 mL of polish, 43.33 g of flakes, 0.3811 L of spirit, 4.2 h', () => {
    // The demo catalog's bodying stage: 7 sessions × 3 coats, 1.5 lb cut, 12 mL/m² a coat, 20 mL/m² of extra spirit a
    // session, 7 min/m² a coat, 15 min set-up a session; 10 % waste on polish; flakes at 1.2 g/cm³. Walnut's
    // absorbency (1.3) is for first coats only, so bodying does not take it. A 1000 × 500 mm panel, 2 faces = 1 m².
    // Polish: 21 coats × 12 mL = 252 mL; + 10 % = 277.2 mL.
    // Cut: 1.5 × 453.59237 / 3.785411784 = 179.739 g per litre of spirit; 179.739 g at 1.2 g/cm³ fill 149.78 mL, so
    //   a litre of spirit makes 1.14978 L of polish. Spirit in the polish: 0.2772 / 1.14978 = 0.241090 L;
    //   flakes: 0.241090 × 179.739 = 43.33 g.
    // Spirit: 0.241090 L in the polish + 7 sessions × 20 mL = 0.140 L → 0.3811 L.
    // Labour: 21 × 7 min + 7 × 15 min = 147 + 105 = 252 min = 4.2 h; hands-on 252 / 7 = 36 min = 0.6 h a session.
    const one = estimate({ ...GRAND, piece: { parts: [panel(1)] } }, DEMO_CATALOG);
    const body = one.stages.find((s) => s.kind === 'body')!;
    expect(body.areaM2).toBeCloseTo(1, 10);
    expect(body.coats).toBe(21);
    expect(body.polishL).toBeCloseTo(0.2772, 4);
    expect(body.flakesG).toBeCloseTo(43.33, 2);
    expect(body.spiritL).toBeCloseTo(0.3811, 4);
    expect(body.labourHours).toBeCloseTo(4.2, 6);
    expect(body.handsOnHoursPerSession).toBeCloseTo(0.6, 6);
  });

  it('prices bodying 1 m² of walnut, worked by hand from the pack prices to the deposit', () => {
    // Demo catalog: whole packs charged, 25 % markup on materials, polisher £42.00/h, 12 % overhead, 15 % margin,
    // 20 % VAT, rounded to £1, 30 % deposit. Needs as worked above (43.33 g flakes, 381.1 mL spirit; 7 × 2 mL oil,
    // 7 × 3 g wadding, 7 × 0.05 = 0.35 cloth → 1 whole cloth), each in its smallest pack:
    //   flakes 250 g £11.40 + spirit 1 L £6.20 + oil 250 mL £4.80 + wadding 100 g £3.10 + cloths (5) £4.25 = £29.75.
    // Materials: 29.75 × 1.25 = 37.1875 → £37.19. Labour: 4.2 h × 42.00 = £176.40.
    // Overhead: 12 % × (37.19 + 176.40 = 213.59) = 25.6308 → £25.63. Margin: 15 % × (213.59 + 25.63 = 239.22)
    //   = 35.883 → £35.88. Net: 239.22 + 35.88 = £275.10. VAT: 20 % = £55.02. 330.12 rounded to £1 = £330.00
    //   (rounding −0.12). Deposit: 30 % = £99.00; balance £231.00.
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const bodyOnly = system.stages.filter((s) => s.kind === 'body');
    const r = estimate({ ...GRAND, piece: { parts: [panel(1)] }, stages: bodyOnly }, DEMO_CATALOG);
    expect(r.materials.map((m) => [m.key, m.bought, m.charge])).toEqual([
      ['shellac-flakes', 250, '11.40'], ['spirit', 1000, '6.20'], ['polishing-oil', 250, '4.80'], ['wadding', 100, '3.10'], ['polishing-cloth', 5, '4.25'],
    ]);
    expect(r.price.internal.materialsCost).toBe('29.75');
    expect(Object.fromEntries(r.price.lines.map((l) => [l.code, l.amount]))).toEqual({
      materials: '37.19', labour: '176.40', overhead: '25.63', margin: '35.88', tax: '55.02', rounding: '-0.12',
    });
    expect([r.price.net, r.price.tax, r.price.total, r.price.deposit, r.price.balance]).toEqual(['275.10', '55.02', '330.00', '99.00', '231.00']);
  });

  it('every pack choice covers its need', () => {
    for (const m of result.materials) expect(m.bought).toBeGreaterThanOrEqual(m.need);
  });

  it('grain filling applies only to open-pored wood: an ebonised grand has none', () => {
    const ebonised = estimate({ ...GRAND, piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'ebonised' } }, DEMO_CATALOG);
    expect(ebonised.stages.some((s) => s.kind === 'grain-fill')).toBe(false);
    expect(result.stages.some((s) => s.kind === 'grain-fill')).toBe(true);
    expect(ebonised.totals.labourHours).toBeLessThan(result.totals.labourHours);
  });

  it('burnish and wax apply to show faces only', () => {
    const burnish = result.stages.find((s) => s.kind === 'burnish')!;
    const show = result.parts.filter((p) => p.show).reduce((t, p) => t + p.areaM2, 0);
    expect(burnish.areaM2).toBeCloseTo(show, 3);
    expect(burnish.areaM2).toBeLessThan(result.totals.areaM2);
  });

  it('veneer care adds labour to stripping and cutting back only', () => {
    const solid = estimate({ ...GRAND, piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, veneered: false } }, DEMO_CATALOG);
    const hours = (r: typeof result, kind: string): number => r.stages.find((s) => s.kind === kind)!.labourHours;
    expect(hours(result, 'strip')).toBeGreaterThan(hours(solid, 'strip'));
    expect(hours(result, 'cut-back')).toBeGreaterThan(hours(solid, 'cut-back'));
    expect(hours(result, 'body')).toBe(hours(solid, 'body'));
  });

  it('the drying room holds the piece from the first session to the end of the rest before cutting back', () => {
    const cutBack = result.calendar.sessions.find((s) => s.stageKind === 'cut-back')!;
    const before = result.calendar.sessions[cutBack.index - 1]!;
    expect(result.calendar.dryingRoom.start).toBe(result.calendar.sessions[0]!.start);
    expect(result.calendar.dryingRoom.end).toBe(before.restUntil);
    expect(cutBack.start >= before.restUntil).toBe(true);
  });

  it('cold, damp weather stretches the calendar and warns', () => {
    const damp = estimate({ ...GRAND, climate: { temperatureC: 12, humidityPct: 80 } }, DEMO_CATALOG);
    expect(damp.calendar.calendarDays).toBeGreaterThan(result.calendar.calendarDays);
    expect(damp.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['blush-risk', 'cold']));
    expect(damp.totals.labourHours).toBe(result.totals.labourHours);
  });

  it('uses the stages given in place of the system’s', () => {
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const bodyOnly = system.stages.filter((s) => s.kind === 'body').map((s) => ({ ...s, sessions: 2 }));
    const r = estimate({ ...GRAND, stages: bodyOnly }, DEMO_CATALOG);
    expect(r.stages.map((s) => s.kind)).toEqual(['body']);
    expect(r.totals.coats).toBe(2 * 3);
  });

  it('never mutates its input or the catalog', () => {
    const input = deepFreeze(structuredClone({ ...GRAND, piece: { parts: [panel(2), panel(1, { cutOuts: [{ kind: 'circle', diameter: '4 in' }] })] } }));
    const catalog = deepFreeze(demoCatalog());
    const copy = structuredClone(input);
    expect(() => estimate(input, catalog)).not.toThrow();
    expect(input).toEqual(copy);
  });

  it('doubling a part’s count doubles its area and the materials measured by weight or volume; pieces stay whole', () => {
    const one = estimate({ ...GRAND, piece: { parts: [panel(1)] } }, DEMO_CATALOG);
    const two = estimate({ ...GRAND, piece: { parts: [panel(2)] } }, DEMO_CATALOG);
    expect(two.totals.areaM2).toBeCloseTo(2 * one.totals.areaM2, 10);
    expect(two.totals.flakesG).toBeCloseTo(2 * one.totals.flakesG, 0);
    expect(two.totals.spiritL).toBeCloseTo(2 * one.totals.spiritL, 2);
    one.materials.forEach((m, i) => {
      if (m.unit === 'sheet' || m.unit === 'each') {
        // Whole pieces per stage: twice the work takes at most twice the pieces, never fewer than before.
        expect(Number.isInteger(two.materials[i]!.need)).toBe(true);
        expect(two.materials[i]!.need).toBeGreaterThanOrEqual(m.need);
        expect(two.materials[i]!.need).toBeLessThanOrEqual(2 * m.need);
      } else {
        expect(two.materials[i]!.need).toBeCloseTo(2 * m.need, 1);
      }
    });
  });

  it('the same piece in inches and in millimetres gives the same result', () => {
    const mm = estimate({ ...GRAND, piece: { template: 'grand', dimensions: { length: '1905 mm', width: '1498.6 mm', rimHeight: '330.2 mm' } } }, DEMO_CATALOG);
    const inches = estimate({ ...GRAND, piece: { template: 'grand', dimensions: { length: '75 in', width: '59 in', rimHeight: '13 in' } } }, DEMO_CATALOG);
    const bare = estimate({ ...GRAND, defaultLengthUnit: 'in', piece: { template: 'grand', dimensions: { length: 75, width: 59, rimHeight: 13 } } }, DEMO_CATALOG);
    expect(inches).toEqual(mm);
    expect(bare).toEqual(mm);
    const partsMm = estimate({ ...GRAND, piece: { parts: [panel(1, { shape: { kind: 'rectangle', length: 1016, width: 508 } })] } }, DEMO_CATALOG);
    const partsIn = estimate({ ...GRAND, defaultLengthUnit: 'in', piece: { parts: [panel(1, { shape: { kind: 'rectangle', length: 40, width: 20 } })] } }, DEMO_CATALOG);
    expect(partsIn).toEqual(partsMm);
  });

  it('accepts a parts list at the top level', () => {
    const r = estimate({ parts: [panel(1)], startDate: '2025-03-03' }, DEMO_CATALOG);
    expect(r.totals.areaM2).toBe(1);
    expect(r.system).toBe('full-repolish');
  });

  it('shows imperial figures when asked', () => {
    const r = estimate({ ...GRAND, units: 'imperial' }, DEMO_CATALOG);
    expect(r.display.area).toMatch(/ft²$/);
    expect(r.display.flakes).toMatch(/(oz|lb)$/);
    expect(r.display.spirit).toMatch(/US (pints|fl oz)$/);
  });

  it('rejects a system or species the catalog does not hold, naming the field', () => {
    expect(() => estimate({ ...GRAND, system: 'lacquer' }, DEMO_CATALOG)).toThrow(EstimateError);
    try {
      estimate({ ...GRAND, piece: { parts: [panel(1, { species: 'unobtainium' })] } }, DEMO_CATALOG);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(EstimateError);
      expect((error as EstimateError).path).toEqual(['piece', 'parts', 0, 'species']);
    }
  });

  it('warns when the discount is above the cap', () => {
    expect(estimate({ ...GRAND, discountPct: 40 }, DEMO_CATALOG).warnings.some((w) => w.code === 'discount-over-cap')).toBe(true);
  });

  it('charges only the quantity used when the catalog says so', () => {
    const catalog = demoCatalog();
    catalog.pricing.materialsCharge = 'used';
    const used = estimate(GRAND, catalog);
    expect(money(used.price.internal.materialsCost).lt(result.price.internal.materialsCost)).toBe(true);
  });

  it('handles 500 parts', () => {
    const parts = Array.from({ length: 500 }, (_, i) => panel(1, { name: `Part ${i}` }));
    const r = estimate({ ...GRAND, piece: { parts } }, DEMO_CATALOG);
    expect(r.totals.areaM2).toBeCloseTo(500, 6);
  });
});

describe('estimate: spirit per session and per day', () => {
  const r = estimate(GRAND, DEMO_CATALOG);

  it('sessions carry the spirit they evaporate, adding up to the stage totals', () => {
    for (const stage of r.stages) {
      const sessions = r.calendar.sessions.filter((s) => s.stage === stage.key);
      expect(sessions.reduce((t, s) => t + s.spiritL, 0)).toBeCloseTo(stage.spiritL, 3);
    }
  });

  it('working days add up to the job’s spirit and the worst day is the largest', () => {
    const days = r.ventilation.days;
    expect(days.reduce((t, d) => t + d.spiritL, 0)).toBeCloseTo(r.totals.spiritL, 2);
    expect(Math.max(...days.map((d) => d.spiritL))).toBeCloseTo(r.ventilation.worstDay.spiritL, 4);
  });
});
