/** Oversized or unplaceable input is refused naming the field; implausible input is flagged, never priced silently. */
import { describe, expect, it } from 'vitest';
import { estimate, EstimateError } from '../../../shared/calc';
import type { EstimateInput } from '../../../shared/schemas/calc';
import { DEMO_CATALOG, demoCatalog } from '../../fixtures/catalog';

const run = (input: Partial<EstimateInput>) => estimate({ system: 'full-repolish', startDate: '2025-03-03', ...input } as EstimateInput, DEMO_CATALOG);
const refusal = (input: Partial<EstimateInput>): { code: string; path: string } => {
  try {
    run(input);
  } catch (error) {
    if (error instanceof EstimateError) return { code: error.code, path: error.path.join('.') };
    throw error;
  }
  throw new Error('expected a refusal');
};
const codes = (input: Partial<EstimateInput>) => run(input).warnings.map((w) => w.code);

describe('refused, naming the field', () => {
  it('a template grown past the part limits names the dimension that grew', () => {
    expect(refusal({ piece: { template: 'grand', dimensions: { length: '90 m', width: '2 m' } } })).toEqual({ code: 'template-too-large', path: 'piece.dimensions.length' });
    expect(refusal({ piece: { template: 'grand', dimensions: { length: '2 m', width: '99 m' } } })).toEqual({ code: 'template-too-large', path: 'piece.dimensions.width' });
  });

  it('work the calendar cannot place within its horizon names the parts', () => {
    const huge = { name: 'Floor', shape: { kind: 'rectangle' as const, length: '100 m', width: '100 m' }, count: 1000 };
    expect(refusal({ parts: [huge] })).toEqual({ code: 'calendar-unplaceable', path: 'parts' });
    expect(refusal({ piece: { parts: [huge] } })).toEqual({ code: 'calendar-unplaceable', path: 'piece.parts' });
  });
});

describe('flagged', () => {
  it('a piano a few millimetres long', () => {
    expect(codes({ piece: { template: 'grand', dimensions: { length: '5 mm' } } })).toContain('implausible-size');
    expect(codes({ piece: { template: 'upright', dimensions: { height: '50 mm' } } })).toContain('implausible-size');
    expect(codes({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } } })).not.toContain('implausible-size');
  });

  it('a part whose cut-outs leave no area, exactly or more', () => {
    const part = (d: string) => ({ name: 'Panel', shape: { kind: 'rectangle' as const, length: '100 mm', width: '100 mm' }, cutOuts: [{ kind: 'rectangle' as const, length: d, width: '100 mm' }] });
    expect(codes({ parts: [part('100 mm')] })).toContain('cut-outs-exceed-face');
    expect(codes({ parts: [part('120 mm')] })).toContain('cut-outs-exceed-face');
    expect(codes({ parts: [part('50 mm')] })).not.toContain('cut-outs-exceed-face');
  });

  it('a climate that stretches the calendar past a year', () => {
    expect(codes({ piece: { template: 'grand' }, climate: { temperatureC: -20, humidityPct: 100 } })).toContain('calendar-past-a-year');
    expect(codes({ piece: { template: 'grand' }, climate: { temperatureC: 20, humidityPct: 50 } })).not.toContain('calendar-past-a-year');
  });

  it('a price of 0.00 is never produced silently', () => {
    const catalog = demoCatalog();
    catalog.labourRates = catalog.labourRates.map((r) => ({ ...r, perHour: '0.00' }));
    catalog.materials = catalog.materials.map((m) => ({ ...m, packs: m.packs.map((p) => ({ ...p, price: '0' })) }));
    const r = estimate({ piece: { template: 'grand' }, system: 'full-repolish', startDate: '2025-03-03' }, catalog);
    expect(r.totals.price).toBe('0.00');
    expect(r.warnings.map((w) => w.code)).toContain('zero-price');
  });

  it('materials without a price are named', () => {
    const catalog = demoCatalog();
    catalog.materials = catalog.materials.map((m) => (m.key === 'wax' ? { ...m, packs: m.packs.map((p) => ({ ...p, price: '0' })) } : m));
    const r = estimate({ piece: { template: 'grand' }, system: 'full-repolish', startDate: '2025-03-03' }, catalog);
    expect(r.warnings.find((w) => w.code === 'unpriced-materials')?.text).toMatch(/Finishing wax/);
  });
});

describe('grain filling either side of fadding (Fine Woodworking forum "Sealing open pore woods": both orders in use)', () => {
  const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
  const kinds = system.stages.map((s) => s.kind);
  const washFirst = (() => {
    const stages = [...system.stages];
    const fill = stages.splice(kinds.indexOf('grain-fill'), 1)[0]!;
    stages.splice(stages.findIndex((s) => s.kind === 'fad') + 1, 0, fill);
    return stages;
  })();
  const piece = { template: 'grand' as const, dimensions: { length: '6 ft 3 in' } };

  it('the preset fills the bare wood first (Wikipedia "French polish"; 1911 Britannica)', () => {
    expect(kinds.indexOf('grain-fill')).toBeLessThan(kinds.indexOf('fad'));
  });

  it('a system may fad first and fill after: the calendar follows its order, the coats and hours stay', () => {
    const preset = run({ piece });
    const other = run({ piece, stages: washFirst });
    const order = other.calendar.sessions.map((s) => s.stageKind).filter((k) => k === 'fad' || k === 'grain-fill' || k === 'body');
    expect(order.slice(0, 3)).toEqual(['fad', 'grain-fill', 'body']);
    expect(other.totals.coats).toBe(preset.totals.coats);
    expect(other.totals.labourHours).toBe(preset.totals.labourHours);
    // The fad still takes the bare wood's absorbency: it lays the first coats whichever side the filling is.
    expect(other.stages.find((s) => s.kind === 'fad')!.flakesG).toBe(preset.stages.find((s) => s.kind === 'fad')!.flakesG);
  });
});
