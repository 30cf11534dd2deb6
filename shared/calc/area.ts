/**
 * Surface areas of parts. Dimensions are millimetres inside; areas come out in mm² from the shape functions and
 * in m² from {@link partArea}.
 */
import { MAX_LENGTH_MM, parseLength } from '../units';
import type { LengthUnit } from '../units';
import type { Complexity } from '../schemas/catalog';
import type { ParsedCutOut, Part, ShapeInput } from '../schemas/calc';

/** A point in millimetres. */
export type Point = readonly [number, number];

/** A shape with every dimension in millimetres. */
export type Shape =
  | { kind: 'rectangle'; length: number; width: number }
  | { kind: 'trapezoid'; top: number; bottom: number; height: number }
  | { kind: 'circle'; diameter: number }
  | { kind: 'ellipse'; length: number; width: number }
  | { kind: 'polygon'; points: readonly Point[] }
  | { kind: 'band'; outline: number; height: number }
  | { kind: 'turned-leg'; topDiameter: number; bottomDiameter: number; length: number }
  | { kind: 'tapered-leg'; topSide: number; bottomSide: number; length: number }
  | { kind: 'edge-strip'; length: number; width: number };

/** A cut-out shape in millimetres with how many there are per face. */
export type CutOut = Extract<Shape, { kind: 'rectangle' | 'circle' | 'ellipse' | 'polygon' }> & { count: number };

/** A part with every length in millimetres and every default filled in. */
export interface ResolvedPart {
  id: string;
  name: string;
  shape: Shape;
  faces: 1 | 2;
  edges: boolean;
  thicknessMm: number;
  count: number;
  cutOuts: CutOut[];
  species: string;
  veneered: boolean;
  complexity: Complexity;
  show: boolean;
}

/** Areas of a part. */
export interface PartArea {
  /** One face of one piece, cut-outs taken off (never below zero). */
  faceAreaM2: number;
  /** Finished edges of one piece (outline and cut-out edges × thickness). */
  edgeAreaM2: number;
  /** All faces and edges of all pieces. */
  areaM2: number;
  /** The cut-outs leave no face (as large as the face or larger). */
  cutOutsExceedFace: boolean;
}

const MM2_PER_M2 = 1e6;

/**
 * Area of a simple polygon by the shoelace formula, in the square of the points' unit.
 *
 * @example polygonArea([[0, 0], [4, 0], [4, 3]]) // 6
 */
export function polygonArea(points: readonly Point[]): number {
  let twice = 0;
  for (let i = 0; i < points.length; i++) {
    const [x1, y1] = points[i] as Point;
    const [x2, y2] = points[(i + 1) % points.length] as Point;
    twice += x1 * y2 - x2 * y1;
  }
  return Math.abs(twice) / 2;
}

/**
 * Perimeter of a closed polygon.
 *
 * @example polygonPerimeter([[0, 0], [4, 0], [4, 3]]) // 12
 */
export function polygonPerimeter(points: readonly Point[]): number {
  let total = 0;
  for (let i = 0; i < points.length; i++) {
    const [x1, y1] = points[i] as Point;
    const [x2, y2] = points[(i + 1) % points.length] as Point;
    total += Math.hypot(x2 - x1, y2 - y1);
  }
  return total;
}

/**
 * Perimeter of an ellipse from its full axes, by Ramanujan's second approximation (error below 1e-9 of the
 * perimeter for workshop proportions; exact for a circle).
 *
 * @example ellipsePerimeter(2, 2) // 2π
 */
export function ellipsePerimeter(length: number, width: number): number {
  const a = length / 2;
  const b = width / 2;
  const h = ((a - b) * (a - b)) / ((a + b) * (a + b));
  return Math.PI * (a + b) * (1 + (3 * h) / (10 + Math.sqrt(4 - 3 * h)));
}

/**
 * Lateral area of a frustum of a cone (a turned leg): π (r1 + r2) × slant height.
 *
 * @example frustumLateralArea(100, 100, 10) // π·100·10, a cylinder of diameter 100
 */
export function frustumLateralArea(topDiameter: number, bottomDiameter: number, length: number): number {
  const r1 = topDiameter / 2;
  const r2 = bottomDiameter / 2;
  return Math.PI * (r1 + r2) * Math.hypot(length, r1 - r2);
}

/**
 * Area of the four faces of a square leg tapering from topSide to bottomSide over its length (each face an
 * isosceles trapezoid whose height is the face's slant height).
 *
 * @example taperedLegArea(50, 50, 100) // 4 × 50 × 100
 */
export function taperedLegArea(topSide: number, bottomSide: number, length: number): number {
  const slant = Math.hypot(length, (topSide - bottomSide) / 2);
  return 4 * ((topSide + bottomSide) / 2) * slant;
}

/**
 * Area of one face of a shape, mm².
 *
 * @example shapeArea({ kind: 'rectangle', length: 1000, width: 500 }) // 500000
 */
export function shapeArea(shape: Shape): number {
  switch (shape.kind) {
    case 'rectangle':
    case 'edge-strip':
      return shape.length * shape.width;
    case 'trapezoid':
      return ((shape.top + shape.bottom) / 2) * shape.height;
    case 'circle':
      return (Math.PI * shape.diameter * shape.diameter) / 4;
    case 'ellipse':
      return (Math.PI * shape.length * shape.width) / 4;
    case 'polygon':
      return polygonArea(shape.points);
    case 'band':
      return shape.outline * shape.height;
    case 'turned-leg':
      return frustumLateralArea(shape.topDiameter, shape.bottomDiameter, shape.length);
    case 'tapered-leg':
      return taperedLegArea(shape.topSide, shape.bottomSide, shape.length);
  }
}

/**
 * Length of the edges a shape has, mm: its outline; for a band its top and bottom edges; none for legs and
 * edge strips (an edge strip is itself an edge).
 *
 * @example shapePerimeter({ kind: 'rectangle', length: 1000, width: 500 }) // 3000
 */
export function shapePerimeter(shape: Shape): number {
  switch (shape.kind) {
    case 'rectangle':
      return 2 * (shape.length + shape.width);
    case 'trapezoid': {
      const leg = Math.hypot(shape.height, (shape.bottom - shape.top) / 2);
      return shape.top + shape.bottom + 2 * leg;
    }
    case 'circle':
      return Math.PI * shape.diameter;
    case 'ellipse':
      return ellipsePerimeter(shape.length, shape.width);
    case 'polygon':
      return polygonPerimeter(shape.points);
    case 'band':
      return 2 * shape.outline;
    case 'turned-leg':
    case 'tapered-leg':
    case 'edge-strip':
      return 0;
  }
}

/**
 * Areas of a part in m²: faces less cut-outs, plus edges when finished, times the count.
 *
 * @example partArea({ ...part, shape: { kind: 'rectangle', length: 1000, width: 500 }, faces: 2, count: 1 }).areaM2 // 1
 */
export function partArea(part: ResolvedPart): PartArea {
  let cutArea = 0;
  let cutEdges = 0;
  for (const cut of part.cutOuts) {
    cutArea += shapeArea(cut) * cut.count;
    cutEdges += shapePerimeter(cut) * cut.count;
  }
  const gross = shapeArea(part.shape);
  const face = Math.max(0, gross - cutArea);
  const edge = part.edges ? part.thicknessMm * (shapePerimeter(part.shape) + cutEdges) : 0;
  return {
    faceAreaM2: face / MM2_PER_M2,
    edgeAreaM2: edge / MM2_PER_M2,
    areaM2: ((face * part.faces + edge) * part.count) / MM2_PER_M2,
    cutOutsExceedFace: cutArea > 0 && cutArea >= gross,
  };
}

/** Default thickness of an edge when a part's edges are finished and no thickness is given (from memory). */
export const DEFAULT_THICKNESS_MM = 20;

/** Lengths already read, by unit, zero rule and text: parseLength is pure, and the same texts come back on every keystroke. */
const readLengths = new Map<string, number>();
const READ_LENGTHS_MAX = 4096;

/**
 * parseLength, remembered for text and for numbers in other units than mm (those go through unit conversion); for
 * engine use only (the public reader is parseLength).
 * Errors are not remembered: a bad length throws from parseLength itself every time.
 */
export function readLength(value: string | number, unit: LengthUnit, allowZero: boolean): number {
  if (typeof value === 'number') {
    // Millimetres in range are taken as they are, as parseLength takes them; anything else goes to it for its answer.
    if (unit === 'mm' && (allowZero ? value >= 0 : value > 0) && value <= MAX_LENGTH_MM) return value;
    if (unit === 'mm' || Object.is(value, -0)) return parseLength(value, unit, { allowZero });
  }
  const key = `${unit}|${allowZero ? 1 : 0}|${typeof value === 'number' ? 'n' : 's'}${value}`;
  const known = readLengths.get(key);
  if (known !== undefined) return known;
  const mm = parseLength(value, unit, { allowZero });
  if (readLengths.size >= READ_LENGTHS_MAX) readLengths.clear();
  readLengths.set(key, mm);
  return mm;
}

/**
 * Reads a shape's dimensions into millimetres.
 *
 * @example resolveShape({ kind: 'circle', diameter: '10 in' }, 'mm') // { kind: 'circle', diameter: 254 }
 */
export function resolveShape(shape: ShapeInput, unit: LengthUnit): Shape {
  const len = (v: string | number): number => readLength(v, unit, false);
  switch (shape.kind) {
    case 'rectangle':
      return { kind: 'rectangle', length: len(shape.length), width: len(shape.width) };
    case 'trapezoid':
      return { kind: 'trapezoid', top: len(shape.top), bottom: len(shape.bottom), height: len(shape.height) };
    case 'circle':
      return { kind: 'circle', diameter: len(shape.diameter) };
    case 'ellipse':
      return { kind: 'ellipse', length: len(shape.length), width: len(shape.width) };
    case 'polygon':
      return {
        kind: 'polygon',
        points: shape.points.map(([x, y]) => [readLength(x, unit, true), readLength(y, unit, true)] as const),
      };
    case 'band':
      return { kind: 'band', outline: len(shape.outline), height: len(shape.height) };
    case 'turned-leg':
      return { kind: 'turned-leg', topDiameter: len(shape.topDiameter), bottomDiameter: len(shape.bottomDiameter), length: len(shape.length) };
    case 'tapered-leg':
      return { kind: 'tapered-leg', topSide: len(shape.topSide), bottomSide: len(shape.bottomSide), length: len(shape.length) };
    case 'edge-strip':
      return { kind: 'edge-strip', length: len(shape.length), width: len(shape.width) };
  }
}

function resolveCutOut(cut: ParsedCutOut, unit: LengthUnit): CutOut {
  const { count, ...shape } = cut;
  return { ...(resolveShape(shape, unit) as Extract<Shape, { kind: CutOut['kind'] }>), count };
}

/**
 * Reads a validated part into millimetres, filling the species when the part names none.
 *
 * @example resolvePart(part, 'mm', 'mahogany', 0)
 */
export function resolvePart(part: Part, unit: LengthUnit, defaultSpecies: string, index: number): ResolvedPart {
  return {
    id: part.id ?? `part-${index + 1}`,
    name: part.name,
    shape: resolveShape(part.shape, unit),
    faces: part.faces,
    edges: part.edges,
    thicknessMm: part.thickness === undefined ? DEFAULT_THICKNESS_MM : readLength(part.thickness, unit, false),
    count: part.count,
    cutOuts: part.cutOuts.map((c) => resolveCutOut(c, unit)),
    species: part.species ?? defaultSpecies,
    veneered: part.veneered,
    complexity: part.complexity,
    show: part.show,
  };
}
