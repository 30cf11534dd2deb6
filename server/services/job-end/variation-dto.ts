import type { VariationDto } from '@shared/schemas/job-end';
import type { JobVariation } from '../../models';

/** A variation for staff (`staff` adds the engine's working behind the price; the customer never gets it). */
export function variationDto(v: JobVariation, currency: string, staff: boolean): VariationDto {
  const w = v.working as { labourHours?: number; materialsCost?: string; labourCost?: string } | null;
  return {
    id: v.id,
    title: v.title,
    description: v.description,
    pricedBy: v.pricedBy,
    price: Number(v.price).toFixed(2),
    currency,
    hours: Number(v.hours),
    state: v.state,
    sentAt: v.sentAt?.toISOString() ?? null,
    answeredAt: v.answeredAt?.toISOString() ?? null,
    answerNote: v.answerNote ?? null,
    working: staff && w ? { labourHours: w.labourHours ?? 0, materialsCost: w.materialsCost ?? '0.00', labourCost: w.labourCost ?? '0.00' } : null,
  };
}
