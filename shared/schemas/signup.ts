/**
 * Public sign-up of a new workshop by its owner, the e-mailed confirmation of the owner's address, and the owner's
 * first-run checklist.
 */
import { z } from 'zod';
import { isCountryCode, isCurrencyCode } from '../countries';
import { isTimeZone } from '../time';
import { UNIT_SYSTEMS } from '../unit-names';
import { PasswordSchema } from './auth';

const required = (max: number) => z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(max, { message: `must be at most ${max} characters` });

const email = z
  .string({ message: 'is required' })
  .trim()
  .min(1, { message: 'is required' })
  .toLowerCase()
  .pipe(z.email({ message: 'must be an e-mail address' }))
  .pipe(z.string().max(254, { message: 'must be at most 254 characters' }));

/** The sign-up form: the workshop, its money and measures, and the owner's own account. */
export const SignupSchema = z
  .object({
    workshopName: required(160),
    country: z.string({ message: 'is required' }).trim().toUpperCase().refine(isCountryCode, { message: 'must be a country from the list' }),
    currency: z.string({ message: 'is required' }).trim().toUpperCase().refine(isCurrencyCode, { message: 'must be a currency code like GBP, EUR or USD' }),
    taxLabel: required(40),
    taxPct: z.number({ message: 'must be a number' }).min(0, { message: 'must be at least 0' }).max(100, { message: 'must be at most 100' }),
    pricesIncludeTax: z.boolean({ message: 'must be yes or no' }),
    units: z.enum(UNIT_SYSTEMS, { message: 'must be metric or imperial' }),
    timeZone: z.string().refine(isTimeZone, { message: 'must be a time zone name like Europe/London' }).optional(),
    ownerName: required(120),
    email,
    password: PasswordSchema,
  })
  .strict();
export type Signup = z.output<typeof SignupSchema>;
export type SignupInput = z.input<typeof SignupSchema>;

/** What a sign-up answers: where the confirmation link went. */
export interface SignupResult {
  email: string;
  message: string;
}

const token = z.string({ message: 'is required' }).regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'is not a link we sent' });

export const ConfirmEmailSchema = z.object({ token }).strict();
export type ConfirmEmailInput = z.input<typeof ConfirmEmailSchema>;

export const ResendConfirmationSchema = z.object({ email }).strict();
export type ResendConfirmationInput = z.input<typeof ResendConfirmationSchema>;

/** One thing a new workshop sets up before its estimates can be trusted. */
export const CHECKLIST_ITEMS = ['prices', 'labourRates', 'dryingRoom', 'polishers'] as const;
export type ChecklistItemKey = (typeof CHECKLIST_ITEMS)[number];

/** The page that does each item (client paths, as in src/config/paths.ts). */
export const CHECKLIST_LINKS: Record<ChecklistItemKey, string> = {
  prices: '/price-list',
  labourRates: '/settings',
  dryingRoom: '/settings',
  polishers: '/planning',
};

export interface ChecklistItem {
  key: ChecklistItemKey;
  label: string;
  /** What is done or left, in plain words ("9 of 24 packs have no price yet"). */
  detail: string;
  done: boolean;
  /** The client path of the page that does it. */
  link: string;
}

export interface Checklist {
  items: ChecklistItem[];
  allDone: boolean;
  /** The owner put the checklist away before it was done. */
  dismissed: boolean;
}
