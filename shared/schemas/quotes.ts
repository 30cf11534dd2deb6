import { z } from 'zod';
import { DATE_RULES, dateSchema } from './dates';

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
const isoDate = dateSchema({ ...DATE_RULES.quoteValidUntil, example: '2027-01-31' });

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

/**
 * One line of a quote of several pieces: an estimate (of one of the customer's pieces) at a revision. Lines with the
 * same group number are options for one piece; one of them is recommended; an optional group may be left out.
 */
export const QuoteLineInputSchema = z
  .object({
    estimateId: z.number({ message: 'must be an estimate id' }).int().positive().max(2_147_483_647),
    /** The estimate's revision; its current one when left out. */
    revision: z.number().int().min(1).optional(),
    /** Lines sharing a group number are alternatives; a line without one stands alone. */
    group: z.number({ message: 'must be a group number' }).int().min(1).max(24).optional(),
    /** The option's name as the customer reads it ("Full repolish"). */
    label: z.string().trim().max(120).default(''),
    recommended: z.boolean().optional(),
    /** The customer may take none of this line's group. */
    optional: z.boolean().optional(),
  })
  .strict();
export type QuoteLineInput = z.input<typeof QuoteLineInputSchema>;

export const CreateQuoteSchema = z
  .object({
    /** The estimate's revision to quote; the current one when left out. */
    revision: z.number().int().min(1).optional(),
    /** Several pieces and options; the estimate of the address alone (at `revision`) when left out. */
    lines: z.array(QuoteLineInputSchema).min(1, { message: 'give at least one line' }).max(12).optional(),
    message: z.string().trim().max(4000).default(''),
    extras: z.array(QuoteExtraInputSchema).max(12).default([]),
    /** The estimate's own discount when left out. */
    discountPct: z.number({ message: 'must be a percentage' }).min(0).max(100).optional(),
    depositPct: z.number({ message: 'must be a percentage' }).min(0).max(100).optional(),
    validUntil: isoDate.optional(),
    /** Where to send it; the customer's e-mail when left out. */
    recipient: z.email({ message: 'must be an e-mail address' }).optional(),
  })
  .strict();
export type CreateQuoteInput = z.input<typeof CreateQuoteSchema>;
export type CreateQuote = z.output<typeof CreateQuoteSchema>;

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

/** What the customer agreed to: the quote's total with the extras they ticked, and the deposit and balance on it. */
export interface AgreedFigures {
  total: string;
  deposit: string;
  balance: string;
  /** The extras the customer took, in the quote's order. */
  extras: QuoteExtra[];
  /** Hands-on hours the extras add to the job. */
  extraHours: number;
}

/** The total, deposit and balance on the accepted total with the extras the customer took (decimal, to the cent). */
export function agreedFigures(q: { total: string; depositPct: number; extras: QuoteExtra[] }, extraIds: readonly string[]): AgreedFigures {
  const chosen = q.extras.filter((x) => extraIds.includes(x.id));
  const cents = (s: string) => Math.round(Number(s) * 100);
  const totalC = cents(q.total) + chosen.reduce((t, x) => t + cents(x.priceWithTax), 0);
  // Integer cents and a whole-number percentage basis: the half-cent case is exact, and rounds up as the database does.
  const depositC = Math.round((totalC * Math.round(q.depositPct * 100)) / 10_000);
  const fmt = (c: number) => (c / 100).toFixed(2);
  return {
    total: fmt(totalC),
    deposit: fmt(depositC),
    balance: fmt(totalC - depositC),
    extras: chosen,
    extraHours: Math.round(chosen.reduce((t, x) => t + x.hours, 0) * 100) / 100,
  };
}

/** A quote line's place among the options, as the choice rules need it. */
export interface ChoiceLine {
  id: number;
  group: number;
  groupOptional: boolean;
  total: string;
}

/** Why a choice of lines is not a valid answer (null when it is): exactly one line a group, none only where optional. */
export function choiceProblem(lines: readonly ChoiceLine[], chosen: readonly number[]): string | null {
  const unknown = chosen.filter((id) => !lines.some((l) => l.id === id));
  if (unknown.length) return `${unknown.join(', ')} is not a line of this quote`;
  if (new Set(chosen).size !== chosen.length) return 'a line is chosen twice';
  const groups = [...new Set(lines.map((l) => l.group))];
  for (const g of groups) {
    const of = lines.filter((l) => l.group === g);
    const taken = of.filter((l) => chosen.includes(l.id)).length;
    if (taken > 1) return `choose one option for piece ${g}, not ${taken}`;
    if (taken === 0 && !of[0]!.groupOptional) return `choose one option for piece ${g}`;
  }
  return null;
}

/** The lines the customer takes when nothing has to be chosen (every group one line, none optional); else null. */
export function onlyChoice(lines: readonly ChoiceLine[]): number[] | null {
  const groups = new Set(lines.map((l) => l.group));
  if (groups.size !== lines.length || lines.some((l) => l.groupOptional)) return null;
  return lines.map((l) => l.id);
}

/** The total, deposit and balance for a choice of lines and extras (decimal to the cent, as at acceptance). */
export function choiceFigures(q: { lines: readonly ChoiceLine[]; depositPct: number; extras: QuoteExtra[] }, chosen: readonly number[], extraIds: readonly string[]): AgreedFigures {
  const cents = q.lines.filter((l) => chosen.includes(l.id)).reduce((t, l) => t + Math.round(Number(l.total) * 100), 0);
  return agreedFigures({ total: (cents / 100).toFixed(2), depositPct: q.depositPct, extras: q.extras }, extraIds);
}

/** Hours as the customer reads them: quarters under an hour, halves under ten, whole hours above. */
export function roundHoursForCustomer(hours: number): number {
  if (hours <= 0) return 0;
  if (hours < 1) return Math.max(0.25, Math.round(hours * 4) / 4);
  if (hours < 10) return Math.round(hours * 2) / 2;
  return Math.round(hours);
}

/**
 * The price as the customer reads it: materials, the work (labour with the workshop's overhead and margin folded
 * in, with its hours), discount, tax and rounding. The labour rate, overhead and margin are never named; the lines
 * still add up to the total exactly.
 */
export function customerPriceLines(pricing: Pick<QuotePricing, 'lines'>, labourHours: number): QuotePricing['lines'] {
  const PRIVATE = new Set(['labour', 'overhead', 'margin']);
  const cents = (s: string) => Math.round(Number(s) * 100);
  const workC = pricing.lines.filter((l) => PRIVATE.has(l.code)).reduce((t, l) => t + cents(l.amount), 0);
  const hours = roundHoursForCustomer(labourHours);
  const work = { code: 'work', label: `The work: about ${hours.toLocaleString('en-GB')} h of hands-on polishing`, amount: (workC / 100).toFixed(2) };
  const out: QuotePricing['lines'] = [];
  for (const l of pricing.lines) {
    if (l.code === 'labour') out.push(work);
    else if (PRIVATE.has(l.code)) continue;
    else if (l.code === 'rounding') out.push({ code: 'rounding', label: 'Rounding', amount: l.amount });
    else out.push(l);
  }
  return out;
}

export const PAYMENT_STATUSES = ['pending', 'paid', 'cancelled', 'expired', 'refunded'] as const;
export type PaymentStatus = (typeof PAYMENT_STATUSES)[number];
/** Why a payment needs the owner's attention: paid after the deposit was paid, a different amount, or a checkout we never opened. */
export type PaymentFlag = 'duplicate' | 'amount-mismatch' | 'unknown-checkout';
export const PAYMENT_FLAG_LABELS: Record<PaymentFlag, string> = {
  duplicate: 'Paid twice',
  'amount-mismatch': 'Amount differs from the deposit',
  'unknown-checkout': 'Payment for a checkout we did not open',
};

export interface PaymentDto {
  id: number;
  amount: string;
  currency: string;
  status: PaymentStatus;
  createdAt: string;
  paidAt: string | null;
  expiresAt: string | null;
  /** What the provider says it took, when it differs from what was asked. */
  amountReceived: string | null;
  flag: PaymentFlag | null;
  note: string | null;
  refundedAt: string | null;
}

/** A payment the owner should look at, with its quote. */
export interface FlaggedPayment extends PaymentDto {
  quote: { id: number; number: string; state: QuoteState };
  customer: string;
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

/** A quote line on staff screens: the full build-up of its price. */
export interface QuoteLineDto {
  id: number;
  position: number;
  group: number;
  groupOptional: boolean;
  label: string;
  recommended: boolean;
  estimate: { id: number; number: string; title: string; revision: number };
  piece: { id: number; description: string };
  pricing: QuotePricing;
  total: string;
  labourHours: number;
  /** Taken at acceptance (null before). */
  chosen: boolean | null;
}

export interface QuoteDetail extends QuoteSummary {
  lines: QuoteLineDto[];
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
  /** What the customer agreed to, once accepted. */
  agreed: AgreedFigures | null;
  /** Payments that need the owner's attention (paid twice, wrong amount). */
  flagged: number;
  payments: PaymentDto[];
  /** Set only in the answer to "send": the customer's link, shown once. */
  link?: string;
  /** Set only in the answer to "send": whether the mail server took the message, and its error if not. */
  delivery?: { delivered: boolean; outboxId: number; error: string | null };
}

/** A line as the customer reads it: the piece, the option, the work in plain words and its price. */
export interface PublicQuoteLine {
  id: number;
  group: number;
  groupOptional: boolean;
  label: string;
  recommended: boolean;
  piece: string;
  work: PublicQuote['work'];
  pricing: QuotePricing;
  total: string;
  chosen: boolean | null;
}

/** What the customer sees through their link. */
export interface PublicQuote {
  /** The pieces and options; one line for a quote of one piece. */
  lines: PublicQuoteLine[];
  /** The quote's total for the recommended choice (the quote's `pricing.total`). */
  recommended: number[];
  number: string;
  state: QuoteState;
  /** Why the link cannot be acted on, if so. */
  closed: null | 'expired' | 'withdrawn' | 'accepted' | 'declined' | 'deposit-paid';
  workshop: { name: string; email: string | null; phone: string | null; address: string | null };
  customerName: string;
  piece: string;
  message: string;
  validUntil: string;
  work: {
    systemName: string;
    coats: number;
    /** Rounded for reading (see roundHoursForCustomer). */
    labourHours: number;
    calendarDays: number;
    areaText: string;
    /** Coats is null for a stage that lays no coat (stripping, filling, cutting back, waxing). */
    stages: { name: string; sessions: number; coats: number | null; hours: number }[];
  };
  /** The price in the customer's lines (see customerPriceLines): no rate, overhead or margin. */
  pricing: QuotePricing;
  /** When the work happens: booked dates once the job is booked; until then an estimate of how long it takes. */
  schedule: { booked: boolean; start: string | null; ready: string | null; calendarDays: number };
  agreed: AgreedFigures | null;
  /**
   * The deposit checkout still open, if any, and what became of the last one; `available` is false while the
   * workshop has no account ready to take card payments.
   */
  checkout: { open: boolean; lastStatus: PaymentStatus | null; available: boolean };
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
    /** The lines taken, one a group (none where the group is optional); may be left out when there is nothing to choose. */
    lines: z.array(z.number({ message: 'must be line ids' }).int().positive().max(2_147_483_647)).max(24).optional(),
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
export type QuoteListQueryInput = z.input<typeof QuoteListQuerySchema>;
export type QuoteListQuery = z.output<typeof QuoteListQuerySchema>;

export interface PipelineRow {
  state: QuoteState;
  count: number;
  value: string;
  currency: string;
}

/** How often customers take the lighter option of a group (the cheaper line), for deciding what to recommend. */
export interface OptionReport {
  /** Option groups (two lines or more) in accepted quotes. */
  groups: number;
  lighterChosen: number;
  heavierChosen: number;
  noneChosen: number;
  recommendedChosen: number;
  /** Per month of acceptance (YYYY-MM), oldest first. */
  months: { month: string; groups: number; lighterChosen: number }[];
}

export interface OutboxSummary {
  id: number;
  quoteId: number | null;
  to: string;
  subject: string;
  status: 'queued' | 'sending' | 'sent' | 'failed';
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
  'Once the deposit is paid we book the work into the drying room and confirm the dates; the balance is due when the piece is collected or delivered.',
  'Dates depend on the drying of each coat: cold or damp weather can lengthen the rests between sessions.',
  'Old finishes sometimes hide damage that shows only once stripped; if so we will tell you before going further.',
  'The quote is valid until the date shown; prices after that follow the price list of the day.',
];
