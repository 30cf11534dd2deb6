import { describe, expect, it } from 'vitest';
import { templateDimensions, templateParts } from '../../../shared/calc/templates';
import { partArea, resolvePart } from '../../../shared/calc/area';
import { PartSchema, TEMPLATE_KEYS } from '../../../shared/schemas/calc';

describe('templates', () => {
  it.each(TEMPLATE_KEYS)('%s generates a valid, editable parts list with positive areas', (template) => {
    const parts = templateParts(template);
    expect(parts.length).toBeGreaterThan(2);
    for (const p of parts) {
      expect(PartSchema.parse(p)).toEqual(p);
      expect(partArea(resolvePart(p, 'mm', 'mahogany', 0)).areaM2).toBeGreaterThan(0);
    }
    expect(new Set(parts.map((p) => p.id)).size).toBe(parts.length);
  });

  it('a grand has the parts a finisher measures', () => {
    const ids = templateParts('grand').map((p) => p.id);
    for (const id of ['lid-top', 'lid-underside', 'lid-edge', 'rim-outside', 'rim-inside', 'fall-board', 'music-desk', 'key-slip', 'key-cheeks', 'legs', 'lyre', 'pedal-box']) {
      expect(ids).toContain(id);
    }
    expect(templateParts('grand').find((p) => p.id === 'legs')?.count).toBe(3);
    expect(templateParts('grand').find((p) => p.id === 'lid-top')?.shape.kind).toBe('polygon');
  });

  it('fills defaults and reads dimensions with units', () => {
    expect(templateDimensions('grand', { length: '6 ft 3 in' }, 'mm')).toEqual({ length: 1905, width: 1500, rimHeight: 330 });
    expect(templateDimensions('grand', { width: 59 }, 'in')).toEqual({ length: 1905, width: 1498.6, rimHeight: 330 });
  });

  it('writes lengths as millimetre text so the list means the same in any default unit', () => {
    const parts = templateParts('table', { length: '60 in' });
    const inMm = parts.map((p) => partArea(resolvePart(p, 'mm', 'mahogany', 0)).areaM2);
    const inFt = parts.map((p) => partArea(resolvePart(p, 'ft', 'mahogany', 0)).areaM2);
    expect(inFt).toEqual(inMm);
  });

  it('a table top is length × width plus its edges (hand arithmetic: 1.5 × 0.9 + 0.025 × 4.8)', () => {
    const top = templateParts('table').find((p) => p.id === 'top');
    expect(top).toBeDefined();
    expect(partArea(resolvePart(top!, 'mm', 'mahogany', 0)).areaM2).toBeCloseTo(1.35 + 0.12, 10);
  });

  it('applies the species and veneer asked for to every part', () => {
    for (const p of templateParts('cabinet', {}, 'mm', { species: 'maple', veneered: false })) {
      expect(p.species).toBe('maple');
      expect(p.veneered).toBe(false);
    }
  });

  it('stays valid for a very small piece', () => {
    for (const p of templateParts('upright', { height: '30 cm', width: '20 cm', depth: '10 cm' })) expect(PartSchema.safeParse(p).success).toBe(true);
  });
});
