import { z } from 'zod';
import { FactorsSchema, PricingSchema, SafetySettingsSchema, ShellacSettingsSchema, WorkingCalendarSchema } from './catalog';
import { LENGTH_UNITS, UNIT_SYSTEMS, VOLUME_MEASURES } from '../unit-names';
import { isTimeZone } from '../time';

export { CALENDAR_WEEKDAYS as WEEKDAYS } from './catalog';

/** The drying room: how many cases it holds (bays) or how much rack area, and its climate set points. */
export const DryingRoomSchema = z.object({
  mode: z.enum(['bays', 'area']),
  bays: z.number().int().min(1).max(500),
  rackAreaM2: z.number().positive().max(10_000),
  temperatureC: z.number().min(-10).max(50),
  humidityPct: z.number().min(0).max(100),
});
export type DryingRoom = z.infer<typeof DryingRoomSchema>;

/**
 * The workshop's own settings: display units, how prices are built, the working calendar, the finishing room
 * for the safety figures, the drying room and quotes. Everything the estimator reads besides the price list.
 */
export const WorkshopSettingsSchema = z.object({
  units: z.enum(UNIT_SYSTEMS),
  /** Imperial display of volumes: US pints and fluid ounces, or imperial (UK) ones. */
  imperialVolumes: z.enum(VOLUME_MEASURES).default('us'),
  defaultLengthUnit: z.enum(LENGTH_UNITS),
  pricing: PricingSchema,
  /** Show prices to customers with tax included. */
  pricesIncludeTax: z.boolean(),
  factors: FactorsSchema,
  calendar: WorkingCalendarSchema,
  shellac: ShellacSettingsSchema,
  safety: SafetySettingsSchema,
  dryingRoom: DryingRoomSchema,
  quoteValidityDays: z.number().int().min(1).max(365),
  paperSize: z.enum(['A4', 'Letter']),
  /**
   * The workshop's time zone (IANA name): what "today" means for quotes, prices and the board. Stored for every
   * workshop (migration 2026.12.04T19.00); a client that leaves it out keeps the workshop on DEFAULT_TIME_ZONE.
   */
  timeZone: z.string().refine(isTimeZone, { message: 'must be a time zone name like Europe/London' }).optional(),
  /** The country the workshop works in (ISO 3166-1 alpha-2), given at sign-up; older workshops have none. */
  country: z.string().regex(/^[A-Z]{2}$/, { message: 'must be a two-letter country code' }).optional(),
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
