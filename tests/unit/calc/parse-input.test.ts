/**
 * parseEstimateInput (parts remembered by their object) gives exactly what EstimateInputSchema.parse gives: the same
 * output, key for key and in the same order, and for bad input the same issues (codes, paths, messages). Checked by
 * fast-check over inputs built again and again from one pool of part objects (so parts are remembered), with parts
 * changed in place between calls, bad parts, bad fields beside good parts, both places a parts list may be, and
 * every default length unit; and for a template input (no parts list, remembered whole) passed again as the same
 * object with its fields changed in place, good and bad.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ZodError } from 'zod';
import { parseEstimateInput } from '../../../shared/calc/parse-input';
import { EstimateInputSchema, type EstimateInput } from '../../../shared/schemas/calc';
import { LENGTH_UNITS } from '../../../shared/units';

type Outcome = { ok: true; json: string; value: unknown } | { ok: false; issues: unknown };

function outcome(run: () => unknown): Outcome {
  try {
    const value = run();
    // JSON for the key order, the value itself for undefined fields and -0.
    return { ok: true, json: JSON.stringify(value), value };
  } catch (error) {
    if (!(error instanceof ZodError)) throw error;
    return { ok: false, issues: error.issues };
  }
}

function expectSame(input: unknown): void {
  const wanted = outcome(() => EstimateInputSchema.parse(input));
  const got = outcome(() => parseEstimateInput(input as EstimateInput));
  expect(got).toStrictEqual(wanted);
}

/** Mostly good values, now and then a bad one (so that many inputs pass whole and their parts are remembered). */
const mostly = <T>(good: fc.Arbitrary<T>, ...bad: unknown[]): fc.Arbitrary<unknown> =>
  fc.oneof({ arbitrary: good as fc.Arbitrary<unknown>, weight: 12 }, { arbitrary: fc.constantFrom<unknown>(...bad), weight: 1 });

/** Lengths good and bad: numbers (over 100 m in metres), text with units, text that is not a length, -0. */
const length = mostly(
  fc.oneof(
    fc.integer({ min: 1, max: 3000 }),
    fc.integer({ min: 1, max: 3000 }).map((n) => `${n} mm`),
    fc.integer({ min: 1, max: 30 }).map((n) => `${n} in`),
    fc.constantFrom('18', '2 ft 3 in', '70 cm'),
  ),
  'tall', '', -0, 0, -4, 200_000, '1e9 m', null,
);
const shape = fc.oneof(
  { arbitrary: fc.record({ kind: fc.constant('rectangle'), length, width: length }), weight: 4 },
  { arbitrary: fc.record({ kind: fc.constant('turned-leg'), topDiameter: length, bottomDiameter: length, length }), weight: 2 },
  { arbitrary: fc.record({ kind: fc.constant('band'), outline: length, height: length }), weight: 2 },
  { arbitrary: fc.record({ kind: fc.constant('polygon'), points: fc.array(fc.tuple(length, length), { minLength: 3, maxLength: 5 }) }), weight: 2 },
  { arbitrary: fc.record({ kind: fc.constantFrom('hexagon', 'circle'), diameter: length }), weight: 1 },
);
const part = fc.record(
  {
    name: mostly(fc.constantFrom('Lid', 'Leg'), '', 7),
    shape,
    faces: mostly(fc.constantFrom(1, 2), 3),
    edges: fc.boolean(),
    count: mostly(fc.constantFrom(1, 2, 4), 0, '2', 1.5),
    thickness: length,
    cutOuts: fc.array(fc.record({ kind: fc.constant('circle'), diameter: length }), { maxLength: 2 }),
    species: fc.constantFrom('mahogany', 'walnut'),
    complexity: mostly(fc.constantFrom('flat', 'carved'), 'wobbly'),
    id: fc.constantFrom<unknown>(undefined, 'p1'),
  },
  { requiredKeys: ['name', 'shape'] },
);

/** A change made in place to a pool part between calls. */
const change = fc.oneof(
  fc.record({ field: fc.constantFrom('count', 'faces', 'name', 'edges'), value: fc.constantFrom<unknown>(1, 2, 3, '2', 'Top', true, undefined) }),
  fc.record({ field: fc.constant('shape.length'), value: length }),
  fc.record({ field: fc.constant('delete'), value: fc.constantFrom('count', 'thickness', 'cutOuts') }),
);

const call = fc.record({
  indexes: fc.array(fc.nat(), { minLength: 0, maxLength: 6 }),
  inPiece: fc.boolean(),
  species: fc.constantFrom<unknown>(undefined, 'maple'),
  unit: mostly(fc.constantFrom<unknown>(undefined, ...LENGTH_UNITS), 'furlong'),
  discountPct: mostly(fc.constantFrom<unknown>(undefined, 10), -1, '5'),
  both: mostly(fc.constant(false), true),
  changes: fc.array(fc.tuple(fc.nat(), change), { maxLength: 1 }),
});

function applyChange(p: Record<string, unknown>, c: { field: string; value: unknown }): void {
  if (c.field === 'delete') delete p[c.value as string];
  else if (c.field === 'shape.length') {
    const s = p.shape;
    if (typeof s === 'object' && s !== null) (s as Record<string, unknown>).length = c.value;
  } else p[c.field] = c.value;
}

describe('parseEstimateInput', () => {
  it('gives what EstimateInputSchema.parse gives, call after call over the same part objects', () => {
    fc.assert(
      fc.property(fc.array(part, { minLength: 1, maxLength: 6 }), fc.array(call, { minLength: 1, maxLength: 8 }), (pool, calls) => {
        const parts = pool as Array<Record<string, unknown>>;
        for (const c of calls) {
          for (const [i, ch] of c.changes) applyChange(parts[i % parts.length] as Record<string, unknown>, ch);
          const list = c.indexes.map((i) => parts[i % parts.length]);
          const input: Record<string, unknown> = c.inPiece
            ? { piece: { parts: list, ...(c.species === undefined ? {} : { species: c.species }) }, ...(c.both ? { parts: list } : {}) }
            : { parts: list };
          if (c.unit !== undefined) input.defaultLengthUnit = c.unit;
          if (c.discountPct !== undefined) input.discountPct = c.discountPct;
          expectSame(input);
          // The same input object again: now every good part is remembered.
          expectSame(input);
        }
      }),
      { numRuns: 400 },
    );
  });

  it('checks a remembered part again once it changed in place, or under another default unit', () => {
    const lid = { name: 'Lid', shape: { kind: 'rectangle', length: '600 mm', width: 400 } };
    const input = { piece: { parts: [lid] } };
    expectSame(input);
    expectSame(input);
    lid.shape.width = -4;
    expectSame(input);
    lid.shape.width = 400;
    expectSame({ ...input, defaultLengthUnit: 'm' });
    expectSame({ ...input, defaultLengthUnit: 'mm' });
    lid.shape.length = '600 furlongs';
    expectSame(input);
  });

  it('gives what EstimateInputSchema.parse gives for a template input passed again as the same object, changed in place or not', () => {
    // Fields of an input without a parts list, good and bad, set in place on one input object between calls.
    const edit = fc.oneof(
      fc.record({ path: fc.constant(['piece', 'dimensions', 'length']), value: length }),
      fc.record({ path: fc.constant(['piece', 'dimensions', 'width']), value: fc.constantFrom<unknown>(undefined, 1400, '4 ft 10 in', 'wide') }),
      fc.record({ path: fc.constant(['piece', 'dimensions', 'height']), value: fc.constantFrom<unknown>(undefined, 300) }),
      fc.record({ path: fc.constant(['piece', 'template']), value: fc.constantFrom<unknown>('grand', 'upright', 'table', 'harp') }),
      fc.record({ path: fc.constant(['piece', 'species']), value: fc.constantFrom<unknown>(undefined, 'walnut', 7) }),
      fc.record({ path: fc.constant(['piece', 'veneered']), value: fc.constantFrom<unknown>(undefined, true, 'yes') }),
      fc.record({ path: fc.constant(['startDate']), value: fc.constantFrom<unknown>(undefined, '2025-03-03', '2025-03-03T08:30', '2025-02-30', '1999-12-31') }),
      fc.record({ path: fc.constant(['climate']), value: fc.constantFrom<unknown>(undefined, { temperatureC: 12, humidityPct: 80 }, { temperatureC: 99, humidityPct: 50 }) }),
      fc.record({ path: fc.constant(['climate', 'humidityPct']), value: fc.constantFrom<unknown>(40, -1) }),
      fc.record({ path: fc.constant(['discountPct']), value: fc.constantFrom<unknown>(undefined, 0, 15, 101, '5', -0) }),
      fc.record({ path: fc.constant(['defaultLengthUnit']), value: fc.constantFrom<unknown>(undefined, ...LENGTH_UNITS, 'furlong') }),
      fc.record({ path: fc.constant(['units']), value: fc.constantFrom<unknown>(undefined, 'imperial', 'cubits') }),
      fc.record({ path: fc.constant(['system']), value: fc.constantFrom<unknown>(undefined, 're-body', 'No System') }),
    );
    fc.assert(
      fc.property(fc.array(fc.array(edit, { maxLength: 3 }), { minLength: 1, maxLength: 8 }), fc.boolean(), (rounds, nullProto) => {
        const input: Record<string, unknown> = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' };
        const target = nullProto ? Object.assign(Object.create(null) as Record<string, unknown>, input) : input;
        for (const edits of rounds) {
          for (const { path, value } of edits) {
            let at: Record<string, unknown> = target;
            for (const key of path.slice(0, -1)) {
              const next = at[key];
              if (typeof next !== 'object' || next === null) at[key] = {};
              at = at[key] as Record<string, unknown>;
            }
            const last = path[path.length - 1] as string;
            if (value === undefined) delete at[last];
            else at[last] = typeof value === 'object' && value !== null ? { ...value } : value;
          }
          expectSame(target);
          expectSame(target);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('checks a remembered template input again once it changed in place', () => {
    const input = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' as unknown } }, startDate: '2025-03-03' as unknown };
    expectSame(input);
    expectSame(input);
    input.piece.dimensions.length = 'tall';
    expectSame(input);
    input.piece.dimensions.length = 1900;
    expectSame(input);
    input.startDate = '2025-02-30';
    expectSame(input);
    input.startDate = '2025-03-03';
    expectSame(input);
  });

  it('keeps a template input as zod gives it', () => {
    const input = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' };
    expectSame(input);
    expectSame({ ...input, piece: { ...input.piece, parts: [{ name: 'Lid', shape: { kind: 'circle', diameter: 10 } }] } });
  });
});
