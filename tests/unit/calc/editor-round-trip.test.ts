/**
 * The estimate editor's round trip: a saved revision's input opened in the editor and saved again is the same input
 * (fast-check over templates, parts lists with polygon cut-outs, bare numbers, units and stages).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildInput, draftFromInput } from '../../../src/features/estimates/lib/draft';
import { estimate, EstimateError } from '../../../shared/calc';
import { EstimateInputSchema, TEMPLATE_DIMENSIONS, TEMPLATE_KEYS, type EstimateInput, type PartInput } from '../../../shared/schemas/calc';
import { LENGTH_UNITS } from '../../../shared/units';
import type { WorkshopSettings } from '../../../shared/schemas/workshop';
import { DEMO_CATALOG } from '../../fixtures/catalog';
import { SETTINGS } from '../../component/estimates-fixtures';

/** Lengths as the editor sends them: text, with or without a unit. */
const length = fc.oneof(
  fc.integer({ min: 1, max: 3000 }).map(String),
  fc.integer({ min: 1, max: 3000 }).map((n) => `${n} mm`),
  fc.tuple(fc.integer({ min: 0, max: 8 }), fc.integer({ min: 1, max: 11 })).map(([ft, inch]) => `${ft} ft ${inch} 1/2 in`),
  fc.integer({ min: 1, max: 300 }).map((n) => `${n / 10} cm`),
);
const coordinate = fc.oneof(fc.integer({ min: 0, max: 2000 }).map(String), fc.integer({ min: 0, max: 2000 }).map((n) => `${n} mm`));
const points = fc.array(fc.tuple(coordinate, coordinate), { minLength: 3, maxLength: 6 });
const count = fc.integer({ min: 1, max: 4 });

const cutOut = fc.oneof(
  fc.record({ kind: fc.constant('rectangle' as const), length, width: length, count }),
  fc.record({ kind: fc.constant('circle' as const), diameter: length, count }),
  fc.record({ kind: fc.constant('ellipse' as const), length, width: length, count }),
  fc.record({ kind: fc.constant('polygon' as const), points, count }),
);

const shape = fc.oneof(
  fc.record({ kind: fc.constant('rectangle' as const), length, width: length }),
  fc.record({ kind: fc.constant('polygon' as const), points }),
  fc.record({ kind: fc.constant('turned-leg' as const), topDiameter: length, bottomDiameter: length, length }),
  fc.record({ kind: fc.constant('band' as const), outline: length, height: length }),
);

const part: fc.Arbitrary<PartInput> = fc
  .record({
    id: fc.option(fc.stringMatching(/^[a-z][a-z0-9-]{0,10}$/), { nil: undefined }),
    name: fc.stringMatching(/^[A-Za-z][A-Za-z ]{0,15}$/),
    shape,
    faces: fc.constantFrom(1 as const, 2 as const),
    edges: fc.boolean(),
    thickness: length,
    count,
    cutOuts: fc.array(cutOut, { maxLength: 3 }),
    species: fc.constantFrom('mahogany', 'walnut', 'oak'),
    veneered: fc.boolean(),
    complexity: fc.constantFrom('flat' as const, 'moulded' as const, 'carved' as const),
    show: fc.boolean(),
  })
  .map(({ id, edges, thickness, ...rest }) => ({ ...(id ? { id } : {}), ...rest, edges, ...(edges ? { thickness } : {}) }));

const template = fc.constantFrom(...TEMPLATE_KEYS).chain((t) =>
  fc.record({
    template: fc.constant(t),
    dimensions: fc.subarray([...TEMPLATE_DIMENSIONS[t]]).chain((names) => fc.tuple(...names.map((n) => length.map((v): [string, string] => [n, v])))).map((pairs) => Object.fromEntries(pairs) as Record<string, string>),
    species: fc.constantFrom('mahogany', 'walnut', 'rosewood'),
    veneered: fc.boolean(),
  }),
);

const stages = fc.constantFrom(...DEMO_CATALOG.systems).chain((system) =>
  fc.tuple(fc.constant(system.key), fc.array(fc.integer({ min: 1, max: 9 }), { minLength: system.stages.length, maxLength: system.stages.length }).map((sessions) =>
    system.stages.map((s, i) => ({ ...s, sessions: s.kind === 'body' ? (sessions[i] as number) : s.sessions })),
  )),
);

const input: fc.Arbitrary<EstimateInput> = fc
  .record({
    piece: fc.oneof(template, fc.array(part, { minLength: 1, maxLength: 4 }).map((parts) => ({ parts }))),
    stages,
    climate: fc.record({ temperatureC: fc.integer({ min: 5, max: 35 }), humidityPct: fc.integer({ min: 20, max: 90 }) }),
    startDate: fc.option(fc.constantFrom('2025-03-03', '2026-01-05T09:30'), { nil: undefined }),
    discountPct: fc.constantFrom(0, 2.5, 10),
    units: fc.constantFrom('metric' as const, 'imperial' as const),
    imperialVolumes: fc.constantFrom('us' as const, 'uk' as const),
    defaultLengthUnit: fc.constantFrom(...LENGTH_UNITS),
  })
  .map(({ stages: [system, list], startDate, ...rest }) => ({ ...rest, system, stages: list, ...(startDate ? { startDate } : {}) }));

/** The totals of an estimate, or the code of the input error it names (a template grown past a part's limits). */
function outcome(x: EstimateInput): unknown {
  try {
    return estimate(x, DEMO_CATALOG, { today: '2025-03-03' }).totals;
  } catch (error) {
    if (error instanceof EstimateError) return { refused: error.code, path: error.path };
    throw error;
  }
}

/** The workshop's settings today, deliberately unlike the revision's. */
const TODAY: WorkshopSettings = { ...SETTINGS, units: 'metric', defaultLengthUnit: 'cm', imperialVolumes: 'us' };

describe('editor round trip', () => {
  it('input → draft → input is the identity (fast-check)', () => {
    fc.assert(
      fc.property(input, (x) => {
        expect(buildInput(draftFromInput(x, DEMO_CATALOG, TODAY, 'Title'))).toEqual(x);
      }),
      { numRuns: 300 },
    );
  });

  it('the same input saved again estimates the same (fast-check, inputs the schema accepts)', () => {
    fc.assert(
      fc.property(input, (x) => {
        fc.pre(EstimateInputSchema.safeParse(x).success);
        const again = buildInput(draftFromInput(EstimateInputSchema.parse(x) as EstimateInput, DEMO_CATALOG, TODAY, 'Title'));
        expect(outcome(again)).toEqual(outcome(x));
      }),
      { numRuns: 40 },
    );
  });

  it('keeps polygon cut-outs', () => {
    const x: EstimateInput = {
      piece: { parts: [{ name: 'Lid', shape: { kind: 'rectangle', length: '1000 mm', width: '800 mm' }, cutOuts: [{ kind: 'polygon', points: [['100', '100'], ['300', '100'], ['200', '300']], count: 2 }] }] },
      system: 'full-repolish',
      defaultLengthUnit: 'mm',
    };
    const again = buildInput(draftFromInput(x, DEMO_CATALOG, TODAY, 'Lid'));
    expect(again.piece?.parts?.[0]?.cutOuts).toEqual([{ kind: 'polygon', points: [['100', '100'], ['300', '100'], ['200', '300']], count: 2 }]);
    // 1000 × 800 less two triangles of ½ × 200 × 200: 0.76 m² (hand arithmetic).
    expect(estimate(again, DEMO_CATALOG, { today: '2025-03-03' }).parts[0]!.faceAreaM2).toBeCloseTo(0.76, 6);
  });

  it('bare numbers keep the unit the revision was saved with, whatever the workshop\'s default is now', () => {
    const x: EstimateInput = { piece: { template: 'grand', dimensions: { length: '75' } }, defaultLengthUnit: 'in' };
    const again = buildInput(draftFromInput(x, DEMO_CATALOG, TODAY, 'Grand'));
    expect(again.defaultLengthUnit).toBe('in');
    expect(estimate(again, DEMO_CATALOG, { today: '2025-03-03' }).totals.areaM2).toBe(estimate({ ...x, defaultLengthUnit: 'in' }, DEMO_CATALOG, { today: '2025-03-03' }).totals.areaM2);
  });
});
