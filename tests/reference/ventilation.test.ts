import { describe, expect, it } from 'vitest';
import {
  dilutionFlowCfm, dilutionFlowM3h, M3H_PER_CFM, mixtureLel, ML_PER_US_PINT, SOLVENTS, strictestLimit, vapourM3h,
} from '../../shared/calc/safety';

describe('solvent table (NIOSH Pocket Guide to Chemical Hazards)', () => {
  it('holds the published figures', () => {
    expect(SOLVENTS.ethanol).toMatchObject({ molarMass: 46.07, density: 0.789, lelPct: 3.3, uelPct: 19, limitPpm: 1000 });
    expect(SOLVENTS.methanol).toMatchObject({ molarMass: 32.04, density: 0.791, lelPct: 6.0, uelPct: 36.5, limitPpm: 200, skin: true });
    expect(SOLVENTS.isopropanol).toMatchObject({ molarMass: 60.1, lelPct: 2.0, uelPct: 12.7, limitPpm: 400 });
  });

  it('the strictest limit among the components present governs', () => {
    expect(strictestLimit({ ethanol: 0.9, methanol: 0.1, isopropanol: 0 })).toEqual({ solvent: 'methanol', ppm: 200 });
    expect(strictestLimit({ ethanol: 1, methanol: 0, isopropanol: 0 })).toEqual({ solvent: 'ethanol', ppm: 1000 });
    expect(strictestLimit({ ethanol: 0.5, methanol: 0, isopropanol: 0.5 })).toEqual({ solvent: 'isopropanol', ppm: 400 });
  });
});

describe('general dilution ventilation (ACGIH "Industrial Ventilation"; OSHA Technical Manual)', () => {
  const ethanol = { specificGravity: 0.789, erPintsPerMin: 0.01, k: 3, molarMass: 46.07, ppm: 1000 };

  it('Q = 403 × 10⁶ × SG × ER × K / (MW × C) matches hand arithmetic', () => {
    // 403e6 × 0.789 × 0.01 × 3 = 9 539 010; 46.07 × 1000 = 46 070; 9 539 010 / 46 070 = 207.06 ft³/min.
    expect(dilutionFlowCfm(ethanol)).toBeCloseTo(207.06, 1);
  });

  it('the metric form from 24.45 L/mol matches hand arithmetic', () => {
    // 0.01 pt/min = 0.004731765 L/min; × 789 g/L = 3.73336 g/min; / 46.07 = 0.081037 mol/min;
    // × 24.45 L/mol = 1.98136 L/min = 0.118882 m³/h; × K 3 × 10⁶ / 1000 ppm = 356.6 m³/h.
    const er = 0.01 * (ML_PER_US_PINT / 1000);
    expect(ML_PER_US_PINT).toBeCloseTo(473.176473, 6);
    expect(dilutionFlowM3h({ density: 0.789, erLitresPerMin: er, k: 3, molarMass: 46.07, ppm: 1000 })).toBeCloseTo(356.6, 0);
  });

  it('the two forms agree within 2 % (387 ft³/lb-mole at 70 °F against 24.45 L/mol at 25 °C)', () => {
    const er = 0.01 * (ML_PER_US_PINT / 1000);
    const metric = dilutionFlowM3h({ density: 0.789, erLitresPerMin: er, k: 3, molarMass: 46.07, ppm: 1000 });
    const imperial = dilutionFlowCfm(ethanol) * M3H_PER_CFM;
    expect(M3H_PER_CFM).toBeCloseTo(1.699, 3);
    expect(metric / imperial).toBeGreaterThan(1);
    expect(metric / imperial).toBeLessThan(1.02);
    // Where the gap comes from: 387 ft³ per lb-mole in litres per mole, and 403 ≈ 387 × 8.345 lb per US gal / 8 pt.
    const litresPerMoleAt70F = (387 * 28.316846592) / 453.59237;
    expect(litresPerMoleAt70F).toBeCloseTo(24.16, 2);
    expect(Math.abs(387 * (8.345 / 8) - 403)).toBeLessThan(1);
    expect(metric / imperial).toBeCloseTo((24.45 / litresPerMoleAt70F) * ((387 * 8.345) / 8 / 403), 2);
  });

  it('vapour from 1 L/min of ethanol is 1000 × 0.789 / 46.07 × 24.45 L/min (ideal gas)', () => {
    expect(vapourM3h(1, { ethanol: 1, methanol: 0, isopropanol: 0 }).ethanol).toBeCloseTo(((789 / 46.07) * 24.45 * 60) / 1000, 6);
  });
});

describe('mixture LEL by Le Chatelier (OSHA/NFPA practice: keep at 25 % of LEL)', () => {
  it('a pure solvent gives its own LEL', () => {
    expect(mixtureLel({ ethanol: 1, methanol: 0, isopropanol: 0 })).toBeCloseTo(3.3, 10);
  });
  it('half ethanol, half methanol: 1 / (0.5/3.3 + 0.5/6.0) = 4.258 %', () => {
    expect(mixtureLel({ ethanol: 0.5, methanol: 0.5, isopropanol: 0 })).toBeCloseTo(4.258, 3);
  });
});
