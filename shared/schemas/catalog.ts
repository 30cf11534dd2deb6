/**
 * The catalog the estimator reads: species, finishing systems and their stages, materials with packs and prices,
 * labour rates, pricing settings, the working calendar, room and spirit for the safety check.
 *
 * The engine holds no prices: everything priced arrives here. The server reads it from the database; the demo
 * data lives in shared/calc/presets and tests/fixtures/catalog.ts.
 */
import { z } from 'zod';
import { DATE_RULES, dateSchema } from './dates';

/** Stage kinds of a French-polishing schedule, in their usual order. */
export const STAGE_KINDS = [
  'strip', 'prepare', 'stain', 'grain-fill', 'fad', 'body', 'stiffen', 'spirit-off', 'cut-back', 'burnish', 'wax',
] as const;
export type StageKind = (typeof STAGE_KINDS)[number];

/** Which parts a stage works on. */
export const APPLIES_TO = ['all', 'open-pored', 'show-faces'] as const;
export type AppliesTo = (typeof APPLIES_TO)[number];

/** How worked a part's surface is; multiplies labour and material. */
export const COMPLEXITIES = ['flat', 'moulded', 'carved', 'fretwork'] as const;
export type Complexity = (typeof COMPLEXITIES)[number];

/** Pore structure of a wood as finished. */
export const PORES = ['open', 'closed', 'ebonised'] as const;
export type Pores = (typeof PORES)[number];

/** Units materials are counted in. */
export const MATERIAL_UNITS = ['g', 'mL', 'sheet', 'each'] as const;
export type MaterialUnit = (typeof MATERIAL_UNITS)[number];

/** Kinds of material. */
export const MATERIAL_KINDS = [
  'shellac', 'spirit', 'pumice', 'oil', 'abrasive', 'wax', 'stripper', 'wadding', 'cloth', 'stain', 'other',
] as const;

/** Weekdays, Monday first. */
export const CALENDAR_WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
export type CalendarWeekday = (typeof CALENDAR_WEEKDAYS)[number];

const key = z.string().regex(/^[a-z0-9][a-z0-9-]{0,63}$/, { message: 'must be a lower-case key like "full-repolish"' });
const decimalString = z.string().regex(/^\d{1,9}(\.\d{1,4})?$/, { message: 'must be a decimal amount like "12.50"' });
const pct = z.number().min(0).max(100);
const time = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { message: 'must be a time like 08:30' });
const isoDate = dateSchema({ ...DATE_RULES.planning, example: '2025-03-14' });

/** A wood species as the finisher meets it. */
export const SpeciesSchema = z.object({
  key,
  name: z.string().min(1).max(80),
  pores: z.enum(PORES),
  /** Open pores must be filled (pumice) before a full gloss. */
  needsGrainFill: z.boolean(),
  /** Multiplies polish taken up by the first coats on bare wood (1 = none extra). */
  absorbency: z.number().min(0.5).max(3),
});
export type Species = z.infer<typeof SpeciesSchema>;

/** A material used by a stage, per square metre per session, in the material's own unit. */
export const MaterialUseSchema = z.object({ material: key, perM2: z.number().min(0).max(10_000) });
export type MaterialUse = z.infer<typeof MaterialUseSchema>;

/** One stage of a finishing system. */
export const StageSchema = z.object({
  key,
  kind: z.enum(STAGE_KINDS),
  name: z.string().min(1).max(80),
  /** A stage may be carried but switched off (an optional stain, for instance). */
  enabled: z.boolean().default(true),
  sessions: z.number().int().min(0).max(200),
  coatsPerSession: z.number().int().min(0).max(30),
  /** Pound cut of the polish (lb of flakes per gallon of spirit, the workshop's gallon); 0 when the stage lays no shellac. */
  cutLb: z.number().min(0).max(6),
  polishMlPerM2PerCoat: z.number().min(0).max(500),
  /** Spirit beyond the polish itself: thinning, charging the rubber, spiriting, cleaning. */
  spiritMlPerM2PerSession: z.number().min(0).max(2000),
  materials: z.array(MaterialUseSchema).max(20).default([]),
  labourMinPerM2PerCoat: z.number().min(0).max(600),
  setupMinPerSession: z.number().min(0).max(600),
  /** Rest after each session at 20 °C and moderate humidity, before the next session may start. */
  restHours: z.number().min(0).max(2000),
  appliesTo: z.enum(APPLIES_TO).default('all'),
  /** Species absorbency applies to this stage (the first coats on bare wood). */
  firstCoats: z.boolean().default(false),
  /** The veneer labour factor applies (careful stripping, preparing and cutting back of veneer). */
  veneerCare: z.boolean().default(false),
});
export type Stage = z.infer<typeof StageSchema>;
export type StageInput = z.input<typeof StageSchema>;

/** A named, ordered list of stages. */
export const FinishingSystemSchema = z.object({
  key,
  name: z.string().min(1).max(80),
  description: z.string().max(500).default(''),
  stages: z.array(StageSchema).min(1).max(40),
});
export type FinishingSystem = z.infer<typeof FinishingSystemSchema>;

/** A pack a supplier sells, with its price (decimal string, in the catalog currency, before tax). */
export const PackSchema = z.object({ size: z.number().positive().max(1e7), price: decimalString, label: z.string().max(80).optional() });
export type Pack = z.infer<typeof PackSchema>;

/** A material with the packs it can be bought in. */
export const MaterialSchema = z.object({
  key,
  name: z.string().min(1).max(120),
  kind: z.enum(MATERIAL_KINDS),
  unit: z.enum(MATERIAL_UNITS),
  supplier: z.string().max(120).default(''),
  packs: z.array(PackSchema).min(1).max(12),
});
export type Material = z.infer<typeof MaterialSchema>;

/** An hourly labour rate. */
export const LabourRateSchema = z.object({ key, name: z.string().min(1).max(80), perHour: decimalString });
export type LabourRate = z.infer<typeof LabourRateSchema>;

/** How a price is built. */
export const PricingSchema = z.object({
  currency: z.string().regex(/^[A-Z]{3}$/, { message: 'must be a three-letter currency code' }),
  /** Key of the labour rate charged for polishing. */
  polisherRate: key,
  markupPct: pct,
  /** Charge whole packs bought, or only the quantity used. */
  materialsCharge: z.enum(['whole-packs', 'used']),
  overheadPct: pct,
  marginPct: pct,
  taxPct: pct,
  taxLabel: z.string().min(1).max(40),
  /** Round the total to this step, e.g. "0.01", "1" or "5". */
  roundTo: decimalString.refine((s) => Number(s) > 0, { message: 'must be more than zero' }),
  depositPct: pct,
  /** Polish and spirit lost in mixing, charging the rubber and evaporation from the jar. */
  wastePct: pct,
  /** The largest discount sales may give. */
  maxDiscountPct: pct.default(100),
});
export type Pricing = z.infer<typeof PricingSchema>;

const FactorPairSchema = z.object({ labour: z.number().min(0.1).max(20), material: z.number().min(0.1).max(20) });

/** Multipliers for how worked a surface is and for veneer. */
export const FactorsSchema = z.object({
  complexity: z.object({ flat: FactorPairSchema, moulded: FactorPairSchema, carved: FactorPairSchema, fretwork: FactorPairSchema }),
  veneerLabour: z.number().min(1).max(5),
});
export type Factors = z.infer<typeof FactorsSchema>;

/** Opening hours of one weekday. */
export const OpeningHoursSchema = z
  .object({ day: z.enum(CALENDAR_WEEKDAYS), open: time, close: time })
  .refine((d) => d.open < d.close, { message: 'must open before it closes', path: ['close'] });

/** The working calendar: opening hours per weekday and closed dates. Local times, no time zone. */
export const WorkingCalendarSchema = z.object({
  workingWeek: z.array(OpeningHoursSchema).min(1, { message: 'needs at least one working day' }).max(7),
  closedDates: z.array(isoDate).max(1000).default([]),
});
export type WorkingCalendar = z.infer<typeof WorkingCalendarSchema>;

/** The gallon a "pound cut" is measured against: US (231 in³, 3.785 L) or imperial (4.546 L). */
export const GALLON_BASES = ['us', 'uk'] as const;
export type GallonBasis = (typeof GALLON_BASES)[number];

/** The gallon a cut is measured against, in short: "US gal" or "imperial gal" (US when the setting is absent). */
export function gallonName(gallon: GallonBasis | undefined): string {
  return gallon === 'uk' ? 'imperial gal' : 'US gal';
}

/** The unit of a pound cut on the workshop's gallon, as shown beside every cut: "lb per US gal" or "lb per imperial gal". */
export function cutUnit(gallon: GallonBasis | undefined): string {
  return `lb per ${gallonName(gallon)}`;
}

/** Which catalog materials hold the shellac flakes and the spirit, the solids' apparent density and the cut's gallon. */
export const ShellacSettingsSchema = z.object({
  flakesMaterial: key,
  spiritMaterial: key,
  /** A pound cut is pounds of flakes per gallon of spirit: the workshop says which gallon (US by default). */
  gallon: z.enum(GALLON_BASES).default('us'),
  /** g/cm³; about 1.2 reproduces the Fine Woodworking dilution chart. */
  apparentDensity: z.number().min(0.8).max(2),
});
export type ShellacSettings = z.infer<typeof ShellacSettingsSchema>;

/** The spirit's composition by volume; the shares must add up to 1. */
export const SpiritCompositionSchema = z
  .object({ ethanol: z.number().min(0).max(1), methanol: z.number().min(0).max(1), isopropanol: z.number().min(0).max(1) })
  .refine((s) => Math.abs(s.ethanol + s.methanol + s.isopropanol - 1) < 1e-6, { message: 'shares must add up to 1' });
export type SpiritComposition = z.infer<typeof SpiritCompositionSchema>;

/** The finishing room and the spirit, for vapour and ventilation figures. */
export const SafetySettingsSchema = z.object({
  room: z.object({ volumeM3: z.number().positive().max(100_000), airChangesPerHour: z.number().min(0.1).max(100) }),
  /** Mixing factor K of the dilution-ventilation equation, 1 (ideal) to 10 (poor). */
  mixingFactor: z.number().min(1).max(10),
  spirit: SpiritCompositionSchema,
});
export type SafetySettings = z.infer<typeof SafetySettingsSchema>;

function duplicates(keys: readonly string[]): string[] {
  return keys.filter((k, i) => keys.indexOf(k) !== i);
}

/** Everything the engine needs besides the piece itself. */
export const CatalogSchema = z
  .object({
    version: z.string().max(80).default('unversioned'),
    species: z.array(SpeciesSchema).min(1),
    systems: z.array(FinishingSystemSchema).min(1),
    materials: z.array(MaterialSchema).min(1),
    labourRates: z.array(LabourRateSchema).min(1),
    pricing: PricingSchema,
    factors: FactorsSchema,
    calendar: WorkingCalendarSchema,
    shellac: ShellacSettingsSchema,
    safety: SafetySettingsSchema,
  })
  .superRefine((c, ctx) => {
    const materialKeys = new Set(c.materials.map((m) => m.key));
    for (const [list, name] of [
      [c.species.map((s) => s.key), 'species'],
      [c.systems.map((s) => s.key), 'systems'],
      [c.materials.map((m) => m.key), 'materials'],
      [c.labourRates.map((r) => r.key), 'labourRates'],
    ] as const) {
      for (const d of duplicates(list)) ctx.addIssue({ code: 'custom', path: [name], message: `duplicate key "${d}"` });
    }
    c.systems.forEach((system, si) =>
      system.stages.forEach((stage, st) =>
        stage.materials.forEach((use, mi) => {
          if (!materialKeys.has(use.material)) {
            ctx.addIssue({ code: 'custom', path: ['systems', si, 'stages', st, 'materials', mi, 'material'], message: `unknown material "${use.material}"` });
          }
        }),
      ),
    );
    if (!c.labourRates.some((r) => r.key === c.pricing.polisherRate)) {
      ctx.addIssue({ code: 'custom', path: ['pricing', 'polisherRate'], message: `unknown labour rate "${c.pricing.polisherRate}"` });
    }
    for (const field of ['flakesMaterial', 'spiritMaterial'] as const) {
      if (!materialKeys.has(c.shellac[field])) {
        ctx.addIssue({ code: 'custom', path: ['shellac', field], message: `unknown material "${c.shellac[field]}"` });
      }
    }
  });
export type Catalog = z.infer<typeof CatalogSchema>;
export type CatalogInput = z.input<typeof CatalogSchema>;
