/**
 * Ventilation checked against the published dilution equation worked by hand (python/pencil arithmetic written
 * into the comments), never against the engine's own formula. Sources: docs/references.md [ACGIH-IV],
 * [OSHA-TM], [OSHA-1000], [NIOSH-PG], [NFPA-30].
 */
import { describe, expect, it } from 'vitest';
import {
  dilutionFlowCfm, dilutionFlowM3h, M3H_PER_CFM, mixtureLel, ML_PER_US_PINT, SOLVENTS, vapourM3h, ventilation,
} from '../../shared/calc/safety';
import type { SafetySettings } from '../../shared/schemas/catalog';

/** One session evaporating 10 mL of spirit a minute (0.6 L over an hour), K = 3, a large room. */
const session = [{ index: 0, date: '2025-03-03', spiritL: 0.6, handsOnMin: 60 }];
const room = (spirit: SafetySettings['spirit']): SafetySettings => ({ room: { volumeM3: 1000, airChangesPerHour: 1 }, mixingFactor: 3, spirit });

describe('solvent table (NIOSH Pocket Guide to Chemical Hazards)', () => {
  it('ethanol: MW 46.07, SG 0.789, LEL 3.3 %, UEL 19 %, REL/PEL 1000 ppm, flash point 13 °C', () => {
    expect(SOLVENTS.ethanol).toMatchObject({ molarMass: 46.07, density: 0.789, lelPct: 3.3, uelPct: 19, limitPpm: 1000, flashPointC: 13 });
  });
  it('methanol: MW 32.04, SG 0.791, LEL 6 %, UEL 36 %, REL/PEL 200 ppm with a skin notation, flash point 11 °C', () => {
    expect(SOLVENTS.methanol).toMatchObject({ molarMass: 32.04, density: 0.791, lelPct: 6.0, limitPpm: 200, skin: true, flashPointC: 11 });
    expect(SOLVENTS.methanol.uelPct).toBeGreaterThanOrEqual(36);
  });
  it('isopropanol: MW 60.1, LEL 2 %, UEL 12.7 %, REL/PEL 400 ppm, flash point 12 °C', () => {
    expect(SOLVENTS.isopropanol).toMatchObject({ molarMass: 60.1, lelPct: 2.0, uelPct: 12.7, limitPpm: 400, flashPointC: 12 });
  });
  it('isopropanol specific gravity about 0.785 (from memory; NIOSH gives 0.79)', () => {
    expect(Math.abs(SOLVENTS.isopropanol.density - 0.79)).toBeLessThanOrEqual(0.0051);
  });
});

describe('general dilution ventilation, Q = 403 × 10⁶ × SG × ER × K / (MW × C) (ACGIH "Industrial Ventilation"; OSHA Technical Manual)', () => {
  it('ethanol, 0.01 US pt/min, K 3, 1000 ppm: 403e6 × 0.789 × 0.01 × 3 / (46.07 × 1000) = 207.06 ft³/min', () => {
    expect(dilutionFlowCfm({ specificGravity: 0.789, erPintsPerMin: 0.01, k: 3, molarMass: 46.07, ppm: 1000 })).toBeCloseTo(207.06, 1);
  });

  it('the metric form from 24.45 L/mol: 0.01 pt/min of ethanol → 356.6 m³/h (hand arithmetic)', () => {
    // 0.01 pt/min = 0.004731765 L/min; × 789 g/L = 3.73336 g/min; / 46.07 = 0.081037 mol/min;
    // × 24.45 L/mol = 1.98136 L/min = 0.118882 m³/h; × K 3 × 10⁶ / 1000 ppm = 356.6 m³/h.
    expect(dilutionFlowM3h({ density: 0.789, erLitresPerMin: 0.004731765, k: 3, molarMass: 46.07, ppm: 1000 })).toBeCloseTo(356.6, 0);
  });

  it('a US pint is 473.176 mL (NIST Handbook 44: 231 in³ / 8)', () => {
    expect(ML_PER_US_PINT).toBeCloseTo(473.176473, 6);
  });

  it('a cubic foot a minute is 1.699 m³/h (0.3048³ × 60, from the foot)', () => {
    expect(M3H_PER_CFM).toBeCloseTo(1.699, 3);
  });

  it('the two forms agree within 2 %, each worked by hand from its published form: 351.79 m³/h against 356.64 m³/h', () => {
    // Inputs: ethanol, SG 0.789, MW 46.07 g/mol, TLV 1000 ppm [NIOSH-PG]; ER 0.01 US pt/min; K 3.
    // Imperial form [ACGIH-IV]: Q = 403 × SG × ER × K × 10⁶ / (MW × TLV)
    //   = 403 × 0.789 × 0.01 × 3 × 10⁶ / (46.07 × 1000) = 9 539 010 / 46 070 = 207.055 ft³/min
    //   × 1.699011 m³/h per ft³/min (0.3048³ m³ × 60) = 351.79 m³/h.
    // SI form (ideal gas at 25 °C, 24.45 L/mol): 0.01 pt/min = 0.00473176 L/min; × 789 g/L = 3.733359 g/min;
    //   / 46.07 g/mol = 0.0810367 mol/min; × 24.45 L/mol = 1.981346 L/min = 0.1188808 m³/h;
    //   × K 3 × 10⁶ / 1000 ppm = 356.64 m³/h.
    // Why they differ: 403 is 387 ft³/lb-mol (70 °F) × 8.345 lb/gal of water / 8 pt = 403.71, rounded down; and
    //   387 ft³/lb-mol is 387 × 28.3168 L / 453.592 mol = 24.160 L/mol against 24.45 L/mol.
    //   24.45 / 24.160 × 403.71 / 403 = 1.01202 × 1.00176 = 1.0138.
    const handImperialM3h = 351.79;
    const handSiM3h = 356.64;
    const imperial = dilutionFlowCfm({ specificGravity: 0.789, erPintsPerMin: 0.01, k: 3, molarMass: 46.07, ppm: 1000 });
    const metric = dilutionFlowM3h({ density: 0.789, erLitresPerMin: 0.00473176, k: 3, molarMass: 46.07, ppm: 1000 });
    expect(imperial).toBeCloseTo(207.055, 2);
    expect(imperial * M3H_PER_CFM).toBeCloseTo(handImperialM3h, 1);
    expect(metric).toBeCloseTo(handSiM3h, 1);
    expect(handSiM3h / handImperialM3h).toBeCloseTo(1.0138, 3);
    expect(metric / (imperial * M3H_PER_CFM)).toBeCloseTo(handSiM3h / handImperialM3h, 3);
    expect(Math.abs(metric / (imperial * M3H_PER_CFM) - 1)).toBeLessThan(0.02);
  });

  it('the two forms agree within 2 % for isopropanol too: 670.75 m³/h against 680.00 m³/h, both by hand', () => {
    // Inputs: isopropanol, SG 0.785 (from memory; NIOSH gives 0.79), MW 60.1 g/mol, limit 400 ppm [NIOSH-PG]; ER 0.01 US pt/min; K 3.
    // Imperial: 403 × 0.785 × 0.01 × 3 × 10⁶ / (60.1 × 400) = 9 490 650 / 24 040 = 394.786 ft³/min
    //   × 1.699011 = 670.75 m³/h.
    // SI: 0.00473176 L/min × 785 g/L = 3.714432 g/min; / 60.1 = 0.0618042 mol/min; × 24.45 L/mol = 1.511112 L/min
    //   = 0.0906668 m³/h; × 3 × 10⁶ / 400 = 680.00 m³/h. Ratio 680.00 / 670.75 = 1.0138, as for ethanol.
    const imperial = dilutionFlowCfm({ specificGravity: 0.785, erPintsPerMin: 0.01, k: 3, molarMass: 60.1, ppm: 400 });
    const metric = dilutionFlowM3h({ density: 0.785, erLitresPerMin: 0.00473176, k: 3, molarMass: 60.1, ppm: 400 });
    expect(imperial).toBeCloseTo(394.786, 2);
    expect(imperial * M3H_PER_CFM).toBeCloseTo(670.75, 1);
    expect(metric).toBeCloseTo(680.0, 1);
    expect(Math.abs(metric / (imperial * M3H_PER_CFM) - 1)).toBeLessThan(0.02);
  });

  it('vapour from 1 L/min of ethanol at 25 °C is 1000 × 0.789 / 46.07 × 24.45 L/min = 25.12 m³/h (ideal gas)', () => {
    expect(vapourM3h(1, { ethanol: 1, methanol: 0, isopropanol: 0 }).ethanol).toBeCloseTo(25.124, 2);
  });
});

describe('worked checks: 10 mL/min of spirit, K = 3, each by hand from the published equation', () => {
  it('pure ethanol: 0.01 × 1000 × 0.789 / 46.07 × 24.45 × 0.06 × 3 × 10⁶ / 1000 = 753.7 m³/h; imperial 437.6 ft³/min', () => {
    const v = ventilation(session, room({ ethanol: 1, methanol: 0, isopropanol: 0 }));
    expect(v.requiredFlowM3h).toBeCloseTo(753.72, 1);
    expect(v.requiredFlowCfm).toBeCloseTo(437.58, 1);
    expect(v.governs).toBe('exposure');
  });

  it('pure isopropanol: 0.01 × 1000 × 0.785 / 60.1 × 24.45 × 0.06 × 3 × 10⁶ / 400 = 1437.1 m³/h; imperial 834.3 ft³/min', () => {
    const v = ventilation(session, room({ ethanol: 0, methanol: 0, isopropanol: 1 }));
    expect(v.requiredFlowM3h).toBeCloseTo(1437.1, 1);
    expect(v.requiredFlowCfm).toBeCloseTo(834.33, 1);
  });

  it('95/5 ethanol/methanol, additive rule (OSHA 29 CFR 1910.1000(d)(2)): 716.0 + 271.6 = 987.7 m³/h; 573.4 ft³/min', () => {
    // ethanol 9.5 mL/min: 0.0095 × 789 / 46.07 × 24.45 × 0.06 × 3 × 10⁶ / 1000 = 716.03 m³/h
    // methanol 0.5 mL/min: 0.0005 × 791 / 32.04 × 24.45 × 0.06 × 3 × 10⁶ / 200 = 271.63 m³/h
    const v = ventilation(session, room({ ethanol: 0.95, methanol: 0.05, isopropanol: 0 }));
    expect(v.components.find((c) => c.solvent === 'ethanol')?.requiredFlowM3h).toBeCloseTo(716.03, 1);
    expect(v.components.find((c) => c.solvent === 'methanol')?.requiredFlowM3h).toBeCloseTo(271.63, 1);
    expect(v.requiredFlowM3h).toBeCloseTo(987.66, 1);
    expect(v.requiredFlowCfm).toBeCloseTo(573.4, 0);
  });

  it('95/5: the whole evaporation against the strictest limit (200 ppm) would ask 3851.8 m³/h, 3.9 times as much', () => {
    const v = ventilation(session, room({ ethanol: 0.95, methanol: 0.05, isopropanol: 0 }));
    expect(3851.8 / v.requiredFlowM3h).toBeCloseTo(3.9, 1);
    expect(v.requiredFlowM3h).toBeLessThan(3851.8 / 3);
  });

  it('95/5 at 720 m³/h: Σ Cᵢ/Lᵢ = 0.9945 + 0.3773 = 1.372, over 1: more air needed (OSHA 29 CFR 1910.1000(d)(2)(i))', () => {
    // Cₑ = 0.238678 × 3 × 10⁶ / 720 = 994.5 ppm → 0.9945 of 1000; Cₘ = 0.0181085 × 3 × 10⁶ / 200 / 720 = 0.3773.
    const v = ventilation(session, { ...room({ ethanol: 0.95, methanol: 0.05, isopropanol: 0 }), room: { volumeM3: 120, airChangesPerHour: 6 } });
    expect(v.exposureIndex).toBeCloseTo(1.3718, 3);
    expect(v.adequate).toBe(false);
  });

  it('95/5, fire: vapour LEL 3.408 % by Le Chatelier, a quarter is 8520 ppm, needing 90.4 m³/h: exposure governs', () => {
    const v = ventilation(session, room({ ethanol: 0.95, methanol: 0.05, isopropanol: 0 }));
    expect(v.mixtureLelPct).toBeCloseTo(3.408, 3);
    expect(v.fireFlowM3h).toBeCloseTo(90.41, 1);
    expect(v.governs).toBe('exposure');
  });
});

describe('mixture LEL by Le Chatelier (NFPA 30 / OSHA practice: keep vapour at 25 % of LEL)', () => {
  it('a pure solvent gives its own LEL', () => {
    expect(mixtureLel({ ethanol: 1, methanol: 0, isopropanol: 0 })).toBeCloseTo(3.3, 10);
  });
  it('half ethanol, half methanol: 1 / (0.5/3.3 + 0.5/6.0) = 4.258 %', () => {
    expect(mixtureLel({ ethanol: 0.5, methanol: 0.5, isopropanol: 0 })).toBeCloseTo(4.258, 3);
  });
});
