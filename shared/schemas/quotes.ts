import { z } from 'zod';

/** A quote's life: prepared, sent, opened by the customer, then answered; the deposit closes it. */
export const QUOTE_STATES = ['draft', 'quoted', 'viewed', 'accepted', 'declined', 'expired', 'deposit-paid', 'withdrawn'] as const;
export type QuoteState = (typeof QUOTE_STATES)[number];
export const QUOTE_STATE_LABELS: Record<QuoteState, string> = {
  draft: 'Not sent',
  quoted: 'Sent',
  viewed: 'Opened by customer',
  accepted: 'Accepted',
  declined: 'Declined',
  expired: 'Expired',
  'deposit-paid': 'Deposit paid',
  withdrawn: 'Withdrawn',
};

const money = z.string().regex(/^\d{1,9}(\.\d{1,2})?$/, { message: 'must be an amount like 120.00' });
const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date like 2027-01-31' });

/** Optional work the customer may accept or not, priced apart from the polishing (before tax). */
export const QuoteExtraInputSchema = z
  .object({
    label: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(120),
    description: z.string().trim().max(600).default(''),
    hours: z.number({ message: 'must be a number of hours' }).min(0).max(1000),
    price: money,
  })
  .strict();
export type QuoteExtraInput = z.input<typeof QuoteExtraInputSchema>;
export interface QuoteExtra {
  id: string;
  label: string;
  description: string;
  hours: number;
  /** Before tax. */
  price: string;
  /** With tax, as the customer sees it. */
  priceWithTax: string;
}

export const CreateQuoteSchema = z
  .object({
    /** The estimate's revision to quote; the current one when left out. */
    revision: z.number().int().min(1).optional(),
    message: z.string().trim().max(4000).default(''),
    extras: z.array(QuoteExtraInputSchema).max(12).default([]),
    discountPct: z.number({ message: 'must be a percentage' }).min(0).max(100).default(0),
    depositPct: z.number({ message: 'must be a percentage' }).min(0).max(100).optional(),
    validUntil: isoDate.optional(),
    /** Where to send it; the customer's e-mail when left out. */
    recipient: z.email({ message: 'must be an e-mail address' }).optional(),
  })
  .strict();
export type CreateQuoteInput = z.input<typeof CreateQuoteSchema>;

export interface QuotePricing {
  lines: { code: string; label: string; amount: string }[];
  total: string;
  depositPct: number;
  deposit: string;
  balance: string;
  taxLabel: string;
  taxPct: number;
  currency: string;
}

export interface QuoteSummary {
  id: number;
  number: string;
  state: QuoteState;
  estimate: { id: number; number: string; title: string; revision: number };
  customer: { id: number; name: string; email: string | null };
  total: string;
  deposit: string;
  /** With the extras the customer took, once accepted. */
  acceptedTotal: string | null;
  currency: string;
  validUntil: string;
  recipient: string | null;
  sentAt: string | null;
  viewedAt: string | null;
  acceptedAt: string | null;
  declinedAt: string | null;
  depositPaidAt: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface QuoteDetail extends QuoteSummary {
  /** The piece the work is on, as the customer knows it (not the estimate's working title). */
  piece?: { id: number; description: string } | null;
  message: string;
  discountPct: number;
  depositPct: number;
  extras: QuoteExtra[];
  pricing: QuotePricing;
  acceptedName: string | null;
  acceptedIp: string | null;
  acceptedExtras: string[] | null;
  acceptedDeposit: string | null;
  declineReason: string | null;
  payments: { id: number; amount: string; currency: string; status: string; createdAt: string; paidAt: string | null }[];
  /** Set only in the answer to "send": the customer's link, shown once. */
  link?: string;
  /** Set only in the answer to "send": whether the mail server took the message, and its error if not. */
  delivery?: { delivered: boolean; outboxId: number; error: string | null };
}

/** What the customer sees through their link. */
export interface PublicQuote {
  number: string;
  state: QuoteState;
  /** Why the link cannot be acted on, if so. */
  closed: null | 'expired' | 'withdrawn' | 'accepted' | 'declined' | 'deposit-paid';
  workshop: { name: string; email: string | null; phone: string | null; address: string | null };
  customerName: string;
  piece: string;
  message: string;
  validUntil: string;
  work: { systemName: string; coats: number; labourHours: number; calendarDays: number; areaText: string; stages: { name: string; sessions: number; coats: number }[] };
  pricing: QuotePricing;
  extras: QuoteExtra[];
  terms: string[];
  cautions: { code: string; severity: string; text: string }[];
  acceptedName: string | null;
  acceptedAt: string | null;
  acceptedExtras: string[] | null;
  acceptedTotal: string | null;
  acceptedDeposit: string | null;
  declinedAt: string | null;
  depositPaidAt: string | null;
  pricesIncludeTax: boolean;
}

export const AcceptQuoteSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(2, { message: 'type your full name' }).max(160),
    acceptTerms: z.literal(true, { message: 'tick to accept the terms' }),
    extras: z.array(z.string().max(40)).max(12).default([]),
  })
  .strict();
export type AcceptQuoteInput = z.input<typeof AcceptQuoteSchema>;

export const DeclineQuoteSchema = z.object({ reason: z.string().trim().max(1000).default('') }).strict();

export const QuoteListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  estimateId: z.coerce.number().int().positive().max(2_147_483_647).optional(),
  state: z.enum(QUOTE_STATES).optional(),
  sort: z.enum(['number', 'customer', 'state', 'total', 'updatedAt', 'validUntil']).default('updatedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type QuoteListQuery = z.input<typeof QuoteListQuerySchema>;

export interface PipelineRow {
  state: QuoteState;
  count: number;
  value: string;
  currency: string;
}

export interface OutboxSummary {
  id: number;
  quoteId: number | null;
  to: string;
  subject: string;
  status: 'queued' | 'sent' | 'failed';
  attempts: number;
  lastError: string | null;
  attachmentName: string | null;
  createdAt: string;
  sentAt: string | null;
}
export interface OutboxDetail extends OutboxSummary {
  text: string;
  html: string;
}

/** The workshop's standard terms on every quote. */
export const QUOTE_TERMS = [
  'The price covers the finishing work described; other repairs are quoted separately (see the optional work).',
  'A deposit secures the booking in the drying room; the balance is due when the piece is collected or delivered.',
  'Dates depend on the drying of each coat: cold or damp weather can lengthen the rests between sessions.',
  'Old finishes sometimes hide damage that shows only once stripped; if so we will tell you before going further.',
  'The quote is valid until the date shown; prices after that follow the price list of the day.',
];
