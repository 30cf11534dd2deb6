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
