import { describe, expect, it } from 'vitest';
import {
  ellipsePerimeter, frustumLateralArea, partArea, polygonArea, polygonPerimeter, resolveShape, shapeArea, shapePerimeter, taperedLegArea,
} from '../../../shared/calc/area';
import type { ResolvedPart, Shape } from '../../../shared/calc/area';
import { grandOutline } from '../../../shared/calc/templates';

const part = (shape: Shape, extra: Partial<ResolvedPart> = {}): ResolvedPart => ({
  id: 'p', name: 'Test part', shape, faces: 1, edges: false, thicknessMm: 20, count: 1, cutOuts: [], species: 'maple',
  veneered: false, complexity: 'flat', show: true, ...extra,
});

describe('shapes against independent formulas', () => {
  it('circle: πr² with r = 250 mm is 196 349.5 mm²', () => {
    expect(shapeArea({ kind: 'circle', diameter: 500 })).toBeCloseTo(196_349.54, 1);
    expect(shapePerimeter({ kind: 'circle', diameter: 500 })).toBeCloseTo(1570.796, 3);
  });

  it('ellipse: πab; perimeter between the inscribed and circumscribed circles and matching a numeric integral', () => {
    expect(shapeArea({ kind: 'ellipse', length: 600, width: 400 })).toBeCloseTo(Math.PI * 300 * 200, 6);
    // Numeric arc length by summing 200 000 chords (independent of Ramanujan's formula).
    let chords = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      const t1 = (2 * Math.PI * i) / n;
      const t2 = (2 * Math.PI * (i + 1)) / n;
      chords += Math.hypot(300 * (Math.cos(t2) - Math.cos(t1)), 200 * (Math.sin(t2) - Math.sin(t1)));
    }
    expect(ellipsePerimeter(600, 400)).toBeCloseTo(chords, 3);
  });

  it('shoelace on a hand-computed L-shaped polygon: 100×60 less 60×30 = 4200', () => {
    const L = [[0, 0], [100, 0], [100, 30], [40, 30], [40, 60], [0, 60]] as const;
    expect(polygonArea(L)).toBe(4200);
    expect(polygonPerimeter(L)).toBe(100 + 30 + 60 + 30 + 40 + 60);
    // Orientation does not matter.
    expect(polygonArea([...L].reverse())).toBe(4200);
  });

  it('trapezoid: (a + b)/2 × h and its perimeter with isosceles legs (3-4-5 triangle)', () => {
    expect(shapeArea({ kind: 'trapezoid', top: 4, bottom: 10, height: 4 })).toBe(28);
    expect(shapePerimeter({ kind: 'trapezoid', top: 4, bottom: 10, height: 4 })).toBe(4 + 10 + 5 + 5);
  });

  it('frustum: equals the difference of two cone lateral areas πrl (top 60 mm, bottom 100 mm, length 300 mm)', () => {
    // Extend the frustum to a cone: slant s = √(300² + 20²); big cone slant L = s × 50/20, small cone L − s.
    const s = Math.hypot(300, 20);
    const big = Math.PI * 50 * ((s * 50) / 20);
    const small = Math.PI * 30 * ((s * 50) / 20 - s);
    expect(frustumLateralArea(60, 100, 300)).toBeCloseTo(big - small, 6);
    expect(frustumLateralArea(100, 100, 300)).toBeCloseTo(Math.PI * 100 * 300, 9);
  });

  it('tapered square leg: four trapezoids with slant height', () => {
    const slant = Math.hypot(700, 10);
    expect(taperedLegArea(50, 30, 700)).toBeCloseTo(4 * 40 * slant, 9);
  });

  it('band is outline × height and edge strip length × width', () => {
    expect(shapeArea({ kind: 'band', outline: 4500, height: 330 })).toBe(1_485_000);
    expect(shapeArea({ kind: 'edge-strip', length: 6000, width: 20 })).toBe(120_000);
  });
});

describe('partArea', () => {
  const board = { kind: 'rectangle', length: 1000, width: 500 } as const;

  it('returns 0.5 m² for one face of a 1000 × 500 board and 1 m² for both', () => {
    expect(partArea(part(board)).areaM2).toBe(0.5);
    expect(partArea(part(board, { faces: 2 })).areaM2).toBe(1);
  });

  it('adds edges as thickness × perimeter: 20 mm × 3000 mm = 0.06 m²', () => {
    expect(partArea(part(board, { edges: true })).edgeAreaM2).toBeCloseTo(0.06, 12);
    expect(partArea(part(board, { edges: true })).areaM2).toBeCloseTo(0.56, 12);
  });

  it('takes cut-outs off each face and adds their edges', () => {
    const withHole = part(board, { faces: 2, edges: true, cutOuts: [{ kind: 'circle', diameter: 100, count: 2 }] });
    const hole = (Math.PI * 100 * 100) / 4;
    const a = partArea(withHole);
    expect(a.faceAreaM2).toBeCloseTo((500_000 - 2 * hole) / 1e6, 12);
    expect(a.edgeAreaM2).toBeCloseTo((20 * (3000 + 2 * Math.PI * 100)) / 1e6, 12);
    expect(a.cutOutsExceedFace).toBe(false);
  });

  it('never gives a negative face and flags cut-outs larger than the face', () => {
    const a = partArea(part(board, { cutOuts: [{ kind: 'rectangle', length: 2000, width: 500, count: 1 }] }));
    expect(a.faceAreaM2).toBe(0);
    expect(a.cutOutsExceedFace).toBe(true);
  });

  it('multiplies by the count', () => {
    expect(partArea(part(board, { count: 3 })).areaM2).toBeCloseTo(1.5, 12);
  });

  it('reads dimensions with units', () => {
    expect(resolveShape({ kind: 'rectangle', length: '40 in', width: '2 ft' }, 'mm')).toEqual({ kind: 'rectangle', length: 1016, width: 609.6 });
    expect(resolveShape({ kind: 'circle', diameter: 10 }, 'in')).toEqual({ kind: 'circle', diameter: 254 });
  });
});

describe('grand outline', () => {
  const L = 1905;
  const W = 1500;
  const outline = grandOutline(L, W);

  it('fills exactly the length and width', () => {
    const xs = outline.map((p) => p[0]);
    const ys = outline.map((p) => p[1]);
    expect(Math.min(...xs)).toBe(0);
    expect(Math.max(...xs)).toBeCloseTo(L, 9);
    expect(Math.min(...ys)).toBe(0);
    expect(Math.max(...ys)).toBeCloseTo(W, 9);
  });

  it('is a curve, not a rectangle: between half and nine tenths of length × width', () => {
    const ratio = polygonArea(outline) / (L * W);
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(0.9);
  });

  it('scales with length and width (area ∝ L × W)', () => {
    expect(polygonArea(grandOutline(2 * L, W))).toBeCloseTo(2 * polygonArea(outline), 6);
    expect(polygonArea(grandOutline(L, 3 * W))).toBeCloseTo(3 * polygonArea(outline), 6);
  });

  it('has a perimeter between that of the rectangle’s two long sides and the whole rectangle', () => {
    const p = polygonPerimeter(outline);
    expect(p).toBeGreaterThan(2 * L);
    expect(p).toBeLessThan(2 * (L + W));
  });
});

describe('resolveShape remembers lengths it has read', () => {
  it('gives the same millimetres the second time, per unit, and refuses a bad length every time', () => {
    const shape = { kind: 'rectangle', length: '6 ft 3 in', width: 12 } as const;
    const first = resolveShape(shape, 'in');
    expect(first).toEqual({ kind: 'rectangle', length: 1905, width: 304.8 }); // 75 in and 12 in at 25.4 mm (exact by definition)
    expect(resolveShape(shape, 'in')).toEqual(first);
    expect(resolveShape(shape, 'cm')).toEqual({ kind: 'rectangle', length: 1905, width: 120 });
    expect(() => resolveShape({ kind: 'circle', diameter: '3 furlongs' }, 'mm')).toThrow(/not a length unit/);
    expect(() => resolveShape({ kind: 'circle', diameter: '3 furlongs' }, 'mm')).toThrow(/not a length unit/);
    expect(() => resolveShape({ kind: 'polygon', points: [[0, 0], ['1 m', 0], [0, '1 m']] }, 'mm')).not.toThrow();
    expect(() => resolveShape({ kind: 'circle', diameter: 0 }, 'in')).toThrow();
  });
});
