/** What the owner edits on the settings page: the workshop's details, every setting, and the labour rates. */
import { z } from 'zod';
import { PriceInputSchema } from './price-list';
import { WorkshopSettingsSchema } from './workshop';

const optionalText = (max: number, message: string) =>
  z
    .string()
    .trim()
    .max(max, { message })
    .nullable()
    .transform((s) => (s ? s : null));

export const WorkshopUpdateSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(160, { message: 'must be at most 160 characters' }),
    email: optionalText(254, 'must be at most 254 characters').refine((s) => s === null || z.email().safeParse(s).success, {
      message: 'must be an e-mail address',
    }),
    phone: optionalText(40, 'must be at most 40 characters'),
    address: optionalText(500, 'must be at most 500 characters'),
    settings: WorkshopSettingsSchema,
  })
  .strict();
export type WorkshopUpdateInput = z.input<typeof WorkshopUpdateSchema>;

export interface LabourRateDto {
  id: number;
  key: string;
  name: string;
  /** Decimal string per hour, before tax. */
  perHour: string;
  updatedAt: string;
}

export const LabourRateUpdateSchema = z
  .object({
    name: z.string().trim().min(1, { message: 'is required' }).max(80).optional(),
    perHour: PriceInputSchema.optional(),
  })
  .strict();
export type LabourRateUpdateInput = z.input<typeof LabourRateUpdateSchema>;
