/** The owner's reports: a chosen period and what each report returns. */
import { z } from 'zod';
import { dateSchema } from './dates';

const periodDate = dateSchema({ example: '2026-12-01' });

/** A period of whole days, both ends included; at most three years. */
export const PeriodSchema = z
  .object({ from: periodDate, to: periodDate })
  .strict()
  .superRefine((p, ctx) => {
    if (p.to < p.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be on or after the start of the period' });
    else if (Date.parse(`${p.to}T00:00:00Z`) - Date.parse(`${p.from}T00:00:00Z`) > 3 * 366 * 86_400_000) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'must be within three years of the start' });
    }
  });
export type Period = z.output<typeof PeriodSchema>;

export interface QuoteMonth {
  /** YYYY-MM */
  month: string;
  sent: number;
  opened: number;
  accepted: number;
  declined: number;
  expired: number;
}

export interface QuotesReport {
  from: string;
  to: string;
  months: QuoteMonth[];
  totals: Omit<QuoteMonth, 'month'>;
  /** Of the quotes sent in the period, the share accepted (deposit paid counts as accepted); null when none sent. */
  conversionPct: number | null;
  /** Days from sending to the customer's answer (accept or decline), for quotes sent in the period and answered. */
  decide: { answered: number; medianDays: number | null; meanDays: number | null };
}

export interface CapacityWeek {
  /** Monday of the week. */
  week: string;
  /** Bay-days (or m²-days) taken and there to take. */
  roomBooked: number;
  roomAvailable: number;
  roomPct: number | null;
  polisherHoursBooked: number;
  polisherHoursAvailable: number;
  polisherPct: number | null;
  /** Before the current week. */
  past: boolean;
}

export interface CapacityReport {
  from: string;
  to: string;
  today: string;
  roomUnit: 'bays' | 'm²';
  weeks: CapacityWeek[];
  /** Weeks fully behind today and weeks from the current one on, in the period. */
  weeksBehind: number;
  weeksAhead: number;
}

export interface MoneyMonth {
  /** YYYY-MM */
  month: string;
  /** Tax invoices issued in the month, tax included, and credit notes issued against them. */
  invoiced: string;
  credited: string;
  /** Payments received in the month (on the day received), refunds made, and what was kept: received − refunded. */
  received: string;
  refunded: string;
  net: string;
}

/** An agreement whose work is not finished, holding what the customer has paid so far. */
export interface HeldDeposit {
  quoteId: number;
  quoteNumber: string;
  customer: string;
  agreedTotal: string;
  held: string;
  /** Jobs still to finish (none yet when the work has not been planned). */
  openJobs: string[];
  depositPaidOn: string | null;
}

export interface MoneyReport {
  from: string;
  to: string;
  currency: string;
  months: MoneyMonth[];
  totals: Omit<MoneyMonth, 'month'>;
  /** Now, whatever the period: money held against work not yet done. */
  held: { count: number; amount: string; rows: HeldDeposit[] };
  /** Now, whatever the period: what customers owe on invoices, by age (the "Owed to us" list's figures). */
  owed: {
    total: string;
    buckets: { bucket: '0-30' | '31-60' | '60+'; count: number; amount: string }[];
    rows: { quoteId: number; quoteNumber: string; invoiceNumber: string; invoicedOn: string; ageDays: number; bucket: '0-30' | '31-60' | '60+'; customer: string; balance: string }[];
  };
}

/** One line of the accounting export: a tax invoice, a credit note, a payment received or a refund made. */
export interface AccountingLine {
  type: 'invoice' | 'credit-note' | 'payment' | 'refund';
  /** INV-, CN- or the payment's receipt RC- number. */
  number: string | null;
  date: string;
  customer: string;
  quoteNumber: string;
  /** Credit notes and refunds are negative. */
  net: string | null;
  tax: string | null;
  taxPct: number | null;
  total: string;
  currency: string;
  method: string | null;
  reference: string | null;
  /** A credit note's invoice. */
  against: string | null;
}
