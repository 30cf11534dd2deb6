import { z } from 'zod';

export const WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
export type Weekday = (typeof WEEKDAYS)[number];

const time = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { message: 'must be a time like 08:30' });

/** Opening hours of one working day. */
export const WorkingDaySchema = z.object({ day: z.enum(WEEKDAYS), open: time, close: time });

/** The workshop's own settings: money, tax, display units and the working week. */
export const WorkshopSettingsSchema = z.object({
  currency: z.string().regex(/^[A-Z]{3}$/, { message: 'must be a three-letter currency code' }),
  taxRatePct: z.number().min(0).max(100),
  units: z.enum(['metric', 'imperial']),
  workingWeek: z.array(WorkingDaySchema).min(1, { message: 'needs at least one working day' }),
  closedDates: z.array(z.string().regex(/^\d{4}-\d{2}-\d{2}$/)).default([]),
});
export type WorkshopSettings = z.infer<typeof WorkshopSettingsSchema>;

export const WorkshopSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  address: z.string().nullable(),
  settings: WorkshopSettingsSchema,
});
export type Workshop = z.infer<typeof WorkshopSchema>;
