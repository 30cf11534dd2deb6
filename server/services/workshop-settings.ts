/**
 * The owner's settings page: the workshop's details and every setting the estimator and quotes read, and the
 * labour rates. Cross-checks that only the database can make (a rate or material that must exist) answer 400
 * naming the field, like the schema's own checks.
 */
import { isRealDate } from '@shared/schemas/dates';
import { Op, type Sequelize } from 'sequelize';
import { validationSentence } from '@shared/schemas/error-map';
import type { Workshop as WorkshopDto } from '@shared/schemas/workshop';
import type { LabourRateDto, LabourRateUpdateSchema, WorkshopUpdateSchema } from '@shared/schemas/workshop-admin';
import type { z } from 'zod';
import { HttpProblem, problems } from '../http/problem';
import { LabourRate, Material, MaterialPack } from '../models';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { showPrice } from './price-list';
import { markDryingRoomSaved } from './checklist';

type FieldError = { field: string; message: string };

function invalid(errors: FieldError[]): HttpProblem {
  const first = errors[0]!;
  return new HttpProblem(400, 'validation_failed', 'Invalid input', validationSentence(first.field.split('.'), first.message), { field: first.field, errors });
}

/** Flattens nested settings into dotted paths, so the audit log keeps only what changed. */
function flatten(value: unknown, prefix = '', out: Record<string, unknown> = {}): Record<string, unknown> {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const [k, v] of Object.entries(value)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  } else {
    out[prefix] = value;
  }
  return out;
}

/** The fields that differ between two objects, as {before, after} keyed by dotted path. */
export function changedFields(before: unknown, after: unknown): { before: Record<string, unknown>; after: Record<string, unknown> } {
  const a = flatten(before);
  const b = flatten(after);
  const out = { before: {} as Record<string, unknown>, after: {} as Record<string, unknown> };
  for (const key of new Set([...Object.keys(a), ...Object.keys(b)])) {
    if (JSON.stringify(a[key]) !== JSON.stringify(b[key])) {
      out.before[key] = a[key] ?? null;
      out.after[key] = b[key] ?? null;
    }
  }
  return out;
}

export async function getWorkshopForOwner(): Promise<WorkshopDto> {
  const { workshop } = await loadSettings();
  return workshop.toDto();
}

export async function updateWorkshop(sequelize: Sequelize, actorId: number, input: z.output<typeof WorkshopUpdateSchema>): Promise<WorkshopDto> {
  const s = input.settings;
  const errors: FieldError[] = [];
  const days = new Map<string, number>();
  s.calendar.workingWeek.forEach((d, i) => {
    if (days.has(d.day)) errors.push({ field: `settings.calendar.workingWeek.${i}.day`, message: `${d.day} is listed twice` });
    days.set(d.day, i);
  });
  s.calendar.closedDates.forEach((date, i) => {
    if (!isRealDate(date)) errors.push({ field: `settings.calendar.closedDates.${i}`, message: 'is not a real date' });
  });
  const rate = await LabourRate.findOne({ where: { key: s.pricing.polisherRate } });
  if (!rate) errors.push({ field: 'settings.pricing.polisherRate', message: `must be one of the labour rates (no rate "${s.pricing.polisherRate}")` });
  for (const field of ['flakesMaterial', 'spiritMaterial'] as const) {
    const material = await Material.findOne({ where: { key: s.shellac[field], archived: false } });
    const packs = material ? await MaterialPack.count({ where: { materialId: material.id, archived: false } }) : 0;
    if (!material || packs === 0) errors.push({ field: `settings.shellac.${field}`, message: `must be a material in the price list with a pack (no "${s.shellac[field]}")` });
  }
  if (errors.length > 0) throw invalid(errors);

  return sequelize.transaction(async (transaction) => {
    const { workshop } = await loadSettings(transaction);
    const before = workshop.toDto();
    workshop.set({ name: input.name, email: input.email, phone: input.phone, address: input.address, settings: input.settings });
    workshop.changed('settings', true);
    await workshop.save({ transaction });
    // The settings page shows the drying room: saving it counts as the owner having reviewed it (first-run checklist).
    await markDryingRoomSaved(sequelize, actorId, transaction);
    const after = workshop.toDto();
    const diff = changedFields({ ...before, id: undefined }, { ...after, id: undefined });
    if (Object.keys(diff.after).length > 0) {
      await audit({ userId: actorId, action: 'workshop.update', entityType: 'workshop', entityId: workshop.id, before: diff.before, after: diff.after }, transaction);
    }
    return after;
  });
}

function rateDto(r: LabourRate): LabourRateDto {
  return { id: r.id, key: r.key, name: r.name, perHour: showPrice(r.perHour), updatedAt: r.updatedAt.toISOString() };
}

export async function listRates(): Promise<LabourRateDto[]> {
  return (await LabourRate.findAll({ order: [['id', 'ASC']] })).map(rateDto);
}

export async function updateRate(sequelize: Sequelize, actorId: number, id: number, input: z.output<typeof LabourRateUpdateSchema>): Promise<LabourRateDto> {
  return sequelize.transaction(async (transaction) => {
    const rate = await LabourRate.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!rate) throw problems.notFound('Labour rate');
    const before = { name: rate.name, perHour: showPrice(rate.perHour) };
    if (input.name !== undefined) {
      const clash = await LabourRate.findOne({ where: { name: input.name, id: { [Op.ne]: id } }, transaction });
      if (clash) throw problems.badRequest('rate_name_taken', 'another rate already has that name', 'name');
      rate.name = input.name;
    }
    if (input.perHour !== undefined) rate.perHour = input.perHour;
    await rate.save({ transaction });
    const after = { name: rate.name, perHour: showPrice(rate.perHour) };
    if (JSON.stringify(before) !== JSON.stringify(after)) {
      await audit({ userId: actorId, action: 'labour-rate.update', entityType: 'labour-rate', entityId: id, before, after }, transaction);
    }
    return rateDto(rate);
  });
}
