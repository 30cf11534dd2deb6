import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { EstimateInputSchema } from '../../../shared/schemas/calc';
import { CatalogSchema } from '../../../shared/schemas/catalog';
import { estimate } from '../../../shared/calc';
import { DEMO_CATALOG } from '../../fixtures/catalog';
import { demoCatalogInput } from '../../../shared/calc/presets/demo-catalog';

const grandWith = (dimensions: Record<string, unknown>) => ({ piece: { template: 'grand', dimensions } });
const part = { name: 'Panel', shape: { kind: 'rectangle', length: 100, width: 100 } };

/** Paths of the issues zod reports, joined with dots. */
function paths(input: unknown): string[] {
  const r = EstimateInputSchema.safeParse(input);
  expect(r.success).toBe(false);
  return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
}

describe('EstimateInputSchema rejects bad input with a path naming the field', () => {
  it.each([
    ['a negative length', grandWith({ length: -5 }), 'piece.dimensions.length'],
    ['a negative length as text', grandWith({ length: '-5 ft' }), 'piece.dimensions.length'],
    ['NaN', grandWith({ length: Number.NaN }), 'piece.dimensions.length'],
    ['1e308', grandWith({ length: 1e308 }), 'piece.dimensions.length'],
    ['Infinity', grandWith({ width: Number.POSITIVE_INFINITY }), 'piece.dimensions.width'],
    ['text that is not a length', grandWith({ rimHeight: 'tall' }), 'piece.dimensions.rimHeight'],
    ['a dimension the template does not have', grandWith({ depth: 100 }), 'piece.dimensions.depth'],
    ['a bare number over 100 m in the default unit', { ...grandWith({ length: 200 }), defaultLengthUnit: 'm' }, 'piece.dimensions.length'],
    ['a string where a number belongs (temperature)', { ...grandWith({}), climate: { temperatureC: '20', humidityPct: 50 } }, 'climate.temperatureC'],
    ['a string where a number belongs (count)', { piece: { parts: [{ ...part, count: '2' }] } }, 'piece.parts.0.count'],
    ['a string where a number belongs (discount)', { ...grandWith({}), discountPct: '10' }, 'discountPct'],
    ['more than 500 parts', { piece: { parts: Array.from({ length: 501 }, () => part) } }, 'piece.parts'],
    ['an empty parts list', { piece: { parts: [] } }, 'piece.parts'],
    ['an empty top-level parts list', { parts: [] }, 'parts'],
    ['a zero width in a part', { piece: { parts: [{ ...part, shape: { kind: 'rectangle', length: 100, width: 0 } }] } }, 'piece.parts.0.shape.width'],
    ['a bad polygon point', { piece: { parts: [{ ...part, shape: { kind: 'polygon', points: [[0, 0], [10, 'x'], [0, 10]] } }] } }, 'piece.parts.0.shape.points.1.1'],
    ['an unknown template', { piece: { template: 'harpsichord' } }, 'piece.template'],
    ['a bad start date', { ...grandWith({}), startDate: '2025-02-30' }, 'startDate'],
    ['three faces', { piece: { parts: [{ ...part, faces: 3 }] } }, 'piece.parts.0.faces'],
    ['no piece at all', { system: 'revive' }, 'piece'],
  ])('%s', (_, input, path) => {
    expect(paths(input)).toContain(path);
  });

  it('estimate() throws the ZodError itself', () => {
    expect(() => estimate(grandWith({ length: -5 }) as never, DEMO_CATALOG)).toThrow(ZodError);
  });

  it('messages say what was expected', () => {
    const r = EstimateInputSchema.safeParse(grandWith({ length: 'tall' }));
    expect(r.success ? '' : r.error.issues[0]!.message).toMatch(/expected .*190 cm/);
  });

  it('accepts the smallest input and fills defaults', () => {
    const parsed = EstimateInputSchema.parse({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } } });
    expect(parsed).toMatchObject({ system: 'full-repolish', discountPct: 0, units: 'metric', defaultLengthUnit: 'mm' });
  });
});

describe('CatalogSchema', () => {
  it('accepts the demo catalog', () => {
    expect(CatalogSchema.safeParse(demoCatalogInput()).success).toBe(true);
  });

  it('names a stage material the catalog does not hold', () => {
    const c = demoCatalogInput();
    c.systems[0]!.stages[0]!.materials = [{ material: 'gold-leaf', perM2: 1 }];
    const r = CatalogSchema.safeParse(c);
    expect(r.success ? [] : r.error.issues.map((i) => i.path.join('.'))).toContain('systems.0.stages.0.materials.0.material');
  });

  it('refuses a spirit whose shares do not add up to 1 and a price written as a float', () => {
    const c = demoCatalogInput();
    c.safety.spirit = { ethanol: 0.5, methanol: 0.1, isopropanol: 0 };
    c.materials[0]!.packs[0]!.price = '11.4x';
    const r = CatalogSchema.safeParse(c);
    const found = r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
    expect(found).toContain('safety.spirit');
    expect(found).toContain('materials.0.packs.0.price');
  });
});
