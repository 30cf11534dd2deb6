/**
 * Defaults every workshop starts with, demo or not: the preset wood species and finishing systems, the standard
 * materials (packs without prices until the owner enters them) and the labour rates; `DEFAULT_SETTINGS` for a new
 * workshop's row. Idempotent and additive: it only fills in what is missing and never overwrites the owner's edits.
 */
import type { Sequelize, Transaction } from 'sequelize';
import { DEFAULT_FACTORS, DEFAULT_SHELLAC, DEFAULT_SPECIES, DEFAULT_SYSTEMS } from '@shared/calc';
import { DEMO_MATERIALS } from '@shared/calc/presets/demo-materials';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { addDays, DEFAULT_TIME_ZONE, today } from '@shared/time';
import { FinishingSystem, LabourRate, Material, MaterialPack, PackPrice, Species } from '../models';

/** Settings of a new workshop (the owner reviews them on the settings page). */
export const DEFAULT_SETTINGS: WorkshopSettings = {
  units: 'metric',
  imperialVolumes: 'us',
  defaultLengthUnit: 'mm',
  pricing: {
    currency: 'GBP',
    polisherRate: 'polisher',
    markupPct: 20,
    materialsCharge: 'whole-packs',
    overheadPct: 10,
    marginPct: 10,
    taxPct: 20,
    taxLabel: 'VAT',
    roundTo: '1',
    depositPct: 25,
    wastePct: 10,
    maxDiscountPct: 10,
  },
  pricesIncludeTax: true,
  factors: DEFAULT_FACTORS,
  calendar: {
    workingWeek: (['mon', 'tue', 'wed', 'thu', 'fri'] as const).map((day) => ({ day, open: '08:00', close: '17:00' })),
    closedDates: [],
  },
  shellac: DEFAULT_SHELLAC,
  safety: { room: { volumeM3: 60, airChangesPerHour: 4 }, mixingFactor: 3, spirit: { ethanol: 0.95, methanol: 0.05, isopropanol: 0 } },
  dryingRoom: { mode: 'bays', bays: 3, rackAreaM2: 12, temperatureC: 20, humidityPct: 55 },
  quoteValidityDays: 30,
  paperSize: 'A4',
  timeZone: DEFAULT_TIME_ZONE,
};

/** Inserts the preset species and systems whose keys are missing. */
async function presets(transaction: Transaction): Promise<number> {
  let added = 0;
  for (const s of DEFAULT_SPECIES) {
    const [, created] = await Species.findOrCreate({
      where: { key: s.key },
      defaults: { key: s.key, name: s.name, pores: s.pores, needsGrainFill: s.needsGrainFill, absorbency: s.absorbency },
      transaction,
    });
    if (created) added++;
  }
  for (const system of DEFAULT_SYSTEMS) {
    const [, created] = await FinishingSystem.findOrCreate({
      where: { key: system.key },
      defaults: { key: system.key, name: system.name, description: system.description, stages: structuredClone([...system.stages]), preset: true },
      transaction,
    });
    if (created) added++;
  }
  return added;
}

/**
 * The day the zero placeholder prices count from: the day before today in UTC, which is today or earlier on every
 * clock (zones run from UTC−12 to UTC+14). Dated "today" in the zone the defaults were written under, they would not
 * yet count for a workshop whose zone is a day behind it (a new workshop that then sets a zone west of its first one),
 * and its price list would read as incomplete until that zone's tomorrow.
 */
export function placeholderPriceDay(now: Date = new Date()): string {
  return addDays(today('UTC', now), -1);
}

/** Materials the presets use, with their pack sizes; prices stay at zero until the owner enters them. */
async function materials(transaction: Transaction): Promise<void> {
  if ((await Material.count({ transaction })) > 0) return;
  const effectiveFrom = placeholderPriceDay();
  for (const m of DEMO_MATERIALS) {
    const material = await Material.create({ key: m.key, name: m.name, kind: m.kind, unit: m.unit }, { transaction });
    for (const p of m.packs) {
      const pack = await MaterialPack.create({ materialId: material.id, size: p.size, label: p.label ?? '', supplierCode: null }, { transaction });
      await PackPrice.create({ packId: pack.id, price: '0', effectiveFrom, userId: null, source: 'default' }, { transaction });
    }
  }
}

/**
 * Fills in the defaults of the workshop the caller runs under (`runAsWorkshop`). The workshop's row comes first, from
 * `createWorkshop` (sign-up, the demo, `npm run user:add -- … --new-workshop`); this never makes one. With `outer`,
 * inside the caller's transaction (the sign-up writes the workshop, its defaults and its owner as one); otherwise in
 * a transaction of its own.
 */
export async function ensureDefaults(sequelize: Sequelize, outer?: Transaction): Promise<void> {
  const fill = async (transaction: Transaction) => {
    await presets(transaction);
    await materials(transaction);
    for (const rate of [
      { key: 'polisher', name: 'French polisher' },
      { key: 'apprentice', name: 'Apprentice' },
    ]) {
      await LabourRate.findOrCreate({ where: { key: rate.key }, defaults: { ...rate, perHour: '0' }, transaction });
    }
  };
  if (outer) await fill(outer);
  else await sequelize.transaction(fill);
}
