/**
 * Parametric templates: a full, editable parts list for a grand, an upright, a square piano and plain
 * furniture, from a few dimensions. Lengths in the generated parts are written as millimetre text ("1905 mm") so
 * that the list means the same whatever the workshop's default unit.
 *
 * Proportions of the small parts (legs, fall board, music desk...) are typical sizes "from memory" and are
 * meant to be edited.
 */
import type { LengthUnit } from '../units';
import type { Complexity } from '../schemas/catalog';
import type { LengthInput, Part, ShapeInput, TemplateKey } from '../schemas/calc';
import { polygonPerimeter, readLength } from './area';
import type { Point } from './area';

/**
 * Default dimensions per template, mm. Grand: 6 ft 3 in, a medium grand (Piano Buyer), width about 5 ft (Blue Book of
 * Pianos), rim about 33 cm (from memory). Upright: 1300 mm (51 in), a full upright, which the Blue Book of Pianos puts
 * over 50 in; width about 5 ft, depth 2 ft (Blue Book of Pianos).
 */
export const TEMPLATE_DEFAULTS: Readonly<Record<TemplateKey, Readonly<Record<string, number>>>> = {
  grand: { length: 1905, width: 1500, rimHeight: 330 },
  upright: { height: 1300, width: 1500, depth: 620 },
  square: { length: 1700, width: 780, height: 880 },
  table: { length: 1500, width: 900, height: 750 },
  cabinet: { height: 1000, width: 900, depth: 450 },
  chest: { length: 1000, depth: 500, height: 500 },
};

/** Species and veneer each template assumes unless told otherwise (common practice for the period pieces). */
export const TEMPLATE_WOOD: Readonly<Record<TemplateKey, { species: string; veneered: boolean }>> = {
  grand: { species: 'mahogany', veneered: true },
  upright: { species: 'walnut', veneered: true },
  square: { species: 'rosewood', veneered: true },
  table: { species: 'mahogany', veneered: false },
  cabinet: { species: 'walnut', veneered: true },
  chest: { species: 'oak', veneered: false },
};

/** Options applied to every generated part. */
export interface TemplateOptions {
  species?: string | undefined;
  veneered?: boolean | undefined;
}

/** Millimetres to a micrometre: the generated parts' lengths. */
function mm(value: number): number {
  return Math.round(value * 1000) / 1000;
}

/** Writes generated millimetres (already to a micrometre) as text. */
function mmText(value: number): string {
  return `${value} mm`;
}

/** A generated shape with its lengths written as millimetre text, fields in the same order. */
function shapeText(shape: ShapeInput): ShapeInput {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(shape)) {
    if (key === 'kind') out[key] = value;
    else if (key === 'points') out[key] = (value as Array<[number, number]>).map(([x, y]) => [mmText(x), mmText(y)]);
    else out[key] = mmText(value as number);
  }
  return out as ShapeInput;
}

/** Proportions of the grand outline (of the author's design, not any maker's scale). */
export const GRAND_OUTLINE = {
  /** Straight treble side behind the keyboard, as a share of length. */
  trebleStraight: 0.16,
  /** Width of the tail as a share of width. */
  tailWidth: 0.36,
  /** Depth of the rounded tail as a share of length. */
  tailDepth: 0.11,
  /** Points per curve. */
  samples: 24,
} as const;

/** 3t² − 2t³: a smooth S from 0 to 1 with level ends, so the bentside meets cheek and tail without a kink. */
function smoothstep(t: number): number {
  return t * t * (3 - 2 * t);
}

/**
 * The outline of a grand case seen from above, mm, counter-clockwise from the bass corner of the keyboard end:
 * straight spine along y = 0; a half-ellipse tail; an S-shaped bentside (smoothstep) rising from the tail to the
 * full width; a short straight treble side; and the straight keyboard end at x = 0. It fills exactly length ×
 * width.
 *
 * @example grandOutline(1905, 1500).length // 2 × 24 + 4 points
 */
export function grandOutline(lengthMm: number, widthMm: number): Point[] {
  const { trebleStraight, tailWidth, tailDepth, samples } = GRAND_OUTLINE;
  const x0 = trebleStraight * lengthMm;
  const rt = tailDepth * lengthMm;
  const wt = tailWidth * widthMm;
  const tailStart = lengthMm - rt;
  const points: Point[] = [[0, 0], [tailStart, 0]];
  for (let i = 1; i < samples; i++) {
    const theta = -Math.PI / 2 + (Math.PI * i) / samples;
    points.push([tailStart + rt * Math.cos(theta), wt / 2 + (wt / 2) * Math.sin(theta)]);
  }
  points.push([tailStart, wt]);
  for (let i = 1; i < samples; i++) {
    const t = i / samples;
    points.push([tailStart - t * (tailStart - x0), wt + (widthMm - wt) * smoothstep(t)]);
  }
  points.push([x0, widthMm], [0, widthMm]);
  return points;
}

interface PartSpec {
  id: string;
  name: string;
  shape: ShapeInput;
  faces?: 1 | 2;
  edges?: boolean;
  thickness?: number;
  count?: number;
  complexity?: Complexity;
  show?: boolean;
}

function part(spec: PartSpec, wood: { species: string; veneered: boolean }, write: (mm: number) => LengthInput): Part {
  // Fields in the order the parts list has always shown them, the thickness only when the part has one.
  const out = { id: spec.id, name: spec.name, shape: spec.shape, faces: spec.faces ?? 1, edges: spec.edges ?? false } as Part;
  if (spec.thickness !== undefined) out.thickness = write(mm(spec.thickness));
  out.count = spec.count ?? 1;
  out.cutOuts = [];
  out.species = wood.species;
  out.veneered = wood.veneered;
  out.complexity = spec.complexity ?? 'flat';
  out.show = spec.show ?? true;
  return out;
}

/** The smallest generated dimension, so that a very small piece still gives a valid parts list. */
const MIN_GENERATED_MM = 10;

const rect = (length: number, width: number): ShapeInput => ({
  kind: 'rectangle',
  length: mm(Math.max(MIN_GENERATED_MM, length)),
  width: mm(Math.max(MIN_GENERATED_MM, width)),
});

function grandParts(d: Record<string, number>): PartSpec[] {
  const L = d.length as number;
  const W = d.width as number;
  const H = d.rimHeight as number;
  const outline = grandOutline(L, W);
  const perimeter = polygonPerimeter(outline);
  const rimLength = perimeter - W; // the keyboard end is open
  const polygon: ShapeInput = { kind: 'polygon', points: outline.map(([x, y]) => [mm(x), mm(y)]) };
  const keyboard = 0.82 * W;
  return [
    { id: 'lid-top', name: 'Lid, top', shape: polygon },
    { id: 'lid-underside', name: 'Lid, underside', shape: polygon },
    { id: 'lid-edge', name: 'Lid edge', shape: { kind: 'edge-strip', length: mm(perimeter), width: mm(20) } },
    { id: 'rim-outside', name: 'Rim, outside', shape: { kind: 'band', outline: mm(rimLength), height: mm(H) } },
    { id: 'rim-inside', name: 'Rim, inside (above the soundboard)', shape: { kind: 'band', outline: mm(rimLength), height: mm(0.5 * H) }, show: false },
    { id: 'rim-capping', name: 'Rim capping', shape: { kind: 'edge-strip', length: mm(rimLength), width: mm(45) } },
    { id: 'fall-board', name: 'Fall board', shape: rect(keyboard, 160), faces: 2, edges: true, thickness: 20 },
    { id: 'music-desk', name: 'Music desk', shape: rect(0.55 * W, 280), faces: 2, edges: true, thickness: 18, complexity: 'moulded' },
    { id: 'key-slip', name: 'Key slip', shape: rect(keyboard, 60), edges: true, thickness: 20 },
    { id: 'key-cheeks', name: 'Key cheeks', shape: rect(320, 150), faces: 2, edges: true, thickness: 40, count: 2, complexity: 'moulded' },
    { id: 'legs', name: 'Legs', shape: { kind: 'turned-leg', topDiameter: mm(120), bottomDiameter: mm(85), length: mm(620) }, count: 3, complexity: 'moulded' },
    { id: 'lyre', name: 'Lyre', shape: rect(300, 480), faces: 2, complexity: 'carved' },
    { id: 'pedal-box', name: 'Pedal box', shape: rect(350, 110), faces: 2, edges: true, thickness: 60, complexity: 'moulded' },
  ];
}

function uprightParts(d: Record<string, number>): PartSpec[] {
  const H = d.height as number;
  const W = d.width as number;
  const D = d.depth as number;
  const keybed = 0.58 * H; // key level as a share of height (from memory: keys about 72 cm up)
  return [
    { id: 'top', name: 'Top lid', shape: rect(W, D - 60), edges: true, thickness: 22 },
    { id: 'sides', name: 'Sides', shape: rect(H, D), edges: true, thickness: 25, count: 2 },
    { id: 'upper-panel', name: 'Upper front panel', shape: rect(W - 100, H - keybed - 180), complexity: 'moulded' },
    { id: 'music-desk', name: 'Music desk', shape: rect(0.5 * W, 180), faces: 2, complexity: 'moulded' },
    { id: 'fall-board', name: 'Fall board', shape: rect(W - 100, 150), faces: 2, edges: true, thickness: 20 },
    { id: 'key-slip', name: 'Key slip', shape: rect(W - 100, 60), edges: true, thickness: 20 },
    { id: 'key-cheeks', name: 'Key cheeks', shape: rect(300, 120), faces: 2, count: 2, complexity: 'moulded' },
    { id: 'lower-panel', name: 'Lower front panel', shape: rect(W - 100, keybed - 180) },
    { id: 'toe-blocks', name: 'Toe blocks and legs', shape: rect(600, 120), faces: 2, edges: true, thickness: 60, count: 2, complexity: 'moulded' },
    { id: 'plinth', name: 'Plinth', shape: { kind: 'edge-strip', length: mm(W + 2 * D), width: mm(80) } },
  ];
}

function squareParts(d: Record<string, number>): PartSpec[] {
  const L = d.length as number;
  const W = d.width as number;
  const H = d.height as number;
  const caseDepth = 0.33 * H;
  return [
    { id: 'lid-top', name: 'Lid, top', shape: rect(L, W), edges: true, thickness: 20 },
    { id: 'lid-underside', name: 'Lid, underside', shape: rect(L, W) },
    { id: 'case-sides', name: 'Case sides', shape: { kind: 'band', outline: mm(2 * (L + W)), height: mm(caseDepth) }, complexity: 'moulded' },
    { id: 'name-board', name: 'Name board', shape: rect(0.6 * L, 120), faces: 2, complexity: 'moulded' },
    { id: 'legs', name: 'Legs', shape: { kind: 'turned-leg', topDiameter: mm(110), bottomDiameter: mm(70), length: mm(Math.max(MIN_GENERATED_MM, H - caseDepth)) }, count: 4, complexity: 'moulded' },
  ];
}

function tableParts(d: Record<string, number>): PartSpec[] {
  const L = d.length as number;
  const W = d.width as number;
  const H = d.height as number;
  return [
    { id: 'top', name: 'Top', shape: rect(L, W), edges: true, thickness: 25 },
    { id: 'apron', name: 'Apron', shape: { kind: 'band', outline: mm(Math.max(MIN_GENERATED_MM, 2 * (L + W) - 400)), height: mm(100) } },
    { id: 'legs', name: 'Legs', shape: { kind: 'tapered-leg', topSide: mm(55), bottomSide: mm(35), length: mm(Math.max(MIN_GENERATED_MM, H - 25)) }, count: 4 },
  ];
}

function cabinetParts(d: Record<string, number>): PartSpec[] {
  const H = d.height as number;
  const W = d.width as number;
  const D = d.depth as number;
  return [
    { id: 'top', name: 'Top', shape: rect(W, D), edges: true, thickness: 25 },
    { id: 'sides', name: 'Sides', shape: rect(H, D), count: 2 },
    { id: 'doors', name: 'Doors', shape: rect(H - 120, W / 2), faces: 2, edges: true, thickness: 20, count: 2, complexity: 'moulded' },
    { id: 'plinth', name: 'Plinth', shape: { kind: 'edge-strip', length: mm(W + 2 * D), width: mm(100) }, complexity: 'moulded' },
  ];
}

function chestParts(d: Record<string, number>): PartSpec[] {
  const L = d.length as number;
  const D = d.depth as number;
  const H = d.height as number;
  return [
    { id: 'lid', name: 'Lid', shape: rect(L, D), faces: 2, edges: true, thickness: 22 },
    { id: 'front-back', name: 'Front and back', shape: rect(L, H), count: 2 },
    { id: 'ends', name: 'Ends', shape: rect(D, H), count: 2 },
    { id: 'plinth', name: 'Plinth', shape: { kind: 'edge-strip', length: mm(2 * (L + D)), width: mm(80) }, complexity: 'moulded' },
  ];
}

const GENERATORS: Readonly<Record<TemplateKey, (d: Record<string, number>) => PartSpec[]>> = {
  grand: grandParts,
  upright: uprightParts,
  square: squareParts,
  table: tableParts,
  cabinet: cabinetParts,
  chest: chestParts,
};

/**
 * Reads a template's dimensions into millimetres, filling defaults for those left out.
 *
 * @example templateDimensions('grand', { length: '6 ft 3 in' }, 'mm') // { length: 1905, width: 1500, rimHeight: 330 }
 */
export function templateDimensions(template: TemplateKey, given: Readonly<Record<string, LengthInput>>, unit: LengthUnit): Record<string, number> {
  const dims: Record<string, number> = { ...TEMPLATE_DEFAULTS[template] };
  for (const name of Object.keys(dims)) {
    const value = given[name];
    if (value !== undefined) dims[name] = readLength(value, unit, false);
  }
  return dims;
}

/**
 * Generates the editable parts list of a template.
 *
 * @example templateParts('grand', { length: '6 ft 3 in' }).map((p) => p.id) // ['lid-top', 'lid-underside', ...]
 */
export function templateParts(
  template: TemplateKey,
  dimensions: Readonly<Record<string, LengthInput>> = {},
  unit: LengthUnit = 'mm',
  options: TemplateOptions = {},
): Part[] {
  const dims = templateDimensions(template, dimensions, unit);
  const wood = {
    species: options.species ?? TEMPLATE_WOOD[template].species,
    veneered: options.veneered ?? TEMPLATE_WOOD[template].veneered,
  };
  return GENERATORS[template](dims).map((spec) => part({ ...spec, shape: shapeText(spec.shape) }, wood, mmText));
}

/**
 * The same parts as {@link templateParts} from dimensions already in millimetres, with every length a number of
 * millimetres (to a micrometre) instead of text: what the engine reads, with the default length unit taken as mm.
 * The numbers are those templateParts writes as text, so reading either gives the same millimetres.
 */
export function templatePartsMm(template: TemplateKey, dims: Record<string, number>, options: TemplateOptions = {}): Part[] {
  const wood = {
    species: options.species ?? TEMPLATE_WOOD[template].species,
    veneered: options.veneered ?? TEMPLATE_WOOD[template].veneered,
  };
  return GENERATORS[template](dims).map((spec) => part(spec, wood, (n) => n));
}
