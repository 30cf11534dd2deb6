import { parsePieceYear, YEAR_HINT, YEAR_MAX, YEAR_MIN } from '../piece-year';
import { z } from 'zod';

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, { message: `must be at most ${max} characters` })
    .transform((s) => (s === '' ? null : s))
    .nullable()
    .optional();

const sortDir = z.enum(['asc', 'desc']).default('asc');
const page = z.coerce.number().int().min(1).max(100_000).default(1);
const pageSize = z.coerce.number().int().min(1).max(100).default(25);
const search = z.string().trim().max(100).optional();
export const IdSchema = z.coerce.number({ message: 'must be a whole number' }).int().positive().max(2_147_483_647);

/** A customer as staff enter them. */
export const CustomerInputSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(160),
    email: z
      .string()
      .trim()
      .toLowerCase()
      .max(254)
      .refine((s) => s === '' || z.email().safeParse(s).success, { message: 'must be an e-mail address' })
      .transform((s) => (s === '' ? null : s))
      .nullable()
      .optional(),
    phone: optionalText(40),
    address: optionalText(500),
    notes: optionalText(4000),
  })
  .strict();
export type CustomerInput = z.input<typeof CustomerInputSchema>;

export const CustomerSchema = z.object({
  id: z.number(),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  address: z.string().nullable(),
  notes: z.string().nullable(),
  pieceCount: z.number(),
  estimateCount: z.number(),
  archived: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Customer = z.infer<typeof CustomerSchema>;

export const CustomerListQuerySchema = z.object({
  q: search,
  sort: z.enum(['name', 'createdAt', 'updatedAt']).default('name'),
  dir: sortDir,
  archived: z.enum(['true', 'false']).optional(),
  page,
  pageSize,
});
export type CustomerListQueryInput = z.input<typeof CustomerListQuerySchema>;
export type CustomerListQuery = z.output<typeof CustomerListQuerySchema>;

/** Kinds of piece a workshop polishes. */
export const PIECE_KINDS = ['grand', 'upright', 'square', 'furniture'] as const;
export type PieceKind = (typeof PIECE_KINDS)[number];
export const PIECE_KIND_LABELS: Record<PieceKind, string> = {
  grand: 'Grand piano',
  upright: 'Upright piano',
  square: 'Square piano',
  furniture: 'Furniture',
};

/** A customer's piece as the finisher records it. Dimensions are lengths as typed ("190 cm", "6 ft 3 in"). */
export const PieceInputSchema = z
  .object({
    customerId: IdSchema,
    kind: z.enum(PIECE_KINDS, { message: `must be one of ${PIECE_KINDS.join(', ')}` }),
    description: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(200),
    maker: optionalText(120),
    /** A whole year, or the year as written: "1890", "c. 1830", "about 1900", "1890s"; "" or null clears it. */
    year: z
      .union([
        z.number().int({ message: YEAR_HINT }).min(YEAR_MIN, { message: 'must be 1600 or later' }).max(YEAR_MAX, { message: 'must be 2100 or earlier' }),
        z.string().refine((t) => t.trim() === '' || parsePieceYear(t) !== null, { message: YEAR_HINT }),
      ], { message: YEAR_HINT })
      .nullable()
      .optional(),
    serial: optionalText(60),
    dimensions: z.record(z.string().max(40), z.string().trim().max(64)).default({}),
    conditionNotes: optionalText(8000),
  })
  .strict();
export type PieceInput = z.input<typeof PieceInputSchema>;

export const PhotoSchema = z.object({
  id: z.number(),
  pieceId: z.number(),
  caption: z.string(),
  url: z.string(),
  thumbUrl: z.string(),
  width: z.number(),
  height: z.number(),
  bytes: z.number(),
  createdAt: z.string(),
});
export type Photo = z.infer<typeof PhotoSchema>;

export const PieceSchema = z.object({
  id: z.number(),
  customerId: z.number(),
  customerName: z.string(),
  kind: z.enum(PIECE_KINDS),
  description: z.string(),
  maker: z.string().nullable(),
  /** The sortable best guess of the year. */
  year: z.number().nullable(),
  /** The year as written ("c. 1830", "1890s"); what pages and documents show. */
  yearText: z.string().nullable(),
  serial: z.string().nullable(),
  dimensions: z.record(z.string(), z.string()),
  conditionNotes: z.string().nullable(),
  photos: z.array(PhotoSchema),
  archived: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Piece = z.infer<typeof PieceSchema>;

export const PieceListQuerySchema = z.object({
  customerId: IdSchema.optional(),
  kind: z.enum(PIECE_KINDS).optional(),
  q: search,
  sort: z.enum(['description', 'customer', 'kind', 'createdAt', 'updatedAt']).default('updatedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  page,
  pageSize,
});
export type PieceListQueryInput = z.input<typeof PieceListQuerySchema>;
export type PieceListQuery = z.output<typeof PieceListQuerySchema>;

export const PhotoCaptionSchema = z.object({ caption: z.string().trim().max(300) }).strict();

/** Uploads: what the server accepts, checked by the bytes, not the name. */
export const PHOTO_LIMITS = { maxBytes: 8 * 1024 * 1024, maxFiles: 12, types: ['image/jpeg', 'image/png', 'image/webp'] } as const;
