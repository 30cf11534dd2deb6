/**
 * Default finishing systems (seeded, owner-editable): full repolish, re-body, revive and new work.
 *
 * Sources: the order of stages and the oil-lubricated rubber follow Wikipedia "French polish" and the 1911
 * Encyclopaedia Britannica; the rest between bodying sessions (about 12 h, often 24 h) follows Bitmead, "French
 * Polishing and Enamelling"; a week's rest after pumice grain filling follows the Fine Woodworking forum "Sealing
 * open pore woods"; padding cuts of 1–1.5 lb follow Fine Woodworking / Highland Woodworking; the final rest before
 * cutting back (two weeks, inside the 10-days-to-a-month rules of thumb) is common practice. Rates of polish,
 * spirit, materials and labour per square metre are common practice, calibrated so that the full repolish of a
 * 6 ft 3 in grand comes to about 30 coats and 70 hours (see docs/calculations.md, "Calibration").
 */
import type { FinishingSystem, MaterialUse, Stage } from '../../schemas/catalog';

type StageSpec = Pick<Stage, 'key' | 'kind' | 'name' | 'sessions' | 'coatsPerSession' | 'labourMinPerM2PerCoat' | 'setupMinPerSession' | 'restHours'> &
  Partial<Omit<Stage, 'materials'>> & { materials?: MaterialUse[] };

/** Fills a stage's optional fields with their defaults. */
function stage(spec: StageSpec): Stage {
  return {
    enabled: true,
    cutLb: 0,
    polishMlPerM2PerCoat: 0,
    spiritMlPerM2PerSession: 0,
    appliesTo: 'all',
    firstCoats: false,
    veneerCare: false,
    ...spec,
    materials: spec.materials ?? [],
  };
}

const use = (material: string, perM2: number): MaterialUse => ({ material, perM2 });

/* Shared stages ------------------------------------------------------------------------------------------ */

const strip = stage({
  key: 'strip', kind: 'strip', name: 'Strip the old finish', sessions: 1, coatsPerSession: 1,
  labourMinPerM2PerCoat: 45, setupMinPerSession: 30, restHours: 12, veneerCare: true,
  materials: [use('stripper', 400), use('abrasive-sheet', 0.5), use('polishing-cloth', 0.3)],
});

const stain = stage({
  key: 'stain', kind: 'stain', name: 'Stain (optional)', enabled: false, sessions: 1, coatsPerSession: 1,
  labourMinPerM2PerCoat: 10, setupMinPerSession: 20, restHours: 12, materials: [use('spirit-stain', 60)],
});

const grainFill = stage({
  key: 'grain-fill', kind: 'grain-fill', name: 'Grain filling with pumice', sessions: 1, coatsPerSession: 1,
  spiritMlPerM2PerSession: 30, labourMinPerM2PerCoat: 25, setupMinPerSession: 30, restHours: 168, appliesTo: 'open-pored',
  materials: [use('pumice', 25), use('polishing-oil', 5), use('wadding', 10)],
});

const fad = stage({
  key: 'fad', kind: 'fad', name: 'Fadding (sealing coats)', sessions: 1, coatsPerSession: 3, cutLb: 1,
  polishMlPerM2PerCoat: 20, spiritMlPerM2PerSession: 15, labourMinPerM2PerCoat: 6, setupMinPerSession: 15, restHours: 12,
  firstCoats: true, materials: [use('wadding', 8)],
});

const body = (sessions: number, restHours = 12): Stage =>
  stage({
    key: 'body', kind: 'body', name: 'Bodying with the rubber', sessions, coatsPerSession: 3, cutLb: 1.5,
    polishMlPerM2PerCoat: 12, spiritMlPerM2PerSession: 20, labourMinPerM2PerCoat: 7, setupMinPerSession: 15, restHours,
    materials: [use('polishing-oil', 2), use('wadding', 3), use('polishing-cloth', 0.05)],
  });

const stiffen = (sessions: number): Stage =>
  stage({
    key: 'stiffen', kind: 'stiffen', name: 'Stiffening', sessions, coatsPerSession: 2, cutLb: 1,
    polishMlPerM2PerCoat: 10, spiritMlPerM2PerSession: 15, labourMinPerM2PerCoat: 6, setupMinPerSession: 15, restHours: 24,
    materials: [use('wadding', 2)],
  });

const spiritOff = (coats: number, restHours: number): Stage =>
  stage({
    key: 'spirit-off', kind: 'spirit-off', name: 'Spiriting off', sessions: 1, coatsPerSession: coats, cutLb: 0.25,
    polishMlPerM2PerCoat: 8, spiritMlPerM2PerSession: 40, labourMinPerM2PerCoat: 8, setupMinPerSession: 15, restHours,
    materials: [use('wadding', 2), use('polishing-cloth', 0.05)],
  });

const cutBack = stage({
  key: 'cut-back', kind: 'cut-back', name: 'Cutting back', sessions: 1, coatsPerSession: 1,
  labourMinPerM2PerCoat: 40, setupMinPerSession: 20, restHours: 0, veneerCare: true, materials: [use('abrasive-sheet', 1)],
});

const burnish = stage({
  key: 'burnish', kind: 'burnish', name: 'Burnishing', sessions: 1, coatsPerSession: 1,
  labourMinPerM2PerCoat: 35, setupMinPerSession: 15, restHours: 0, appliesTo: 'show-faces',
  materials: [use('burnishing-cream', 30), use('polishing-cloth', 0.2)],
});

const wax = stage({
  key: 'wax', kind: 'wax', name: 'Waxing', sessions: 1, coatsPerSession: 1,
  labourMinPerM2PerCoat: 10, setupMinPerSession: 10, restHours: 0, appliesTo: 'show-faces',
  materials: [use('wax', 15), use('polishing-cloth', 0.2)],
});

/* Systems ------------------------------------------------------------------------------------------------ */

/** Full repolish: strip to the wood and build a new French polish (about 30 coats). */
export const FULL_REPOLISH: FinishingSystem = {
  key: 'full-repolish',
  name: 'Full repolish',
  description: 'Strip to the wood, grain fill, fad, body, stiffen, spirit off, rest, cut back, burnish and wax.',
  stages: [
    strip,
    stage({
      key: 'prepare', kind: 'prepare', name: 'Prepare: scrape, sand, lay veneer', sessions: 1, coatsPerSession: 1,
      labourMinPerM2PerCoat: 35, setupMinPerSession: 30, restHours: 2, veneerCare: true, materials: [use('abrasive-sheet', 1.5)],
    }),
    stain,
    grainFill,
    fad,
    body(7),
    stiffen(2),
    spiritOff(2, 336),
    cutBack,
    burnish,
    wax,
  ],
};

/** Re-body: clean and key a sound old finish, then body it up again. */
export const RE_BODY: FinishingSystem = {
  key: 're-body',
  name: 'Re-body an existing finish',
  description: 'Clean, de-wax and key the old polish, body up, stiffen, spirit off, rest, cut back, burnish and wax.',
  stages: [
    stage({
      key: 'prepare', kind: 'prepare', name: 'Clean, de-wax and key the old polish', sessions: 1, coatsPerSession: 1,
      spiritMlPerM2PerSession: 30, labourMinPerM2PerCoat: 20, setupMinPerSession: 20, restHours: 2,
      materials: [use('abrasive-sheet', 0.75), use('polishing-cloth', 0.2)],
    }),
    body(3),
    stiffen(1),
    spiritOff(2, 168),
    cutBack,
    burnish,
    wax,
  ],
};

/** Revive: clean with a reviver, pull the old polish over with a thin rubber, spirit off and wax. */
export const REVIVE: FinishingSystem = {
  key: 'revive',
  name: 'Revive and wax',
  description: 'Clean with reviver, one light session with the rubber, spirit off and wax.',
  stages: [
    stage({
      key: 'prepare', kind: 'prepare', name: 'Clean with reviver', sessions: 1, coatsPerSession: 1,
      labourMinPerM2PerCoat: 15, setupMinPerSession: 15, restHours: 2, materials: [use('reviver', 40), use('polishing-cloth', 0.2)],
    }),
    stage({
      key: 'body', kind: 'body', name: 'Pulling over with a light rubber', sessions: 1, coatsPerSession: 2, cutLb: 1,
      polishMlPerM2PerCoat: 8, spiritMlPerM2PerSession: 20, labourMinPerM2PerCoat: 5, setupMinPerSession: 15, restHours: 12,
      materials: [use('polishing-oil', 1), use('wadding', 2)],
    }),
    spiritOff(1, 72),
    wax,
  ],
};

/** New work: bare wood to a full French polish. */
export const NEW_WORK: FinishingSystem = {
  key: 'new-work',
  name: 'New work on bare wood',
  description: 'Prepare bare wood, grain fill, fad, body, stiffen, spirit off, rest, cut back, burnish and wax.',
  stages: [
    stage({
      key: 'prepare', kind: 'prepare', name: 'Prepare bare wood: scrape and sand', sessions: 1, coatsPerSession: 1,
      labourMinPerM2PerCoat: 30, setupMinPerSession: 20, restHours: 2, veneerCare: true, materials: [use('abrasive-sheet', 2)],
    }),
    stain,
    grainFill,
    fad,
    body(8),
    stiffen(2),
    spiritOff(2, 336),
    cutBack,
    burnish,
    wax,
  ],
};

/** The preset systems, keyed as the input names them. */
export const DEFAULT_SYSTEMS: readonly FinishingSystem[] = [FULL_REPOLISH, RE_BODY, REVIVE, NEW_WORK];
