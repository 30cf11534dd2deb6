/**
 * The estimate editor's model: what the finisher types (text, so that half-typed numbers survive), turned into the
 * engine's EstimateInput on every change, and back again when an estimate is opened for a new revision.
 */
import { ZodError } from 'zod';
import { EstimateError, TEMPLATE_DEFAULTS, TEMPLATE_WOOD, templateParts } from '@shared/calc';
import type { Catalog, Complexity, Stage, AppliesTo } from '@shared/schemas/catalog';
import { TEMPLATE_DIMENSIONS, type EstimateInput, type PartInput, type ShapeInput, type ShapeKind, type TemplateKey } from '@shared/schemas/calc';
import type { Piece, PieceKind } from '@shared/schemas/customers';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { formatLength, type LengthUnit, type UnitSystem, type VolumeMeasure } from '@shared/units';
import { todayLocal } from '@/lib/format-figures';

/** Shapes a part may take, with the lengths each one needs, in the order they are asked for. */
export const SHAPE_FIELDS: Record<ShapeKind, { name: string; label: string }[]> = {
  rectangle: [{ name: 'length', label: 'Length' }, { name: 'width', label: 'Width' }],
  trapezoid: [{ name: 'top', label: 'Top' }, { name: 'bottom', label: 'Bottom' }, { name: 'height', label: 'Height' }],
  circle: [{ name: 'diameter', label: 'Diameter' }],
  ellipse: [{ name: 'length', label: 'Length' }, { name: 'width', label: 'Width' }],
  polygon: [],
  band: [{ name: 'outline', label: 'Outline' }, { name: 'height', label: 'Height' }],
  'turned-leg': [{ name: 'topDiameter', label: 'Top Ø' }, { name: 'bottomDiameter', label: 'Foot Ø' }, { name: 'length', label: 'Length' }],
  'tapered-leg': [{ name: 'topSide', label: 'Top side' }, { name: 'bottomSide', label: 'Foot side' }, { name: 'length', label: 'Length' }],
  'edge-strip': [{ name: 'length', label: 'Length' }, { name: 'width', label: 'Width' }],
};

export const SHAPE_LABELS: Record<ShapeKind, string> = {
  rectangle: 'Rectangle',
  trapezoid: 'Trapezoid',
  circle: 'Circle',
  ellipse: 'Ellipse',
  polygon: 'Outline (points)',
  band: 'Curved band (rim)',
  'turned-leg': 'Turned leg',
  'tapered-leg': 'Tapered square leg',
  'edge-strip': 'Edge strip',
};

export const CUT_OUT_KINDS = ['rectangle', 'circle', 'ellipse', 'polygon'] as const;
export type CutOutKind = (typeof CUT_OUT_KINDS)[number];

export const TEMPLATE_LABELS: Record<TemplateKey, string> = {
  grand: 'Grand piano',
  upright: 'Upright piano',
  square: 'Square piano',
  table: 'Table',
  cabinet: 'Cabinet',
  chest: 'Chest',
};

export const DIMENSION_LABELS: Record<string, string> = {
  length: 'Length',
  width: 'Width',
  height: 'Height',
  depth: 'Depth',
  rimHeight: 'Rim height',
};

export const COMPLEXITY_LABELS: Record<Complexity, string> = { flat: 'Flat', moulded: 'Moulded', carved: 'Carved', fretwork: 'Fretwork' };

export const APPLIES_TO_LABELS: Record<AppliesTo, string> = { all: 'All parts', 'open-pored': 'Open-pored wood only', 'show-faces': 'Show faces only' };

/** Templates that suit each kind of piece; the first is the usual one. */
export const TEMPLATES_FOR_KIND: Record<PieceKind, TemplateKey[]> = {
  grand: ['grand'],
  upright: ['upright'],
  square: ['square'],
  furniture: ['table', 'cabinet', 'chest'],
};

export interface CutOutDraft {
  key: string;
  kind: CutOutKind;
  dims: Record<string, string>;
  /** Outline points, one "x, y" pair a line (polygon only). */
  points: string;
  count: string;
}

export interface ShapeDraft {
  kind: ShapeKind;
  dims: Record<string, string>;
  /** Outline points, one "x, y" pair a line (polygon only). */
  points: string;
}

export interface PartDraft {
  /** React's key for the row; stable while the row lives. */
  key: string;
  id: string;
  name: string;
  shape: ShapeDraft;
  faces: 1 | 2;
  edges: boolean;
  thickness: string;
  count: string;
  cutOuts: CutOutDraft[];
  species: string;
  veneered: boolean;
  complexity: Complexity;
  show: boolean;
}

export const STAGE_NUMBERS = [
  'sessions', 'coatsPerSession', 'cutLb', 'restHours', 'labourMinPerM2PerCoat', 'setupMinPerSession', 'polishMlPerM2PerCoat', 'spiritMlPerM2PerSession',
] as const;
export type StageNumber = (typeof STAGE_NUMBERS)[number];

export const STAGE_NUMBER_LABELS: Record<StageNumber, { label: string; short: string; unit: string }> = {
  sessions: { label: 'Sessions', short: 'Sessions', unit: '' },
  coatsPerSession: { label: 'Coats per session', short: 'Coats each', unit: '' },
  cutLb: { label: 'Cut', short: 'Cut', unit: 'lb' },
  restHours: { label: 'Rest after each session', short: 'Rest', unit: 'h' },
  labourMinPerM2PerCoat: { label: 'Labour per m² per coat', short: 'Labour', unit: 'min/m²' },
  setupMinPerSession: { label: 'Set-up per session', short: 'Set-up', unit: 'min' },
  polishMlPerM2PerCoat: { label: 'Polish per m² per coat', short: 'Polish', unit: 'mL' },
  spiritMlPerM2PerSession: { label: 'Spirit per m² per session', short: 'Spirit', unit: 'mL' },
};

export interface StageDraft {
  key: string;
  base: Stage;
  enabled: boolean;
  appliesTo: AppliesTo;
  values: Record<StageNumber, string>;
}

export interface EstimateDraft {
  /** template: the piece from a template and its dimensions; parts: the parts table, edited freely. */
  mode: 'template' | 'parts';
  /** The unit a bare number means: the workshop's default for a new estimate, the revision's own when reopened. */
  lengthUnit: LengthUnit;
  /** Display units the estimate is saved with. */
  units: UnitSystem;
  imperialVolumes: VolumeMeasure;
  template: TemplateKey;
  dimensions: Record<string, string>;
  species: string;
  veneered: boolean;
  parts: PartDraft[];
  system: string;
  stages: StageDraft[];
  temperatureC: string;
  humidityPct: string;
  startDate: string;
  discountPct: string;
  title: string;
  note: string;
}

let seq = 0;
/** A fresh row key. */
export function rowKey(prefix = 'row'): string {
  seq += 1;
  return `${prefix}-${seq}`;
}

const text = (v: string | number | undefined): string => (v === undefined ? '' : String(v));

/** Reads typed text as a number; empty or malformed text becomes NaN so the schema names the field. */
export function toNumber(value: string): number {
  const t = value.trim();
  return t === '' ? Number.NaN : Number(t);
}

// ------------------------------------------------------------------------------------------------ parts

/** Polygon points as the editor shows them: one "x, y" pair a line. */
function pointsText(points: ReadonlyArray<readonly [string | number, string | number]>): string {
  return points.map(([x, y]) => `${text(x)}, ${text(y)}`).join('\n');
}

/** Reads the points typed, one "x, y" pair a line. */
function readPoints(points: string): [string, string][] {
  return points
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l !== '')
    .map((l): [string, string] => {
      const [x = '', y = ''] = l.split(/[,;\t]/).map((s) => s.trim());
      return [x, y];
    });
}

export function shapeDraft(shape: ShapeInput): ShapeDraft {
  if (shape.kind === 'polygon') return { kind: 'polygon', dims: {}, points: pointsText(shape.points) };
  const dims: Record<string, string> = {};
  for (const f of SHAPE_FIELDS[shape.kind]) dims[f.name] = text((shape as Record<string, string | number | undefined>)[f.name]);
  return { kind: shape.kind, dims, points: '' };
}

export function partDraft(part: PartInput): PartDraft {
  return {
    key: rowKey('part'),
    id: part.id ?? '',
    name: part.name,
    shape: shapeDraft(part.shape),
    faces: part.faces === 2 ? 2 : 1,
    edges: part.edges ?? false,
    thickness: text(part.thickness),
    count: text(part.count ?? 1),
    // Every cut-out kind the schema knows is kept, outlines (polygons) included.
    cutOuts: (part.cutOuts ?? []).map((c) => {
      if (c.kind === 'polygon') return { key: rowKey('cut'), kind: 'polygon', dims: {}, points: pointsText(c.points), count: text(c.count ?? 1) };
      const dims: Record<string, string> = {};
      for (const f of SHAPE_FIELDS[c.kind]) dims[f.name] = text((c as Record<string, string | number | undefined>)[f.name]);
      return { key: rowKey('cut'), kind: c.kind, dims, points: '', count: text(c.count ?? 1) };
    }),
    species: part.species ?? '',
    veneered: part.veneered ?? false,
    complexity: part.complexity ?? 'flat',
    show: part.show ?? true,
  };
}

/** A new, empty part of the given species. */
export function blankPart(species: string): PartDraft {
  return partDraft({ name: 'New part', shape: { kind: 'rectangle', length: '', width: '' }, species, faces: 1, count: 1 });
}

/** A copy of a row with a new id, so both can be told apart in comparisons. */
export function duplicatePart(part: PartDraft, existingIds: readonly string[]): PartDraft {
  const base = part.id || 'part';
  let n = 2;
  while (existingIds.includes(`${base}-${n}`)) n += 1;
  return {
    ...structuredClone(part),
    key: rowKey('part'),
    id: `${base}-${n}`,
    name: `${part.name} (copy)`,
    cutOuts: part.cutOuts.map((c) => ({ ...c, dims: { ...c.dims }, key: rowKey('cut') })),
  };
}

export function setShapeKind(shape: ShapeDraft, kind: ShapeKind): ShapeDraft {
  const dims: Record<string, string> = {};
  for (const f of SHAPE_FIELDS[kind]) dims[f.name] = shape.dims[f.name] ?? '';
  return { kind, dims, points: shape.points };
}

function buildShape(shape: ShapeDraft): ShapeInput {
  if (shape.kind === 'polygon') return { kind: 'polygon', points: readPoints(shape.points) };
  const out: Record<string, string> = {};
  for (const f of SHAPE_FIELDS[shape.kind]) out[f.name] = shape.dims[f.name] ?? '';
  return { kind: shape.kind, ...out } as ShapeInput;
}

export function buildPart(p: PartDraft): PartInput {
  return {
    ...(p.id ? { id: p.id } : {}),
    name: p.name,
    shape: buildShape(p.shape),
    faces: p.faces,
    edges: p.edges,
    ...(p.edges && p.thickness.trim() !== '' ? { thickness: p.thickness } : {}),
    count: toNumber(p.count),
    cutOuts: p.cutOuts.map((c) => {
      if (c.kind === 'polygon') return { kind: 'polygon', points: readPoints(c.points), count: toNumber(c.count) };
      const out: Record<string, string> = {};
      for (const f of SHAPE_FIELDS[c.kind]) out[f.name] = c.dims[f.name] ?? '';
      return { kind: c.kind, ...out, count: toNumber(c.count) } as NonNullable<PartInput['cutOuts']>[number];
    }),
    ...(p.species ? { species: p.species } : {}),
    veneered: p.veneered,
    complexity: p.complexity,
    show: p.show,
  };
}

/**
 * Engine parts built from draft parts, by the draft part's object. The parts table replaces a part it changes and
 * keeps the others, so an unchanged part gives the same input object on every keystroke and the engine takes what it
 * checked and measured of it before (shared/calc/parse-input.ts). A part changed in place would still be checked
 * again there: the engine compares each remembered part with a copy of it.
 */
const builtParts = new WeakMap<PartDraft, PartInput>();

function builtPart(p: PartDraft): PartInput {
  let built = builtParts.get(p);
  if (!built) {
    built = buildPart(p);
    builtParts.set(p, built);
  }
  return built;
}

// ------------------------------------------------------------------------------------------------ stages

export function stageDraft(stage: Stage): StageDraft {
  const values = {} as Record<StageNumber, string>;
  for (const k of STAGE_NUMBERS) values[k] = String(stage[k]);
  return { key: stage.key, base: stage, enabled: stage.enabled, appliesTo: stage.appliesTo, values };
}

export function buildStage(s: StageDraft): Stage {
  const out: Stage = { ...s.base, enabled: s.enabled, appliesTo: s.appliesTo };
  for (const k of STAGE_NUMBERS) out[k] = toNumber(s.values[k]);
  return out;
}

export function systemStages(catalog: Catalog, systemKey: string): StageDraft[] {
  const system = catalog.systems.find((s) => s.key === systemKey) ?? catalog.systems[0];
  return (system?.stages ?? []).map((s) => stageDraft(structuredClone(s)));
}

// ------------------------------------------------------------------------------------------------ input

/**
 * The engine input for a draft. Bare numbers mean the draft's own length unit (the revision's when it was reopened),
 * whatever the workshop's default is now: input → draft → input is the identity.
 */
export function buildInput(d: EstimateDraft): EstimateInput {
  const dimensions: Record<string, string> = {};
  for (const name of TEMPLATE_DIMENSIONS[d.template]) {
    const v = (d.dimensions[name] ?? '').trim();
    if (v !== '') dimensions[name] = v;
  }
  return {
    piece:
      d.mode === 'template'
        ? { template: d.template, dimensions, ...(d.species ? { species: d.species } : {}), veneered: d.veneered }
        : { parts: d.parts.map(builtPart) },
    system: d.system,
    stages: d.stages.map(buildStage),
    climate: { temperatureC: toNumber(d.temperatureC), humidityPct: toNumber(d.humidityPct) },
    ...(d.startDate.trim() !== '' ? { startDate: d.startDate.trim() } : {}),
    discountPct: d.discountPct.trim() === '' ? 0 : toNumber(d.discountPct),
    units: d.units,
    imperialVolumes: d.imperialVolumes,
    defaultLengthUnit: d.lengthUnit,
  };
}

/** The template that suits a piece of this kind. */
export function templateFor(kind: PieceKind): TemplateKey {
  return TEMPLATES_FOR_KIND[kind][0]!;
}

/** Placeholder text for a dimension left empty: the template's default. */
export function defaultDimension(template: TemplateKey, name: string, units: 'metric' | 'imperial'): string {
  const mm = TEMPLATE_DEFAULTS[template][name];
  return mm === undefined ? '' : formatLength(mm, units);
}

/** A first draft for a piece: its template, the dimensions recorded on the piece, the usual system. */
export function newDraft(piece: Pick<Piece, 'kind' | 'dimensions' | 'description'>, catalog: Catalog, settings: WorkshopSettings, template: TemplateKey = templateFor(piece.kind)): EstimateDraft {
  const system = catalog.systems.some((s) => s.key === 'full-repolish') ? 'full-repolish' : catalog.systems[0]!.key;
  const dims: Record<string, string> = {};
  for (const name of TEMPLATE_DIMENSIONS[template]) dims[name] = piece.dimensions[name] ?? '';
  return {
    mode: 'template',
    lengthUnit: settings.defaultLengthUnit,
    units: settings.units,
    imperialVolumes: settings.imperialVolumes ?? 'us',
    template,
    dimensions: dims,
    species: TEMPLATE_WOOD[template].species,
    veneered: TEMPLATE_WOOD[template].veneered,
    parts: [],
    system,
    stages: systemStages(catalog, system),
    temperatureC: String(settings.dryingRoom.temperatureC),
    humidityPct: String(settings.dryingRoom.humidityPct),
    startDate: todayLocal(),
    discountPct: '0',
    title: piece.description,
    note: '',
  };
}

/** A draft from a saved revision's input, to start the next revision from. */
export function draftFromInput(input: EstimateInput, catalog: Catalog, settings: WorkshopSettings, title: string): EstimateDraft {
  const piece = input.piece;
  const template: TemplateKey = piece?.template ?? 'table';
  const parts = piece?.parts ?? input.parts;
  const dims: Record<string, string> = {};
  for (const name of TEMPLATE_DIMENSIONS[template]) dims[name] = text(piece?.dimensions?.[name]);
  const system = input.system ?? 'full-repolish';
  return {
    mode: piece?.template ? 'template' : 'parts',
    // The revision's own units: a bare "75" saved in inches stays 75 in after the workshop moves to millimetres.
    lengthUnit: input.defaultLengthUnit ?? 'mm',
    units: input.units ?? settings.units,
    imperialVolumes: input.imperialVolumes ?? settings.imperialVolumes ?? 'us',
    template,
    dimensions: dims,
    species: piece?.species ?? TEMPLATE_WOOD[template].species,
    veneered: piece?.veneered ?? TEMPLATE_WOOD[template].veneered,
    parts: (parts ?? []).map(partDraft),
    system,
    stages: input.stages ? input.stages.map((s) => stageDraft({ enabled: true, appliesTo: 'all', firstCoats: false, veneerCare: false, materials: [], ...s } as Stage)) : systemStages(catalog, system),
    temperatureC: text(input.climate?.temperatureC ?? settings.dryingRoom.temperatureC),
    humidityPct: text(input.climate?.humidityPct ?? settings.dryingRoom.humidityPct),
    startDate: input.startDate ?? '',
    discountPct: text(input.discountPct ?? 0),
    title,
    note: '',
  };
}

/**
 * The parts a template generates, as editable rows. Throws when a dimension cannot be read (the caller shows the
 * message beside that dimension).
 */
export function partsFromTemplate(d: Pick<EstimateDraft, 'template' | 'dimensions' | 'species' | 'veneered'>, unit: LengthUnit): PartDraft[] {
  const dims: Record<string, string> = {};
  for (const [k, v] of Object.entries(d.dimensions)) if (v.trim() !== '') dims[k] = v;
  return templateParts(d.template, dims, unit, { species: d.species || undefined, veneered: d.veneered }).map(partDraft);
}

// ------------------------------------------------------------------------------------------------ errors

/** Messages by field path ("piece.dimensions.length", "piece.parts.3.count") from what the engine threw. */
export function errorsByPath(error: unknown): Record<string, string> {
  if (error instanceof ZodError) {
    const out: Record<string, string> = {};
    for (const issue of error.issues) out[issue.path.map(String).join('.')] ??= shorten(issue.message);
    return out;
  }
  if (error instanceof EstimateError) return { [error.path.map(String).join('.')]: error.message };
  if (error instanceof Error) return { '': error.message };
  return { '': String(error) };
}

/** A length message without its long list of examples: the field's own hint gives them. */
function shorten(message: string): string {
  const m = /^Cannot read "(.*)" as a length: (.*?); expected .*$/s.exec(message);
  return m ? `Cannot read "${m[1]}" as a length: ${m[2]}.` : message;
}

/** The message for a field, or for anything under it (a part row collects its shape's messages). */
export function messageAt(errors: Record<string, string>, path: string, { under = false }: { under?: boolean } = {}): string | undefined {
  if (errors[path] !== undefined) return errors[path];
  if (!under) return undefined;
  const key = Object.keys(errors).find((k) => k.startsWith(`${path}.`));
  return key === undefined ? undefined : errors[key];
}

/** Friendly words for a field path, for messages that cannot sit beside a field. */
export function describePath(path: string, d: EstimateDraft): string {
  const parts = path.split('.');
  if (parts[0] === 'piece' && parts[1] === 'parts' && parts[2] !== undefined) {
    const row = d.parts[Number(parts[2])];
    return `Part ${Number(parts[2]) + 1}${row ? ` (${row.name})` : ''}: ${parts.slice(3).join(' ')}`;
  }
  if (parts[0] === 'stages' && parts[1] !== undefined) {
    const row = d.stages[Number(parts[1])];
    return `Stage ${row?.base.name ?? Number(parts[1]) + 1}: ${parts.slice(2).join(' ')}`;
  }
  return path === '' ? 'Estimate' : parts.join(' ');
}
