/**
 * The owner's price list as the API carries it: materials with their packs, each pack's price in force and its
 * history, and the supplier price file's preview. Money travels as decimal strings, never as numbers.
 */
import { z } from 'zod';
import { DATE_RULES, dateSchema } from './dates';
import { MATERIAL_KINDS, MATERIAL_UNITS, type MaterialUnit } from './catalog';

export type MaterialKind = (typeof MATERIAL_KINDS)[number];

/** Words for each kind of material, as the workshop says them. */
export const MATERIAL_KIND_LABELS: Record<MaterialKind, string> = {
  shellac: 'Shellac flakes',
  spirit: 'Spirit',
  pumice: 'Pumice',
  oil: 'Oil',
  abrasive: 'Abrasive',
  wax: 'Wax',
  stripper: 'Stripper',
  wadding: 'Wadding',
  cloth: 'Cloth',
  stain: 'Stain',
  other: 'Other',
};

export const MATERIAL_UNIT_LABELS: Record<MaterialUnit, string> = { g: 'grams (g)', mL: 'millilitres (mL)', sheet: 'sheets', each: 'pieces (each)' };

/** YYYY-MM-DD that is a real calendar date within the widest bounds (the shared date schema). */
export const IsoDateSchema = dateSchema();
/** When a price takes effect (form, API and supplier price file alike). */
export const EffectiveDateSchema = dateSchema(DATE_RULES.priceEffective);

/**
 * A price as typed: "12.50", "12,50" (decimal comma) or "12". Up to 8 whole digits and 4 decimals, the NUMERIC(12,4)
 * column's range. Leaves as a decimal string with a dot.
 */
export const PriceInputSchema = z
  .string({ message: 'is required' })
  .trim()
  .min(1, { message: 'is required' })
  .transform((s) => s.replace(',', '.'))
  .pipe(z.string().regex(/^\d{1,8}(\.\d{1,4})?$/, { message: 'must be an amount like 12.50 (at most 4 decimals)' }));

/** A pack size in the material's unit: positive, three decimals at most. */
export const PackSizeSchema = z.coerce
  .number({ message: 'must be a number' })
  .positive({ message: 'must be more than zero' })
  .max(10_000_000, { message: 'is too large' })
  .refine((n) => Math.round(n * 1000) === n * 1000, { message: 'takes at most 3 decimals' });

const name = z.string({ message: 'is required' }).trim().min(1, { message: 'is required' });
const key = z.string().trim().regex(/^[a-z0-9][a-z0-9-]{0,63}$/, { message: 'must be a lower-case key like "shellac-flakes"' });

export const PackSchemaDto = z.object({
  id: z.number().int(),
  size: z.string(),
  label: z.string(),
  supplier: z.string(),
  supplierCode: z.string().nullable(),
  archived: z.boolean(),
  /** The price in force today, or null when the pack has none yet. */
  price: z.string().nullable(),
  priceFrom: z.string().nullable(),
  /** The price before it, and the change in percent (one decimal). */
  previousPrice: z.string().nullable(),
  changePct: z.string().nullable(),
  /** A price that takes effect later, if one is booked. */
  nextPrice: z.string().nullable(),
  nextFrom: z.string().nullable(),
});
export type PackDto = z.infer<typeof PackSchemaDto>;

export interface MaterialDto {
  id: number;
  key: string;
  name: string;
  kind: MaterialKind;
  unit: MaterialUnit;
  notes: string;
  archived: boolean;
  updatedAt: string;
  packs: PackDto[];
}

export const MaterialListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  kind: z.enum(MATERIAL_KINDS).optional(),
  archived: z.enum(['active', 'archived', 'all']).default('active'),
  sort: z.enum(['name', 'kind', 'unit', 'updatedAt']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type MaterialListQuery = z.infer<typeof MaterialListQuerySchema>;

/** A first pack given with a new material, or a pack added later. */
export const CreatePackSchema = z
  .object({
    size: PackSizeSchema,
    label: z.string().trim().max(80).default(''),
    supplier: z.string().trim().max(120).default(''),
    supplierCode: z.string().trim().max(60).default(''),
    price: PriceInputSchema,
    effectiveFrom: EffectiveDateSchema,
  })
  .strict();
export type CreatePackInput = z.input<typeof CreatePackSchema>;

export const CreateMaterialSchema = z
  .object({
    key: key.optional(),
    name: name.max(120, { message: 'must be at most 120 characters' }),
    kind: z.enum(MATERIAL_KINDS, { message: `must be one of ${MATERIAL_KINDS.join(', ')}` }),
    unit: z.enum(MATERIAL_UNITS, { message: `must be one of ${MATERIAL_UNITS.join(', ')}` }),
    notes: z.string().max(2000).default(''),
    pack: CreatePackSchema,
  })
  .strict();
export type CreateMaterialInput = z.input<typeof CreateMaterialSchema>;

export const UpdateMaterialSchema = z
  .object({
    name: name.max(120, { message: 'must be at most 120 characters' }).optional(),
    kind: z.enum(MATERIAL_KINDS, { message: `must be one of ${MATERIAL_KINDS.join(', ')}` }).optional(),
    notes: z.string().max(2000, { message: 'must be at most 2000 characters' }).optional(),
    archived: z.boolean().optional(),
  })
  .strict();
export type UpdateMaterialInput = z.input<typeof UpdateMaterialSchema>;

export const UpdatePackSchema = z
  .object({
    label: z.string().trim().max(80).optional(),
    supplier: z.string().trim().max(120).optional(),
    supplierCode: z.string().trim().max(60).optional(),
    archived: z.boolean().optional(),
  })
  .strict();
export type UpdatePackInput = z.input<typeof UpdatePackSchema>;

/** A new price for a pack: it takes effect on its date and the old price stays in the history. */
export const NewPriceSchema = z.object({ price: PriceInputSchema, effectiveFrom: EffectiveDateSchema }).strict();
export type NewPriceInput = z.input<typeof NewPriceSchema>;

export interface PriceHistoryEntry {
  id: number;
  price: string;
  effectiveFrom: string;
  source: string;
  userName: string | null;
  createdAt: string;
  /** Change from the entry before it, in percent with one decimal; null for the first. */
  changePct: string | null;
}

export interface MaterialHistory {
  material: MaterialDto;
  currency: string;
  packs: { pack: PackDto; history: PriceHistoryEntry[] }[];
}

/** The catalog version the estimator reads, before and after a change (for repricing open estimates later). */
export interface CatalogVersionChange {
  from: string | null;
  to: string | null;
  changed: boolean;
}

/* Supplier price file ------------------------------------------------------------------------------------- */

/** Columns a supplier price file may carry; header names are matched without case, spaces or underscores. */
export const PRICE_FILE_COLUMNS = [
  { name: 'supplier', required: true, text: 'The supplier\u2019s name, as in the price list.' },
  { name: 'supplier_code', required: false, text: 'The supplier\u2019s code for the pack. Either this or material_key with pack_size.' },
  { name: 'material_key', required: false, text: 'The price list\u2019s key for the material (e.g. shellac-flakes), for a row without a supplier code.' },
  { name: 'description', required: false, text: 'What the supplier calls it; names a material the price list does not have yet.' },
  { name: 'pack_size', required: false, text: 'How much is in the pack, a number; needed for new packs and with material_key.' },
  { name: 'unit', required: false, text: 'g, kg, mL, L, sheet or each; kg and L are converted to g and mL.' },
  { name: 'price', required: true, text: 'The pack\u2019s price before tax: 12.50 or 12,50; a currency sign is ignored.' },
  { name: 'effective_date', required: false, text: 'When the price takes effect, YYYY-MM-DD or DD/MM/YYYY; today when empty.' },
  { name: 'kind', required: false, text: 'For a new material: shellac, spirit, pumice, oil, abrasive, wax, stripper, wadding, cloth, stain or other.' },
] as const;
export type PriceFileColumn = (typeof PRICE_FILE_COLUMNS)[number]['name'];

export interface PriceFileMatch {
  line: number;
  packId: number;
  materialId: number;
  materialName: string;
  packSize: string;
  unit: MaterialUnit;
  supplier: string;
  supplierCode: string | null;
  oldPrice: string | null;
  newPrice: string;
  changePct: string | null;
  effectiveFrom: string;
  /** Why the price looks wrong (a change far beyond the usual, an absurd amount): shown, not refused. */
  flag?: string | null;
}

export interface PriceFileNewItem {
  line: number;
  /** A new pack of a material already in the list, or a new material altogether. */
  kind: 'new-pack' | 'new-material';
  materialId: number | null;
  materialKey: string;
  materialName: string;
  materialKind: MaterialKind;
  packSize: string;
  unit: MaterialUnit;
  supplier: string;
  supplierCode: string | null;
  newPrice: string;
  effectiveFrom: string;
  /** Why the price looks wrong (an absurd amount for the pack): shown, not refused. */
  flag?: string | null;
}

export interface PriceFileRowError {
  line: number;
  reason: string;
}

export interface PriceFilePreview {
  id: string;
  fileName: string;
  /** SHA-256 of the file's bytes; the apply step must name it. */
  contentHash: string;
  delimiter: ',' | ';';
  /** The file's decimal separator, by the rule in docs/price-file.md (older previews lack it). */
  decimalSeparator?: '.' | ',';
  rowCount: number;
  columns: string[];
  unknownColumns: string[];
  matched: PriceFileMatch[];
  unchanged: PriceFileMatch[];
  newItems: PriceFileNewItem[];
  errors: PriceFileRowError[];
  /** True when the file has no unreadable row and changes something. */
  canApply: boolean;
  expiresAt: string;
  appliedAt: string | null;
  currency: string;
}

export const ApplyPriceFileSchema = z.object({ contentHash: z.string({ message: 'is required' }).regex(/^[0-9a-f]{64}$/, { message: 'must be the previewed file\u2019s SHA-256' }) }).strict();

export interface PriceFileApplied {
  pricesAdded: number;
  packsAdded: number;
  materialsAdded: number;
  catalogVersion: CatalogVersionChange;
}
