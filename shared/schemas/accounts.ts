/**
 * A job's account after the agreement: the documents issued (deposit and payment receipts, the tax invoice, credit
 * notes), the payments ledger (card payments through the provider, bank transfers, cash and cheques recorded by
 * hand, refunds), the balance, and the list of what customers owe the workshop, by age.
 *
 * balance = agreed total − credit notes − payments received + refunds made; never below zero (an over-payment is
 * refused, and a credit note larger than what is still owed says how the difference is refunded).
 */
import { z } from 'zod';
import { dateSchema } from './dates';

export const DOCUMENT_KINDS = ['receipt', 'invoice', 'credit-note'] as const;
export type DocumentKind = (typeof DOCUMENT_KINDS)[number];
export const DOCUMENT_KIND_LABELS: Record<DocumentKind, string> = { receipt: 'Receipt', invoice: 'Tax invoice', 'credit-note': 'Credit note' };
/** Number prefixes: each kind counts on its own, gap-free, per workshop. */
export const DOCUMENT_PREFIX: Record<DocumentKind, string> = { receipt: 'RC', invoice: 'INV', 'credit-note': 'CN' };

export const PAYMENT_METHODS = ['card', 'bank-transfer', 'cash', 'cheque'] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
/** Methods staff record by hand (card payments come through the provider). */
export const MANUAL_METHODS = ['bank-transfer', 'cash', 'cheque'] as const;
export type ManualMethod = (typeof MANUAL_METHODS)[number];
export const PAYMENT_METHOD_LABELS: Record<PaymentMethod, string> = { card: 'Card', 'bank-transfer': 'Bank transfer', cash: 'Cash', cheque: 'Cheque' };

export const ENTRY_KINDS = ['payment', 'refund'] as const;
export type EntryKind = (typeof ENTRY_KINDS)[number];

/** When the owner lets an invoice be issued: once accepted, once the deposit is paid, or when the work is finished. */
export const INVOICE_STAGES = ['accepted', 'deposit-paid', 'finished'] as const;
export type InvoiceStage = (typeof INVOICE_STAGES)[number];
export const INVOICE_STAGE_LABELS: Record<InvoiceStage, string> = {
  accepted: 'As soon as the quote is accepted',
  'deposit-paid': 'Once the deposit is paid',
  finished: 'When the work is finished',
};

/** A decimal amount of money as typed: positive, at most two decimals. */
const amountSchema = z
  .string({ message: 'must be an amount like 125.50' })
  .trim()
  .regex(/^\d{1,11}(\.\d{1,2})?$/, { message: 'must be an amount like 125.50 (at most two decimals)' })
  .refine((s) => Number(s) > 0, { message: 'must be more than zero' });

export const RecordPaymentSchema = z
  .object({
    method: z.enum(MANUAL_METHODS, { message: `must be one of ${MANUAL_METHODS.join(', ')}` }),
    amount: amountSchema,
    receivedOn: dateSchema({ min: { daysFromToday: -366 }, max: { daysFromToday: 0 } }),
    reference: z.string().trim().max(120).default(''),
    note: z.string().trim().max(1000).default(''),
  })
  .strict();
export type RecordPayment = z.input<typeof RecordPaymentSchema>;

export const IssueInvoiceSchema = z.object({ note: z.string().trim().max(1000).default('') }).strict();

export const CreditNoteSchema = z
  .object({
    amount: amountSchema,
    reason: z.string().trim().min(3, { message: 'must say why, in a few words' }).max(1000),
    /** How money already paid beyond the new total is given back; needed when the credit is more than still owed. */
    refund: z
      .object({
        method: z.enum(MANUAL_METHODS, { message: `must be one of ${MANUAL_METHODS.join(', ')}` }),
        reference: z.string().trim().max(120).default(''),
      })
      .strict()
      .optional(),
  })
  .strict();
export type CreditNoteInput = z.input<typeof CreditNoteSchema>;

export const AccountSettingsSchema = z.object({ invoiceStage: z.enum(INVOICE_STAGES, { message: `must be one of ${INVOICE_STAGES.join(', ')}` }) }).strict();
export type AccountSettings = z.infer<typeof AccountSettingsSchema>;

export const AGEING_BUCKETS = ['0-30', '31-60', '60+'] as const;
export type AgeingBucket = (typeof AGEING_BUCKETS)[number];
export const AGEING_LABELS: Record<AgeingBucket, string> = { '0-30': '0–30 days', '31-60': '31–60 days', '60+': 'over 60 days' };

/** The bucket of a debt so many days old (from the invoice's date). */
export function ageingBucket(days: number): AgeingBucket {
  if (days <= 30) return '0-30';
  if (days <= 60) return '31-60';
  return '60+';
}

export const OwedQuerySchema = z.object({
  sort: z.enum(['age', 'balance', 'customer', 'invoice']).default('age'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  bucket: z.enum(AGEING_BUCKETS).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

export interface AccountFigures {
  currency: string;
  agreedTotal: string;
  credited: string;
  paid: string;
  refunded: string;
  balance: string;
}

export interface AccountDocumentDto {
  id: number;
  kind: DocumentKind;
  number: string;
  issuedAt: string;
  total: string;
  net: string;
  tax: string;
  taxLabel: string;
  taxPct: number;
  balanceDue: string;
  reason: string | null;
  /** A credit note: the invoice it credits. A receipt: the ledger entry it acknowledges. */
  againstNumber: string | null;
  mail: { status: 'queued' | 'sending' | 'sent' | 'failed'; to: string } | null;
}

export interface LedgerEntryDto {
  id: number;
  kind: EntryKind;
  method: PaymentMethod;
  amount: string;
  receivedOn: string;
  reference: string;
  note: string;
  receiptNumber: string | null;
  creditNoteNumber: string | null;
  recordedBy: string | null;
  createdAt: string;
}

export interface AccountDto {
  quote: { id: number; number: string; state: string; customer: { id: number; name: string; email: string | null } };
  jobs: { id: number; number: string; state: string; title: string }[];
  figures: AccountFigures;
  invoiceStage: InvoiceStage;
  /** Whether an invoice can be issued now, and if not why (in words). */
  invoice: { issued: string | null; canIssue: boolean; why: string | null };
  documents: AccountDocumentDto[];
  entries: LedgerEntryDto[];
}

export interface OwedRow {
  quoteId: number;
  quoteNumber: string;
  invoiceNumber: string;
  invoicedOn: string;
  ageDays: number;
  bucket: AgeingBucket;
  customer: { id: number; name: string };
  currency: string;
  invoiced: string;
  balance: string;
}

export interface OwedPage {
  rows: OwedRow[];
  total: number;
  totalCapped?: true;
  page: number;
  pageSize: number;
  /** What is owed in each bucket (all rows, not just the page), per currency. */
  buckets: { bucket: AgeingBucket; currency: string; count: number; amount: string }[];
}

/** What the customer sees of their account on their quote page: figures and documents, in plain words. */
export interface PublicAccount {
  currency: string;
  agreedTotal: string;
  paid: string;
  credited: string;
  balance: string;
  /** The customer may pay the balance by card now (deposit paid, something owed, card payments set up). */
  canPay: boolean;
  /** The workshop has an account ready to take card payments (false: the customer pays another way). */
  cardPayments: boolean;
  /** A card payment of the balance started and not finished or expired. */
  checkoutOpen: boolean;
  documents: { id: number; kind: DocumentKind; number: string; issuedOn: string; total: string }[];
}
