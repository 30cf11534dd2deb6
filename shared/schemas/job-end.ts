/**
 * The rest of a job after the deposit: where the piece is, its collection and return, the hand kept on it, staff
 * notes, progress photos, and work found during the job (variations). The moves of the piece and of a variation are
 * in the one state table, shared/schemas/state-moves.ts.
 */
import { z } from 'zod';
import { DATE_RULES, dateSchema } from './dates';
import { CUSTODY_EVENTS, type JobCustody, type VariationState } from './state-moves';

export { JOB_CUSTODY, CUSTODY_EVENTS, VARIATION_STATES, type JobCustody, type CustodyEvent, type VariationState } from './state-moves';

/** Where the piece is, in the words staff and the customer read. */
export const CUSTODY_LABELS: Record<JobCustody, string> = {
  'awaiting-collection': 'Awaiting collection',
  'in-workshop': 'In the workshop',
  ready: 'Ready',
  returned: 'Returned',
};

/** The same for the customer's page: a sentence each. */
export const CUSTODY_SENTENCES: Record<JobCustody, string> = {
  'awaiting-collection': 'We are waiting to collect your piece (or for you to bring it in).',
  'in-workshop': 'Your piece is in the workshop and the work is under way.',
  ready: 'The work is finished and your piece is ready to go home.',
  returned: 'Your piece has gone home. Thank you.',
};

export const VARIATION_STATE_LABELS: Record<VariationState, string> = {
  draft: 'Not sent yet',
  sent: 'Waiting for the customer',
  approved: 'Approved',
  declined: 'Declined',
  withdrawn: 'Withdrawn',
};

/** Keep a polisher on every session of the job, or on its bodying (first bodying to spiriting off). */
export const KEEP_SCOPES = ['job', 'bodying'] as const;
export type KeepScope = (typeof KEEP_SCOPES)[number];
export const KEEP_SCOPE_LABELS: Record<KeepScope, string> = { job: 'the whole job', bodying: 'bodying to spiriting off' };

/** Stage kinds the bodying hand keeps: from the first bodying to spiriting off. */
export const BODYING_KINDS = ['body', 'stiffen', 'spirit-off'] as const;

export const PHOTO_PHASES = ['before', 'during', 'after'] as const;
export type PhotoPhase = (typeof PHOTO_PHASES)[number];
export const PHOTO_PHASE_LABELS: Record<PhotoPhase, string> = { before: 'Before', during: 'During the work', after: 'After' };

const planningDate = dateSchema({ ...DATE_RULES.planning, example: '2026-12-07' });
const arrangement = z.string().trim().max(300, { message: 'must be at most 300 characters' });

/** Collection and return: dates and how (the workshop collects, the customer brings it, a removal firm…). */
export const JobLogisticsSchema = z
  .object({
    collectionDate: planningDate.nullable().optional(),
    collectionArrangement: arrangement.optional(),
    returnDate: planningDate.nullable().optional(),
    returnArrangement: arrangement.optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.collectionDate && v.returnDate && v.returnDate < v.collectionDate) {
      ctx.addIssue({ code: 'custom', path: ['returnDate'], message: 'must be on or after the collection date' });
    }
  });
export type JobLogisticsInput = z.input<typeof JobLogisticsSchema>;

export const CustodyMoveSchema = z.object({ event: z.enum(CUSTODY_EVENTS, { message: `must be one of ${CUSTODY_EVENTS.join(', ')}` }) }).strict();

export const KeepPolisherSchema = z
  .object({
    /** null lets booking choose freely again. */
    polisherId: z.number({ message: 'must be a polisher' }).int().positive().nullable(),
    scope: z.enum(KEEP_SCOPES, { message: 'must be "job" or "bodying"' }).default('job'),
  })
  .strict();
export type KeepPolisherInput = z.input<typeof KeepPolisherSchema>;

export const JobNoteSchema = z.object({ body: z.string().trim().min(1, { message: 'is required' }).max(4000) }).strict();

export const PhotoShareSchema = z.object({ shared: z.boolean({ message: 'must be true or false' }) }).strict();
export const PhotoPhaseSchema = z.enum(PHOTO_PHASES, { message: 'must be before, during or after' });

const amount = z
  .string({ message: 'must be an amount like 125.50' })
  .trim()
  .regex(/^\d{1,9}(\.\d{1,2})?$/, { message: 'must be an amount like 125.50 (at most two decimals)' })
  .refine((s) => Number(s) > 0, { message: 'must be more than zero' });

/**
 * A variation: priced by hand (a price and the hours it takes) or by the engine (one part and a finishing system,
 * as in an estimate's parts list).
 */
export const VariationInputSchema = z
  .object({
    title: z.string().trim().min(3, { message: 'must say what the work is, in a few words' }).max(200),
    description: z.string().trim().max(2000).default(''),
    hand: z.object({ price: amount, hours: z.number({ message: 'must be a number of hours' }).min(0).max(200) }).strict().optional(),
    engine: z.object({ part: z.record(z.string(), z.unknown()), system: z.string().min(1).max(64) }).strict().optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (!v.hand && !v.engine) ctx.addIssue({ code: 'custom', path: ['hand'], message: 'give a price by hand, or a part and a system for the engine' });
    if (v.hand && v.engine) ctx.addIssue({ code: 'custom', path: ['engine'], message: 'give a price by hand or a part for the engine, not both' });
  });
export type VariationInput = z.input<typeof VariationInputSchema>;

export const VariationAnswerSchema = z.object({ note: z.string().trim().max(500).default('') }).strict();

export interface JobNoteDto {
  id: number;
  body: string;
  author: { id: number; name: string } | null;
  createdAt: string;
}

export interface JobEventDto {
  id: number;
  kind: string;
  text: string;
  at: string;
}

export interface ProgressPhotoDto {
  id: number;
  phase: PhotoPhase;
  caption: string;
  shared: boolean;
  url: string;
  thumbUrl: string;
  createdAt: string;
}

export interface VariationDto {
  id: number;
  title: string;
  description: string;
  pricedBy: 'engine' | 'hand';
  price: string;
  currency: string;
  hours: number;
  state: VariationState;
  sentAt: string | null;
  answeredAt: string | null;
  answerNote: string | null;
  /** Staff only: the engine's working (labour and materials) behind the price. */
  working: { labourHours: number; materialsCost: string; labourCost: string } | null;
  /** The signed link, only in the answer to "send". */
  link?: string;
}

/** Everything about the job's end on the staff page. */
export interface JobEndDto {
  jobId: number;
  number: string;
  custody: JobCustody;
  collectionDate: string | null;
  collectionArrangement: string;
  returnDate: string | null;
  returnArrangement: string;
  collectedOn: string | null;
  completedOn: string | null;
  returnedOn: string | null;
  keep: { polisher: { id: number; name: string }; scope: KeepScope } | null;
  notes: JobNoteDto[];
  photos: ProgressPhotoDto[];
  variations: VariationDto[];
  events: JobEventDto[];
}

/** What the customer's page shows of each job: plain words, no rates. */
export interface PublicJobDto {
  number: string;
  title: string;
  custody: JobCustody;
  where: string;
  collectionDate: string | null;
  collectionArrangement: string;
  returnDate: string | null;
  returnArrangement: string;
  completedOn: string | null;
  photos: { id: number; phase: PhotoPhase; caption: string; url: string; thumbUrl: string }[];
  variations: { title: string; description: string; price: string; currency: string; state: VariationState }[];
}

/** A variation as the customer reads it through its own link. */
export interface PublicVariationDto {
  title: string;
  description: string;
  price: string;
  currency: string;
  state: VariationState;
  jobNumber: string;
  pieceTitle: string;
  workshopName: string;
  cautions: string[];
}
