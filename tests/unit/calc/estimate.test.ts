import { describe, expect, it } from 'vitest';
import { estimate, EstimateError } from '../../../shared/calc';
import { EstimateResultSchema } from '../../../shared/schemas/calc';
import type { EstimateInput, PartInput } from '../../../shared/schemas/calc';
import { money, sumMoney } from '../../../shared/money';
import { cutToGramsPerLitre } from '../../../shared/calc/shellac';
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
    // Materials line = sum of material charges + markup.
    const charged = sumMoney(result.materials.map((m) => m.charge));
    expect(money(result.price.lines[0]!.amount).toFixed(2)).toBe(charged.times(1 + DEMO_CATALOG.pricing.markupPct / 100).toDecimalPlaces(2).toFixed(2));
  });

  it('flakes follow the cut: flakes / spirit in the polish = cut × 119.83 g/L', () => {
    const body = result.stages.find((s) => s.kind === 'body')!;
    expect(body.cutGPerL).toBeCloseTo(1.5 * 119.83, 1);
    // Polish made = solvent + flakes at 1.2 g/cm³; so solvent = polish − flakes/1200 and flakes/solvent = the cut.
    const solvent = body.polishL - body.flakesG / 1200;
    expect(body.flakesG / solvent).toBeCloseTo(cutToGramsPerLitre(1.5), 0);
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
