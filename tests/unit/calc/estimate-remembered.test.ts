/**
 * What estimate() remembers between calls (parts checked by their object, parts resolved and measured, a template's
 * parts by its dimensions) never changes a result: estimates made call after call over one pool of part objects,
 * in different orders and units, with parts changed in place, templates at dimensions seen before and one template
 * input object changed in place between calls, are the same,
 * byte for byte, as the estimate of a fresh copy of the input made with nothing remembered (fast-check).
 */
import { describe, expect, it, vi } from 'vitest';
import fc from 'fast-check';
import { estimate } from '../../../shared/calc';
import type { EstimateInput } from '../../../shared/schemas/calc';
import { DEMO_CATALOG } from '../../fixtures/catalog';

type Estimate = typeof estimate;

/** The result as JSON, or the problem's name, code, path and message. */
function outcome(input: unknown, run: Estimate = estimate): string {
  try {
    return JSON.stringify(run(input as EstimateInput, DEMO_CATALOG, { today: '2025-03-03' }));
  } catch (error) {
    if (!(error instanceof Error)) throw error;
    const { code, path } = error as Error & { code?: unknown; path?: unknown };
    return JSON.stringify([error.name, code, path, error.message]);
  }
}

/**
 * The engine loaded a second time (a module instance of its own, so what it remembers is its own), forgetting
 * everything before each estimate: the reference.
 */
vi.resetModules();
const reference = await import('../../../shared/calc/estimate');

/** The same input as fresh objects, estimated with nothing remembered. */
function fresh(input: unknown): string {
  reference.forgetResolvedParts();
  return outcome(structuredClone(input), reference.estimate);
}

const length = fc.oneof(fc.integer({ min: 5, max: 2500 }), fc.integer({ min: 1, max: 40 }).map((n) => `${n} in`), fc.constantFrom('70 cm', '2 ft 3 in', '12'));
const shape = fc.oneof(
  fc.record({ kind: fc.constant('rectangle'), length, width: length }),
  fc.record({ kind: fc.constant('turned-leg'), topDiameter: length, bottomDiameter: length, length }),
  fc.record({ kind: fc.constant('polygon'), points: fc.constantFrom([[0, 0], [400, 0], [0, 300]], [['0', '0'], ['20 in', '0'], ['20 in', '1 ft'], ['0', '1 ft']]) }),
);
const part = fc.record(
  {
    id: fc.constantFrom('lid', 'leg'),
    name: fc.constantFrom('Lid', 'Leg', 'Rail'),
    shape,
    faces: fc.constantFrom(1, 2),
    edges: fc.boolean(),
    count: fc.integer({ min: 1, max: 4 }),
    cutOuts: fc.array(fc.record({ kind: fc.constant('circle'), diameter: fc.integer({ min: 5, max: 60 }) }), { maxLength: 1 }),
    species: fc.oneof({ arbitrary: fc.constantFrom('mahogany', 'walnut'), weight: 8 }, { arbitrary: fc.constant('unknown-wood'), weight: 1 }),
    complexity: fc.constantFrom('flat', 'carved'),
  },
  { requiredKeys: ['name', 'shape', 'faces', 'count'] },
);
const grandLength = fc.oneof({ arbitrary: fc.constantFrom('6 ft 3 in', '5 ft 8 in', 1900), weight: 6 }, { arbitrary: fc.constantFrom('90 m', 2), weight: 1 });

const call = fc.record({
  indexes: fc.array(fc.nat(), { minLength: 1, maxLength: 6 }),
  template: fc.boolean(),
  grandLength,
  unit: fc.constantFrom(undefined, 'mm', 'in', 'cm'),
  pieceSpecies: fc.constantFrom(undefined, 'walnut'),
  system: fc.constantFrom(...DEMO_CATALOG.systems.map((s) => s.key)),
  change: fc.option(fc.tuple(fc.nat(), fc.constantFrom<[string, unknown]>(['count', 3], ['name', 'Top'], ['species', 'walnut'], ['faces', 2])), { nil: undefined }),
});

describe('what estimate() remembers between calls', () => {
  it('never changes a result or a problem', () => {
    fc.assert(
      fc.property(fc.array(part, { minLength: 1, maxLength: 5 }), fc.array(call, { minLength: 1, maxLength: 6 }), (pool, calls) => {
        const parts = pool as Array<Record<string, unknown>>;
        for (const c of calls) {
          if (c.change) (parts[c.change[0] % parts.length] as Record<string, unknown>)[c.change[1][0]] = c.change[1][1];
          const species = c.pieceSpecies === undefined ? {} : { species: c.pieceSpecies };
          const input: Record<string, unknown> = c.template
            ? { piece: { template: 'grand', dimensions: { length: c.grandLength }, ...species }, system: c.system }
            : { piece: { parts: c.indexes.map((i) => parts[i % parts.length]), ...species }, system: c.system };
          if (c.unit !== undefined) input.defaultLengthUnit = c.unit;
          const first = outcome(input);
          const again = outcome(input);
          expect(again).toBe(first);
          expect(fresh(input)).toBe(first);
        }
      }),
      { numRuns: 60 },
    );
  });

  it('never changes the result of a template input passed again as the same object, changed in place between calls', () => {
    // Each round sets some fields in place on one input object (good values and bad), then estimates it twice.
    const edit = fc.oneof(
      fc.record({ field: fc.constant('length'), value: grandLength }),
      fc.record({ field: fc.constant('species'), value: fc.constantFrom<unknown>(undefined, 'walnut', 'unknown-wood') }),
      fc.record({ field: fc.constant('veneered'), value: fc.constantFrom<unknown>(undefined, true, false) }),
      fc.record({ field: fc.constant('system'), value: fc.constantFrom<unknown>(...DEMO_CATALOG.systems.map((s) => s.key), 'no-such-system') }),
      fc.record({ field: fc.constant('startDate'), value: fc.constantFrom<unknown>(undefined, '2025-03-03', '2025-12-24T16:30', '2025-02-30') }),
      fc.record({ field: fc.constant('humidityPct'), value: fc.constantFrom<unknown>(undefined, 35, 85) }),
      fc.record({ field: fc.constant('discountPct'), value: fc.constantFrom<unknown>(undefined, 5, 60) }),
      fc.record({ field: fc.constant('unit'), value: fc.constantFrom<unknown>(undefined, 'mm', 'in', 'cm') }),
      fc.record({ field: fc.constant('units'), value: fc.constantFrom<unknown>(undefined, 'imperial') }),
    );
    fc.assert(
      fc.property(fc.array(fc.array(edit, { maxLength: 3 }), { minLength: 1, maxLength: 6 }), (rounds) => {
        const dimensions: Record<string, unknown> = { length: '6 ft 3 in' };
        const piece: Record<string, unknown> = { template: 'grand', dimensions };
        const input: Record<string, unknown> = { piece, system: 'full-repolish' };
        const set = (on: Record<string, unknown>, key: string, value: unknown): void => {
          if (value === undefined) delete on[key];
          else on[key] = value;
        };
        for (const edits of rounds) {
          for (const { field, value } of edits) {
            if (field === 'length') set(dimensions, 'length', value);
            else if (field === 'species' || field === 'veneered') set(piece, field, value);
            else if (field === 'humidityPct') set(input, 'climate', value === undefined ? undefined : { temperatureC: 15, humidityPct: value });
            else if (field === 'unit') set(input, 'defaultLengthUnit', value);
            else set(input, field, value);
          }
          const first = outcome(input);
          expect(outcome(input)).toBe(first);
          expect(fresh(input)).toBe(first);
        }
      }),
      { numRuns: 60 },
    );
  });
});
