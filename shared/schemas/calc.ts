/**
 * Input and result shapes of the estimator engine (shared/calc). The server validates requests with
 * EstimateInputSchema and turns the first issue into a 400 naming the field; the client uses the same schema.
 */
import { z } from 'zod';
import { DATE_RULES, dateOrDateTimeSchema } from './dates';
import { COMPLEXITIES, STAGE_KINDS, StageSchema } from './catalog';
import { LENGTH_UNITS, UNIT_SYSTEMS, UnitParseError, VOLUME_MEASURES, parseLength } from '../units';
import type { LengthUnit } from '../units';

/** Templates that generate a parts list, and the dimensions each one reads. */
export const TEMPLATE_DIMENSIONS = {
  grand: ['length', 'width', 'rimHeight'],
  upright: ['height', 'width', 'depth'],
  square: ['length', 'width', 'height'],
  table: ['length', 'width', 'height'],
  cabinet: ['height', 'width', 'depth'],
  chest: ['length', 'depth', 'height'],
} as const;
export type TemplateKey = keyof typeof TEMPLATE_DIMENSIONS;
export const TEMPLATE_KEYS = Object.keys(TEMPLATE_DIMENSIONS) as TemplateKey[];

/** The most parts one estimate may carry. */
export const MAX_PARTS = 500;

/**
 * A length: a number in the default length unit, or text with units ("190 cm", "6 ft 3 in"). Checked here for
 * form and gross size; checked again against the default unit by EstimateInputSchema.
 */
export const LengthSchema = z.union([
  z.number({ error: 'must be a length: a number or text such as "190 cm"' }).positive({ message: 'must be more than zero' }).max(100_000, { message: 'is longer than 100 m' }),
  z.string().min(1, { message: 'must not be empty' }).max(64, { message: 'is too long to be a length' }),
], { error: 'must be a length: a number or text such as "190 cm"' });
export type LengthInput = z.input<typeof LengthSchema>;

/** A coordinate of a polygon point: a length that may be zero. */
export const CoordinateSchema = z.union([
  z.number({ error: 'must be a coordinate' }).min(0, { message: 'cannot be negative' }).max(100_000, { message: 'is further than 100 m' }),
  z.string().min(1).max(64),
], { error: 'must be a coordinate: a number or text such as "30 cm"' });

const RectangleSchema = z.object({ kind: z.literal('rectangle'), length: LengthSchema, width: LengthSchema });
const TrapezoidSchema = z.object({ kind: z.literal('trapezoid'), top: LengthSchema, bottom: LengthSchema, height: LengthSchema });
const CircleSchema = z.object({ kind: z.literal('circle'), diameter: LengthSchema });
const EllipseSchema = z.object({ kind: z.literal('ellipse'), length: LengthSchema, width: LengthSchema });
const PolygonSchema = z.object({
  kind: z.literal('polygon'),
  points: z.array(z.tuple([CoordinateSchema, CoordinateSchema])).min(3, { message: 'needs at least 3 points' }).max(2000),
});
const BandSchema = z.object({ kind: z.literal('band'), outline: LengthSchema, height: LengthSchema });
const TurnedLegSchema = z.object({ kind: z.literal('turned-leg'), topDiameter: LengthSchema, bottomDiameter: LengthSchema, length: LengthSchema });
const TaperedLegSchema = z.object({ kind: z.literal('tapered-leg'), topSide: LengthSchema, bottomSide: LengthSchema, length: LengthSchema });
const EdgeStripSchema = z.object({ kind: z.literal('edge-strip'), length: LengthSchema, width: LengthSchema });

/** Shapes a part may take. All dimensions are lengths. */
export const ShapeSchema = z.discriminatedUnion('kind', [
  RectangleSchema, TrapezoidSchema, CircleSchema, EllipseSchema, PolygonSchema, BandSchema, TurnedLegSchema, TaperedLegSchema, EdgeStripSchema,
]);
export type ShapeInput = z.input<typeof ShapeSchema>;
export type ShapeKind = ShapeInput['kind'];

/** Shapes a cut-out may take, with how many such openings there are per face. */
export const CutOutSchema = z.discriminatedUnion('kind', [
  RectangleSchema.extend({ count: z.number().int().min(1).max(1000).default(1) }),
  CircleSchema.extend({ count: z.number().int().min(1).max(1000).default(1) }),
  EllipseSchema.extend({ count: z.number().int().min(1).max(1000).default(1) }),
  PolygonSchema.extend({ count: z.number().int().min(1).max(1000).default(1) }),
]);
export type CutOutInput = z.input<typeof CutOutSchema>;
/** Parsed (count filled in); `CutOut` is the engine's resolved opening (shared/calc/area.ts). */
export type ParsedCutOut = z.output<typeof CutOutSchema>;

/** One part of a piece, as the finisher measures it. */
export const PartSchema = z.object({
  id: z.string().min(1).max(64).optional(),
  name: z.string().min(1, { message: 'must not be empty' }).max(120),
  shape: ShapeSchema,
  /** Faces finished: one side or both. */
  faces: z.union([z.literal(1), z.literal(2)], { error: 'must be 1 or 2' }).default(1),
  /** Edges finished: their area is thickness × perimeter. */
  edges: z.boolean().default(false),
  thickness: LengthSchema.optional(),
  count: z.number({ error: 'must be a whole number' }).int({ message: 'must be a whole number' }).min(1).max(1000).default(1),
  cutOuts: z.array(CutOutSchema).max(50).default([]),
  species: z.string().max(64).optional(),
  veneered: z.boolean().default(false),
  complexity: z.enum(COMPLEXITIES).default('flat'),
  /** A show face: seen when the piece is in use (burnished and waxed). */
  show: z.boolean().default(true),
});
export type PartInput = z.input<typeof PartSchema>;
export type Part = z.infer<typeof PartSchema>;

const PartsListSchema = z
  .array(PartSchema)
  .min(1, { message: 'needs at least one part' })
  .max(MAX_PARTS, { message: `has more than ${MAX_PARTS} parts` });

/**
 * The case geometry: the measured shape the estimator works on (a template with its dimensions, or an explicit parts
 * list). Sent as `piece` in an estimate's input; "piece" alone means the customer's instrument (customers.ts).
 */
export const CaseGeometrySchema = z
  .object({
    template: z.enum(TEMPLATE_KEYS as [TemplateKey, ...TemplateKey[]]).optional(),
    dimensions: z.record(z.string(), LengthSchema).default({}),
    /** Species key for every generated part (template only). */
    species: z.string().max(64).optional(),
    /** Veneered or solid, for every generated part (template only). */
    veneered: z.boolean().optional(),
    parts: PartsListSchema.optional(),
  })
  .superRefine((p, ctx) => {
    if (p.template === undefined && p.parts === undefined) {
      ctx.addIssue({ code: 'custom', path: ['template'], message: 'give a template or a parts list' });
    }
    if (p.template !== undefined && p.parts !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['parts'], message: 'give a template or a parts list, not both' });
    }
    if (p.template !== undefined) {
      const known: readonly string[] = TEMPLATE_DIMENSIONS[p.template];
      for (const name of Object.keys(p.dimensions)) {
        if (!known.includes(name)) {
          ctx.addIssue({ code: 'custom', path: ['dimensions', name], message: `is not a dimension of a ${p.template}; expected ${known.join(', ')}` });
        }
      }
    }
  });

export type CaseGeometryInput = z.input<typeof CaseGeometrySchema>;
export type CaseGeometry = z.output<typeof CaseGeometrySchema>;

/** Workshop climate during the job. */
export const ClimateSchema = z.object({
  temperatureC: z.number({ error: 'must be a number of degrees Celsius' }).min(-20).max(50),
  humidityPct: z.number({ error: 'must be a percentage' }).min(0).max(100),
});
export type Climate = z.infer<typeof ClimateSchema>;

/** Local date or date-time, no time zone: 2025-03-14 or 2025-03-14T08:30. */
export const LocalDateTimeSchema = dateOrDateTimeSchema({ ...DATE_RULES.calcStart, seconds: true, example: '2025-03-14' });

type Path = Array<string | number>;

/**
 * Visits every length in an input, in order, for the check against the default unit. The path of a length is
 * only built when it is asked for (an issue to report): an input of hundreds of parts is read on every keystroke.
 */
function eachLength(
  input: {
    piece?: { dimensions: Record<string, LengthInput>; parts?: Part[] | undefined } | undefined;
    parts?: Part[] | undefined;
  },
  visit: (value: string | number, allowZero: boolean, path: () => Path) => void,
): void {
  const fromShape = (shape: Record<string, unknown>, path: () => Path): void => {
    for (const name in shape) {
      if (name === 'kind' || name === 'count') continue;
      const value = shape[name];
      if (name === 'points' && Array.isArray(value)) {
        for (let i = 0; i < value.length; i++) {
          const pt: unknown = value[i];
          if (!Array.isArray(pt)) continue;
          for (let j = 0; j < pt.length; j++) {
            const c: unknown = pt[j];
            if (typeof c === 'string' || typeof c === 'number') visit(c, true, () => [...path(), 'points', i, j]);
          }
        }
      } else if (typeof value === 'string' || typeof value === 'number') {
        visit(value, false, () => [...path(), name]);
      }
    }
  };
  const fromParts = (parts: Part[] | undefined, path: Path): void => {
    if (!parts) return;
    for (let i = 0; i < parts.length; i++) {
      const part = parts[i] as Part;
      fromShape(part.shape, () => [...path, i, 'shape']);
      if (part.thickness !== undefined) visit(part.thickness, false, () => [...path, i, 'thickness']);
      for (let j = 0; j < part.cutOuts.length; j++) fromShape(part.cutOuts[j] as Record<string, unknown>, () => [...path, i, 'cutOuts', j]);
    }
  };
  if (input.piece) {
    for (const [name, value] of Object.entries(input.piece.dimensions)) visit(value, false, () => ['piece', 'dimensions', name]);
    fromParts(input.piece.parts, ['piece', 'parts']);
  }
  fromParts(input.parts, ['parts']);
}

/** What the estimator is asked to price. Only the piece is required; everything else has a default. */
export const EstimateInputSchema = z
  .object({
    piece: CaseGeometrySchema.optional(),
    /** A parts list given at the top level instead of inside piece. */
    parts: PartsListSchema.optional(),
    system: z.string().regex(/^[a-z0-9][a-z0-9-]{0,63}$/, { message: 'must be a finishing-system key like "full-repolish"' }).default('full-repolish'),
    /** Stages to use instead of the system's own (an estimate copies the stages it uses). */
    stages: z.array(StageSchema).min(1).max(40).optional(),
    climate: ClimateSchema.optional(),
    startDate: LocalDateTimeSchema.optional(),
    discountPct: z.number({ error: 'must be a percentage' }).min(0).max(100).default(0),
    units: z.enum(UNIT_SYSTEMS).default('metric'),
    /** Imperial display: US or imperial (UK) pints and fluid ounces. */
    imperialVolumes: z.enum(VOLUME_MEASURES).default('us'),
    defaultLengthUnit: z.enum(LENGTH_UNITS).default('mm'),
  })
  .superRefine((input, ctx) => {
    if (!input.piece && !input.parts) ctx.addIssue({ code: 'custom', path: ['piece'], message: 'give a piece (template or parts list)' });
    if (input.piece && input.parts) ctx.addIssue({ code: 'custom', path: ['parts'], message: 'give the parts inside piece or at the top level, not both' });
    const unit: LengthUnit = input.defaultLengthUnit;
    const zeroAllowed = { allowZero: true };
    const zeroRefused = { allowZero: false };
    eachLength(input, (value, allowZero, path) => {
      if (typeof value === 'number') {
        // Numbers out of range have already been reported by the field's own schema; millimetres in range are
        // taken as they are.
        if (!((allowZero ? value >= 0 : value > 0) && value <= 100_000)) return;
        if (unit === 'mm' && !Object.is(value, -0)) return;
      }
      try {
        parseLength(value, unit, allowZero ? zeroAllowed : zeroRefused);
      } catch (error) {
        if (!(error instanceof UnitParseError)) throw error;
        ctx.addIssue({ code: 'custom', path: path(), message: error.message });
      }
    });
  });
export type EstimateInput = z.input<typeof EstimateInputSchema>;
export type ParsedEstimateInput = z.infer<typeof EstimateInputSchema>;

// ---------------------------------------------------------------------------------------------- results

/** A caution every estimate carries. */
export const CautionSchema = z.object({
  code: z.string(),
  severity: z.enum(['danger', 'warning', 'info']),
  text: z.string(),
});
export type Caution = z.infer<typeof CautionSchema>;

/** Something about this job the finisher should look at (climate, ventilation, discount...). */
export const WarningSchema = z.object({ code: z.string(), text: z.string() });
export type EstimateWarning = z.infer<typeof WarningSchema>;

export const PartResultSchema = z.object({
  id: z.string(),
  name: z.string(),
  shape: z.string(),
  count: z.number(),
  faces: z.number(),
  species: z.string(),
  pores: z.string(),
  complexity: z.enum(COMPLEXITIES),
  veneered: z.boolean(),
  show: z.boolean(),
  /** One face of one piece, cut-outs taken off. */
  faceAreaM2: z.number(),
  /** Finished edges of one piece. */
  edgeAreaM2: z.number(),
  /** All faces and edges of all pieces. */
  areaM2: z.number(),
});
export type PartResult = z.infer<typeof PartResultSchema>;

export const MaterialQuantitySchema = z.object({ material: z.string(), quantity: z.number(), unit: z.string() });

export const StageResultSchema = z.object({
  key: z.string(),
  kind: z.enum(STAGE_KINDS),
  name: z.string(),
  sessions: z.number(),
  coatsPerSession: z.number(),
  /** Shellac coats laid (0 for stages without shellac). */
  coats: z.number(),
  cutLb: z.number(),
  cutGPerL: z.number(),
  /** The gallon the cut is measured against. */
  cutBasis: z.enum(['us', 'uk']),
  areaM2: z.number(),
  polishL: z.number(),
  flakesG: z.number(),
  /** Spirit dissolving the flakes plus spirit used on its own. */
  spiritL: z.number(),
  materials: z.array(MaterialQuantitySchema),
  labourHours: z.number(),
  handsOnHoursPerSession: z.number(),
  restHours: z.number(),
});
export type StageResult = z.infer<typeof StageResultSchema>;

export const PackLineSchema = z.object({ size: z.number(), count: z.number(), price: z.string(), label: z.string().optional() });

export const MaterialResultSchema = z.object({
  key: z.string(),
  name: z.string(),
  supplier: z.string(),
  unit: z.string(),
  need: z.number(),
  packs: z.array(PackLineSchema),
  bought: z.number(),
  leftover: z.number(),
  packsCost: z.string(),
  usedCost: z.string(),
  charge: z.string(),
});
export type MaterialResult = z.infer<typeof MaterialResultSchema>;

export const SessionResultSchema = z.object({
  index: z.number(),
  stage: z.string(),
  stageKind: z.enum(STAGE_KINDS),
  session: z.number(),
  start: z.string(),
  end: z.string(),
  handsOnHours: z.number(),
  restHours: z.number(),
  restUntil: z.string(),
  /** Spirit evaporated in the session (solvent of the polish and spirit used on its own), litres. */
  spiritL: z.number(),
  segments: z.array(z.object({ start: z.string(), end: z.string() })),
});
export type SessionResult = z.infer<typeof SessionResultSchema>;

export const CalendarResultSchema = z.object({
  start: z.string(),
  end: z.string(),
  calendarDays: z.number(),
  restFactor: z.number(),
  sessions: z.array(SessionResultSchema),
  dryingRoom: z.object({ start: z.string(), end: z.string(), days: z.number() }),
});
export type CalendarResult = z.infer<typeof CalendarResultSchema>;

export const PriceLineSchema = z.object({ code: z.string(), label: z.string(), amount: z.string() });
export type PriceLine = z.infer<typeof PriceLineSchema>;

export const PriceResultSchema = z.object({
  currency: z.string(),
  lines: z.array(PriceLineSchema),
  net: z.string(),
  tax: z.string(),
  total: z.string(),
  deposit: z.string(),
  balance: z.string(),
  internal: z.object({ materialsCost: z.string(), labourCost: z.string(), materialsMarkup: z.string() }),
});
export type PriceResult = z.infer<typeof PriceResultSchema>;

export const VentilationResultSchema = z.object({
  roomVolumeM3: z.number(),
  airChangesPerHour: z.number(),
  mixingFactor: z.number(),
  worstSession: z.object({ index: z.number(), spiritL: z.number(), evaporationLPerMin: z.number() }),
  worstDay: z.object({ date: z.string(), spiritL: z.number() }),
  /** Spirit evaporated per working day, litres. */
  days: z.array(z.object({ date: z.string(), spiritL: z.number() })),
  /** Each solvent of the spirit in the busiest session, against its own limit (additive mixture rule). */
  components: z.array(z.object({
    solvent: z.string(),
    share: z.number(),
    evaporationLPerMin: z.number(),
    vapourM3h: z.number(),
    limitPpm: z.number(),
    requiredFlowM3h: z.number(),
    requiredFlowCfm: z.number(),
    concentrationPpm: z.number(),
  })),
  concentrationPpm: z.number(),
  /** Σ Cᵢ/Lᵢ at the room's air supply; above 1 the mixture is over its limit (OSHA 29 CFR 1910.1000(d)(2)). */
  exposureIndex: z.number(),
  mixtureLelPct: z.number(),
  quarterLelPpm: z.number(),
  exposureFlowM3h: z.number(),
  fireFlowM3h: z.number(),
  governs: z.enum(['exposure', 'fire']),
  requiredFlowM3h: z.number(),
  requiredFlowCfm: z.number(),
  suppliedFlowM3h: z.number(),
  adequate: z.boolean(),
  /** Stages whose own solvents (stripper, stain) the figure does not count; the cautions name them. */
  notCovered: z.array(z.object({ stage: z.string(), name: z.string(), materials: z.array(z.string()) })),
});
export type VentilationResult = z.infer<typeof VentilationResultSchema>;

export const TotalsSchema = z.object({
  areaM2: z.number(),
  coats: z.number(),
  labourHours: z.number(),
  flakesG: z.number(),
  spiritL: z.number(),
  calendarDays: z.number(),
  price: z.string(),
  currency: z.string(),
});

/** Everything the estimator returns; plain JSON. */
export const EstimateResultSchema = z.object({
  totals: TotalsSchema,
  cautions: z.array(CautionSchema).min(1),
  warnings: z.array(WarningSchema),
  display: z.object({
    units: z.enum(UNIT_SYSTEMS),
    area: z.string(),
    flakes: z.string(),
    spirit: z.string(),
    volumes: z.enum(VOLUME_MEASURES),
    /** The gallon the cuts are measured against. */
    gallon: z.enum(['us', 'uk']),
  }),
  system: z.string(),
  catalogVersion: z.string(),
  parts: z.array(PartResultSchema),
  stages: z.array(StageResultSchema),
  materials: z.array(MaterialResultSchema),
  labour: z.object({ hours: z.number(), rate: z.string(), perHour: z.string(), cost: z.string() }),
  calendar: CalendarResultSchema,
  price: PriceResultSchema,
  ventilation: VentilationResultSchema,
});
export type EstimateResult = z.infer<typeof EstimateResultSchema>;
