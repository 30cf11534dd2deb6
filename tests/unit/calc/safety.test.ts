import { describe, expect, it } from 'vitest';
import { cautions, customerCautions, CUSTOMER_VENTILATION_TEXT, ventilation } from '../../../shared/calc/safety';
import type { SafetySettings } from '../../../shared/schemas/catalog';

const settings: SafetySettings = { room: { volumeM3: 100, airChangesPerHour: 4 }, mixingFactor: 3, spirit: { ethanol: 1, methanol: 0, isopropanol: 0 } };

describe('ventilation', () => {
  const sessions = [
    { index: 0, date: '2025-03-03', spiritL: 0.6, handsOnMin: 120 },
    { index: 1, date: '2025-03-03', spiritL: 0.3, handsOnMin: 30 },
    { index: 2, date: '2025-03-04', spiritL: 0.5, handsOnMin: 200 },
  ];
  const v = ventilation(sessions, settings);

  it('picks the fastest-evaporating session and the heaviest day', () => {
    expect(v.worstSession.index).toBe(1);
    expect(v.worstSession.evaporationLPerMin).toBeCloseTo(0.01, 12);
    expect(v.worstDay.date).toBe('2025-03-03');
    expect(v.worstDay.spiritL).toBeCloseTo(0.9, 12);
  });

  it('concentration C = G × K / Q (hand arithmetic: 0.01 L/min ethanol → 0.25124 m³/h vapour; × 3 / 400 m³/h = 1884 ppm)', () => {
    expect(v.concentrationPpm).toBeCloseTo(1884.3, 0);
    expect(v.exposureIndex).toBeCloseTo(1.884, 2);
  });

  it('judges the room against the required flow: 400 m³/h is short of 753.7, 1000 m³/h is enough', () => {
    expect(v.requiredFlowM3h).toBeCloseTo(753.7, 1);
    expect(v.adequate).toBe(false);
    expect(ventilation(sessions, { ...settings, room: { volumeM3: 100, airChangesPerHour: 10 } }).adequate).toBe(true);
  });

  it('the required flow brings the exposure index to exactly 1 (the additive rule at its limit)', () => {
    for (const spirit of [{ ethanol: 0.95, methanol: 0.05, isopropanol: 0 }, { ethanol: 0.5, methanol: 0.2, isopropanol: 0.3 }]) {
      const m = ventilation(sessions, { ...settings, spirit });
      const atRequired = ventilation(sessions, { ...settings, spirit, room: { volumeM3: m.exposureFlowM3h, airChangesPerHour: 1 } });
      expect(atRequired.exposureIndex).toBeCloseTo(1, 9);
    }
  });

  it('a little methanol adds its own share of air; it no longer sets the limit for all the ethanol', () => {
    const m = ventilation(sessions, { ...settings, spirit: { ethanol: 0.95, methanol: 0.05, isopropanol: 0 } });
    expect(m.components.map((c) => c.solvent)).toEqual(['ethanol', 'methanol']);
    expect(m.requiredFlowM3h).toBeGreaterThan(v.requiredFlowM3h);
    expect(m.requiredFlowM3h).toBeLessThan(v.requiredFlowM3h * 1.5);
  });

  it('names the stages it does not cover', () => {
    const u = ventilation(sessions, settings, [{ stage: 'strip', name: 'Strip the old finish', materials: ['Finish stripper, gel'] }]);
    expect(u.notCovered).toEqual([{ stage: 'strip', name: 'Strip the old finish', materials: ['Finish stripper, gel'] }]);
    expect(cautions(u, settings.spirit).find((c) => c.code === 'other-solvents')?.text).toMatch(/Strip the old finish \(Finish stripper, gel\)/);
    expect(cautions(v, settings.spirit).some((c) => c.code === 'other-solvents')).toBe(false);
  });
});

describe('cautions', () => {
  const v = ventilation([{ index: 0, date: '2025-03-03', spiritL: 0.5, handsOnMin: 120 }], settings);

  it('always carry the fire, ventilation, storage, rags, protection and local-rules items', () => {
    const codes = cautions(v, settings.spirit).map((c) => c.code);
    expect(codes).toEqual(['flammable-vapour', 'ignition-sources', 'ventilation', 'spirit-storage', 'oily-rags', 'gloves-eyes', 'local-rules']);
  });

  it('speak in plain words: no flow, no limit, no single limit for a whole mixture', () => {
    const mixed = ventilation([{ index: 0, date: '2025-03-03', spiritL: 0.5, handsOnMin: 120 }], { ...settings, spirit: { ethanol: 0.95, methanol: 0.05, isopropanol: 0 } });
    for (const c of cautions(mixed, { ethanol: 0.95, methanol: 0.05, isopropanol: 0 })) {
      expect(c.text).not.toMatch(/m³\/h|ft³\/min|cfm|\d\s*ppm|mL of spirit a minute|adequate/);
    }
  });

  it('add methanol toxicity only when the spirit holds methanol', () => {
    expect(cautions(v, { ethanol: 0.95, methanol: 0.05, isopropanol: 0 }).some((c) => c.code === 'methanol')).toBe(true);
    expect(cautions(v, settings.spirit).some((c) => c.code === 'methanol')).toBe(false);
  });

  it('say oily rags go flat to dry or in a closed metal can of water (Flexner, Popular Woodworking)', () => {
    const text = cautions(v, settings.spirit).find((c) => c.code === 'oily-rags')?.text ?? '';
    expect(text).toMatch(/flat/);
    expect(text).toMatch(/closed metal can of water/);
  });

  it('say local fire codes, the regulator and licensed practice come first', () => {
    expect(cautions(v, settings.spirit).at(-1)?.text).toMatch(/Local fire codes, the workplace-safety regulator and licensed practice come first/);
  });
});

describe('customer cautions', () => {
  // A revision saved before the cautions were plain: the ventilation caution carries the room's arithmetic.
  const saved = [
    { code: 'flammable-vapour', severity: 'danger' as const, text: 'Spirit is highly flammable: its flash point is about 11 °C.' },
    {
      code: 'ventilation', severity: 'danger' as const,
      text: 'Ventilate the finishing room: the busiest session evaporates about 4.5 mL of spirit a minute, which needs at least 1735 m³/h (1007 ft³/min) of fresh air with mixing factor 3 to stay below 200 ppm; the room supplies 720 m³/h.',
    },
    { code: 'oily-rags', severity: 'danger' as const, text: 'Rags and rubbers with oil can heat up and catch fire on their own.' },
    { code: 'methanol', severity: 'danger' as const, text: 'This spirit contains methanol (5 %): it is toxic by breathing, swallowing and through the skin (exposure limit 200 ppm). Ventilate.' },
    { code: 'local-rules', severity: 'info' as const, text: 'Local fire codes, the workplace-safety regulator and licensed practice come first: these figures do not replace them.' },
  ];

  it('keep fire, vapour, rags and local rules, without the air-change arithmetic', () => {
    const plain = customerCautions(saved);
    expect(plain.map((c) => c.code)).toEqual(saved.map((c) => c.code));
    for (const c of plain) expect(c.text).not.toMatch(/m³\/h|ft³\/min|ppm|mixing factor|air changes/);
    expect(plain.find((c) => c.code === 'local-rules')?.text).toMatch(/Local fire codes/);
    expect(CUSTOMER_VENTILATION_TEXT).not.toMatch(/\d/);
  });
});
