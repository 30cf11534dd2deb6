/**
 * Golden file: estimate() for every template × finishing system of the demo catalog (and a few inputs that reach
 * the other paths) must give, byte for byte, the results committed in tests/fixtures/golden/estimates.json. A speed
 * change to the engine must not move any figure, rounding or order. Regenerate the file only for a deliberate
 * change of results (tests/fixtures/golden/generate.ts) and say why in the commit.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { estimate, EstimateError, estimateParsed } from '../../../shared/calc';
import { EstimateInputSchema, type EstimateInput } from '../../../shared/schemas/calc';
import { DEMO_CATALOG, demoCatalog } from '../../fixtures/catalog';
import { goldenCases } from '../../fixtures/golden/cases';
import { GOLDEN_FILE, goldenJson } from '../../fixtures/golden/golden';

describe('engine golden file', () => {
  const golden = readFileSync(GOLDEN_FILE, 'utf8');

  it('covers every template under every system of the demo catalog', () => {
    const names = (JSON.parse(golden) as Array<{ name: string }>).map((c) => c.name);
    expect(names).toEqual(goldenCases().map((c) => c.name));
    expect(names.length).toBeGreaterThanOrEqual(6 * DEMO_CATALOG.systems.length);
  });

  it('estimate() gives the golden results byte for byte', () => {
    const now = goldenJson(estimate, DEMO_CATALOG);
    if (now !== golden) {
      // Name the first case that differs, then fail on the whole text.
      const was = JSON.parse(golden) as Array<{ name: string; result: unknown }>;
      const is = JSON.parse(now) as Array<{ name: string; result: unknown }>;
      const i = is.findIndex((c, k) => JSON.stringify(c) !== JSON.stringify(was[k]));
      expect(is[i]?.result, `first case that differs: ${is[i]?.name}`).toEqual(was[i]?.result);
    }
    expect(now).toBe(golden);
  });

  it("the server's path (the input checked once, then estimateParsed) gives the golden results byte for byte", () => {
    expect(goldenJson((input, catalog, options) => estimateParsed(EstimateInputSchema.parse(input), catalog, options), DEMO_CATALOG)).toBe(golden);
  });

  it('gives the same results again with the same catalog and with a fresh copy of it (no state kept between calls)', () => {
    expect(goldenJson(estimate, DEMO_CATALOG)).toBe(golden);
    expect(goldenJson(estimate, demoCatalog())).toBe(golden);
  });
});

describe('engine golden refusals', () => {
  const refusal = (input: Partial<EstimateInput>): string => {
    try {
      estimate({ system: 'full-repolish', startDate: '2025-03-03', ...input } as EstimateInput, DEMO_CATALOG);
    } catch (error) {
      if (error instanceof EstimateError) return `${error.code} ${error.path.join('.')}: ${error.message}`;
      throw error;
    }
    return 'no refusal';
  };

  it('a generated part past the limits is named with its length as the parts list writes it', () => {
    expect(refusal({ piece: { template: 'grand', dimensions: { length: '90 m', width: '2 m' } } })).toBe(
      'template-too-large piece.dimensions.length: At these dimensions the template\'s part "Lid edge" goes past the limits of a part (Cannot read "182061.365 mm" as a length: it is longer than 100 m): check the dimensions.',
    );
    expect(refusal({ piece: { template: 'grand', dimensions: { length: '2 m', width: '99 m' } }, defaultLengthUnit: 'in' })).toBe(
      'template-too-large piece.dimensions.width: At these dimensions the template\'s part "Lid edge" goes past the limits of a part (Cannot read "200138.79 mm" as a length: it is longer than 100 m): check the dimensions.',
    );
    expect(refusal({ piece: { template: 'grand', dimensions: { rimHeight: 0.0001 } } })).toBe(
      'template-too-large piece.dimensions.rimHeight: At these dimensions the template\'s part "Rim, outside" goes past the limits of a part (Cannot read "0 mm" as a length: a length must be more than zero): check the dimensions.',
    );
  });
});
