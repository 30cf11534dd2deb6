/**
 * The finishing process and its times, against the published sources in docs/references.md: the order of the
 * stages, the rests between them, the climate and the cautions. Each check names its source.
 */
import { describe, expect, it } from 'vitest';
import { climateWarnings, estimate, FULL_REPOLISH, NEW_WORK, RE_BODY, restFactor } from '../../shared/calc';
import { DEMO_CATALOG } from '../fixtures/catalog';

const GRAND = { piece: { template: 'grand' as const, dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' };
const stageOf = (kind: string) => FULL_REPOLISH.stages.find((s) => s.kind === kind)!;
const order = (kinds: readonly string[]) => FULL_REPOLISH.stages.map((s) => s.kind).filter((k) => kinds.includes(k));

describe('order of the stages (Wikipedia "French polish"; 1911 Encyclopaedia Britannica "French Polish")', () => {
  it('preparation, grain filling, bodying, then spiriting out', () => {
    expect(order(['prepare', 'grain-fill', 'body', 'spirit-off'])).toEqual(['prepare', 'grain-fill', 'body', 'spirit-off']);
  });

  it('the optional stain comes before grain filling', () => {
    expect(order(['stain', 'grain-fill'])).toEqual(['stain', 'grain-fill']);
  });

  it('the rubber is lubricated with a little oil while bodying', () => {
    expect(stageOf('body').materials.some((m) => m.material === 'polishing-oil')).toBe(true);
  });

  it('many thin coats: a full repolish of a grand is about 30 coats (common practice, [PRACTICE] in docs/references.md)', () => {
    const coats = estimate(GRAND, DEMO_CATALOG).totals.coats;
    expect(coats).toBeGreaterThanOrEqual(25);
    expect(coats).toBeLessThanOrEqual(35);
  });

  it('a full repolish of a grand is about 70 hours (common practice, [PRACTICE] in docs/references.md)', () => {
    const hours = estimate(GRAND, DEMO_CATALOG).totals.labourHours;
    expect(hours).toBeGreaterThanOrEqual(60);
    expect(hours).toBeLessThanOrEqual(80);
  });
});

describe('rests (Bitmead, "French Polishing and Enamelling"; Fine Woodworking forum; common practice)', () => {
  it('bodying sessions rest about 12 h, often 24 h (Bitmead): every preset lies in 12–24 h', () => {
    for (const system of [FULL_REPOLISH, RE_BODY, NEW_WORK]) {
      const body = system.stages.find((s) => s.kind === 'body')!;
      expect(body.restHours).toBeGreaterThanOrEqual(12);
      expect(body.restHours).toBeLessThanOrEqual(24);
    }
  });

  it('with that overnight rest the grand is bodied one session a working day (Bitmead; docs/calculations.md)', () => {
    const days = estimate(GRAND, DEMO_CATALOG).calendar.sessions.filter((s) => s.stageKind === 'body').map((s) => s.start.slice(0, 10));
    // Mon–Sat working week from Friday 14 March 2025: Fri, Sat, then Mon–Fri (Sunday 16th closed).
    expect(days).toEqual(['2025-03-14', '2025-03-15', '2025-03-17', '2025-03-18', '2025-03-19', '2025-03-20', '2025-03-21']);
  });

  it('pumice grain filling rests about a week before further work (Fine Woodworking forum "Sealing open pore woods")', () => {
    expect(stageOf('grain-fill').restHours).toBe(7 * 24);
  });

  it('shellac cures 10 days to a month before the final rubbing (common practice): the rest before cutting back', () => {
    const rest = stageOf('spirit-off').restHours / 24;
    expect(rest).toBeGreaterThanOrEqual(10);
    expect(rest).toBeLessThanOrEqual(31);
  });

  it('padding cuts are 1–1.5 lb, 1 lb as a sealer (Fine Woodworking forum; Highland Woodworking "Mixing Shellac")', () => {
    expect(stageOf('fad').cutLb).toBe(1);
    expect(stageOf('body').cutLb).toBeGreaterThanOrEqual(1);
    expect(stageOf('body').cutLb).toBeLessThanOrEqual(1.5);
  });
});

describe('climate (WoodWeb knowledge base "Blush or Haze with Shellac Primer"; common practice)', () => {
  it('warns of blush at 75 % relative humidity', () => {
    expect(climateWarnings(20, 75).map((w) => w.code)).toContain('blush-risk');
    expect(climateWarnings(20, 74).map((w) => w.code)).not.toContain('blush-risk');
  });

  it('avoids finishing above about 65–70 % (common practice)', () => {
    expect(climateWarnings(20, 68).map((w) => w.code)).toContain('humid');
    expect(climateWarnings(20, 60)).toEqual([]);
  });

  it('drying slows by half for every 10 °C colder (the chemist\'s doubling rule, from memory): 10 °C rests twice as long', () => {
    expect(restFactor(10, 50)).toBeCloseTo(2, 12);
  });
});

describe('cautions (Flexner, Popular Woodworking; NIOSH Pocket Guide; every output defers to local rules)', () => {
  const cautions = estimate(GRAND, DEMO_CATALOG).cautions;

  it('oily rags self-heat: spread flat or hung to dry, or in a closed metal can of water (Flexner)', () => {
    expect(cautions.find((c) => c.code === 'oily-rags')?.text).toMatch(/flat.*closed metal can of water/s);
  });

  it('spirit flashes below room temperature: about 11 °C for a spirit with methanol (NIOSH: methanol 11 °C, ethanol 13 °C)', () => {
    expect(cautions.find((c) => c.code === 'flammable-vapour')?.text).toMatch(/about 11 °C/);
  });

  it('methanol is toxic through the skin as well (NIOSH: skin notation)', () => {
    expect(cautions.find((c) => c.code === 'methanol')?.text).toMatch(/through the skin/);
  });

  it('stripping gives off vapour of its own that the spirit figure does not count: named, not guessed', () => {
    expect(cautions.find((c) => c.code === 'other-solvents')?.text).toMatch(/Strip the old finish \(Finish stripper, gel\)/);
  });
});
