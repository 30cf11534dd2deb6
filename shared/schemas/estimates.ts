import { z } from 'zod';
import { EstimateInputSchema, type EstimateInput, type EstimateResult } from './calc';
import { IdSchema } from './customers';

/**
 * The life of an estimate. draft: the estimator is still working; priced: ready to quote. The quote states follow
 * from the quote sent to the customer.
 */
export const ESTIMATE_STATES = ['draft', 'priced', 'quoted', 'viewed', 'accepted', 'declined', 'expired', 'deposit-paid'] as const;
export type EstimateState = (typeof ESTIMATE_STATES)[number];
export const ESTIMATE_STATE_LABELS: Record<EstimateState, string> = {
  draft: 'Draft',
  priced: 'Priced',
  quoted: 'Quoted',
  viewed: 'Viewed by customer',
  accepted: 'Accepted',
  declined: 'Declined',
  expired: 'Expired',
  'deposit-paid': 'Deposit paid',
};
/** States in which an estimate may still be revised and repriced. */
export const OPEN_STATES: readonly EstimateState[] = ['draft', 'priced'];

/** Engine input as sent by a client: checked again, and priced, by the server. */
const EngineInput = z.custom<EstimateInput>((v) => v !== null && typeof v === 'object' && !Array.isArray(v), {
  message: 'must be an estimate input object',
});

export const CreateEstimateSchema = z
  .object({
    customerId: IdSchema,
    pieceId: IdSchema,
    title: z.string().trim().max(160).optional(),
    input: EngineInput,
    note: z.string().trim().max(1000).optional(),
  })
  .strict();
export type CreateEstimateInput = z.input<typeof CreateEstimateSchema>;

export const CreateRevisionSchema = z
  .object({
    /** The revision this edit started from; a save based on an older one is refused with 409. */
    baseRevision: z.number({ message: 'is required' }).int().min(1),
    input: EngineInput,
    title: z.string().trim().max(160).optional(),
    note: z.string().trim().max(1000).optional(),
  })
  .strict();
export type CreateRevisionInput = z.input<typeof CreateRevisionSchema>;

export const SetStateSchema = z.object({ state: z.enum(['draft', 'priced']) }).strict();
export const ArchiveSchema = z.object({ archived: z.boolean() }).strict();
export const DuplicateSchema = z.object({ pieceId: IdSchema.optional(), customerId: IdSchema.optional() }).strict();

export interface PersonRef {
  id: number;
  name: string;
}

/** What the customer agreed to for an estimate: its accepted quote's total with the extras taken, deposit and balance. */
export interface EstimateAgreement {
  quoteId: number;
  quoteNumber: string;
  total: string;
  deposit: string;
  balance: string;
  extras: string[];
  depositPaid: boolean;
}

export interface EstimateSummary {
  id: number;
  number: string;
  title: string;
  state: EstimateState;
  customer: PersonRef;
  piece: { id: number; description: string; kind: string };
  owner: PersonRef;
  labourHours: number;
  total: string;
  currency: string;
  revisionCount: number;
  validUntil: string;
  archived: boolean;
  createdAt: string;
  updatedAt: string;
  /** The accepted quote's figures, once a quote of it is accepted (lists and the estimate page fill it). */
  agreed?: EstimateAgreement | null;
}

export interface RevisionSummary {
  id: number;
  number: number;
  total: string;
  labourHours: number;
  /** The price list's internal version (a content hash): compare with it, never show it. */
  catalogVersion: string;
  /** The price list as people name it: "prices of 2 Dec 2026". */
  priceList?: string;
  note: string;
  createdBy: PersonRef;
  createdAt: string;
}

export interface Revision extends RevisionSummary {
  input: EstimateInput;
  result: EstimateResult;
}

export interface EstimateDetail extends EstimateSummary {
  revisions: RevisionSummary[];
  current: Revision;
}

export const EstimateListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  state: z.enum(ESTIMATE_STATES).optional(),
  customerId: IdSchema.optional(),
  archived: z.enum(['true', 'false']).default('false'),
  sort: z.enum(['number', 'customer', 'state', 'labourHours', 'total', 'updatedAt']).default('updatedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type EstimateListQueryInput = z.input<typeof EstimateListQuerySchema>;
export type EstimateListQuery = z.output<typeof EstimateListQuerySchema>;

export { EstimateInputSchema };

// The repricing of open estimates after a price change (GET /api/estimates/reprice and its POST).
/** An open estimate whose current revision was priced with an older price list, and its total with today's. */
export interface RepriceRow {
  id: number;
  number: string;
  title: string;
  customer: string;
  state: EstimateState;
  /** The price list its current revision was priced with (internal version, to compare with). */
  catalogVersion: string;
  /** The same, as people name it: "prices of 2 Dec 2026". */
  priceList: string;
  oldTotal: string;
  newTotal: string;
  currency: string;
}

export interface RepriceCandidates {
  /** Today's price list (internal version). */
  catalogVersion: string;
  /** Today's price list as people name it. */
  priceList: string;
  rows: RepriceRow[];
}

export interface RepricedEstimate {
  id: number;
  number: string;
  total: string;
  /** The new revision's number. */
  revision: number;
}

export interface RepriceResult {
  repriced: RepricedEstimate[];
  /** Estimates today's prices leave as they were: no new revision was made. */
  unchanged?: RepricedEstimate[];
}
