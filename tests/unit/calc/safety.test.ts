import { describe, expect, it } from 'vitest';
import { cautions, ventilation } from '../../../shared/calc/safety';
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

  it('concentration C = G × K / Q (hand arithmetic: 0.01 L/min ethanol → 0.25125 m³/h vapour; × 3 / 400 m³/h = 1884 ppm)', () => {
    const vapour = ((10 * 0.789) / 46.07) * 24.45 * 0.06;
    expect(v.concentrationPpm).toBeCloseTo((vapour * 3 * 1e6) / 400, 6);
    expect(v.concentrationPpm).toBeCloseTo(1884, 0);
  });

  it('requires the flow that brings the concentration down to the limit, and judges the room against it', () => {
    // At the required flow the concentration is exactly the limit: Q = G × K × 10⁶ / 1000.
    expect(v.requiredFlowM3h).toBeCloseTo((v.concentrationPpm * 400) / 1000, 6);
    expect(v.adequate).toBe(false);
    expect(ventilation(sessions, { ...settings, room: { volumeM3: 100, airChangesPerHour: 10 } }).adequate).toBe(true);
  });

  it('with methanol present, the 200 ppm limit governs', () => {
    const m = ventilation(sessions, { ...settings, spirit: { ethanol: 0.9, methanol: 0.1, isopropanol: 0 } });
    expect(m.exposureLimitPpm).toBe(200);
    expect(m.limitingSolvent).toBe('methanol');
    expect(m.requiredFlowM3h).toBeGreaterThan(v.requiredFlowM3h * 4);
  });
});

describe('cautions', () => {
  const v = ventilation([{ index: 0, date: '2025-03-03', spiritL: 0.5, handsOnMin: 120 }], settings);

  it('always carry the fire, ventilation, storage, rags, protection and local-rules items', () => {
    const codes = cautions(v, settings.spirit).map((c) => c.code);
    expect(codes).toEqual(['flammable-vapour', 'ignition-sources', 'ventilation', 'spirit-storage', 'oily-rags', 'gloves-eyes', 'local-rules']);
  });

  it('give the computed ventilation figure', () => {
    const text = cautions(v, settings.spirit).find((c) => c.code === 'ventilation')?.text ?? '';
    expect(text).toContain(`${Math.ceil(v.requiredFlowM3h)} m³/h`);
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
