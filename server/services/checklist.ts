/**
 * The owner's first-run checklist, computed from the workshop's own data every time it is read:
 * - prices: every pack of every material the finishing systems use (and the shellac flakes and spirit the cuts are
 *   mixed from) has a current price above zero (a new workshop's packs start at zero: no price yet);
 * - labour rates: every labour rate is above zero;
 * - drying room: the owner has saved the settings page, where the drying room is, at least once (`workshop_setup`);
 * - polishers: at least one active polisher in planning.
 * The only thing kept for it is that small record, and whether the owner put the checklist away.
 */
import Decimal from 'decimal.js';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { CHECKLIST_LINKS, type Checklist, type ChecklistItem } from '@shared/schemas/signup';
import { today } from '@shared/time';
import { FinishingSystem, LabourRate, Polisher } from '../models';
import { loadSettings } from './catalog';

interface SetupRow {
  drying_room_saved_at: Date | null;
  checklist_dismissed_at: Date | null;
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

async function setupRow(sequelize: Sequelize): Promise<SetupRow | undefined> {
  const rows = await sequelize.query<SetupRow>('SELECT drying_room_saved_at, checklist_dismissed_at FROM workshop_setup', { type: QueryTypes.SELECT });
  return rows[0];
}

/** The material keys the finishing systems in use (not archived) draw on, with the shellac cut's own two. */
async function materialKeysInUse(): Promise<string[]> {
  const { settings } = await loadSettings();
  const keys = new Set<string>([settings.shellac.flakesMaterial, settings.shellac.spiritMaterial]);
  for (const system of await FinishingSystem.findAll({ where: { archived: false }, attributes: ['stages'] })) {
    for (const stage of system.stages) {
      if (stage.enabled === false) continue;
      for (const use of stage.materials ?? []) keys.add(use.material);
    }
  }
  return [...keys];
}

async function pricesItem(sequelize: Sequelize): Promise<ChecklistItem> {
  const keys = await materialKeysInUse();
  const rows = keys.length
    ? await sequelize.query<{ price: string | null }>(
        `SELECT (SELECT pp.price::text FROM pack_prices pp
                  WHERE pp.pack_id = p.id AND pp.effective_from <= :today
                  ORDER BY pp.effective_from DESC, pp.id DESC LIMIT 1) AS price
           FROM material_packs p JOIN materials m ON m.id = p.material_id
          WHERE m.key IN (:keys) AND NOT m.archived AND NOT p.archived`,
        { replacements: { keys, today: today() }, type: QueryTypes.SELECT },
      )
    : [];
  const missing = rows.filter((r) => r.price === null || new Decimal(r.price).lte(0)).length;
  const done = rows.length > 0 && missing === 0;
  return {
    key: 'prices',
    label: 'Enter what you pay for materials',
    detail: rows.length === 0 ? 'The finishing systems use no material with a pack yet.' : done ? `All ${plural(rows.length, 'pack', 'packs')} the finishing systems use have a price.` : `${missing} of ${plural(rows.length, 'pack', 'packs')} the finishing systems use have no price yet.`,
    done,
    link: CHECKLIST_LINKS.prices,
  };
}

async function labourItem(): Promise<ChecklistItem> {
  const rates = await LabourRate.findAll({ attributes: ['name', 'perHour'] });
  const zero = rates.filter((r) => new Decimal(r.perHour).lte(0));
  const done = rates.length > 0 && zero.length === 0;
  return {
    key: 'labourRates',
    label: 'Set your labour rates',
    detail: rates.length === 0 ? 'There is no labour rate yet.' : done ? `All ${plural(rates.length, 'rate is', 'rates are')} set.` : `Still at zero: ${zero.map((r) => r.name).join(', ')}.`,
    done,
    link: CHECKLIST_LINKS.labourRates,
  };
}

function dryingRoomItem(setup: SetupRow | undefined): ChecklistItem {
  const done = Boolean(setup?.drying_room_saved_at);
  return {
    key: 'dryingRoom',
    label: 'Check the drying room',
    detail: done ? 'Reviewed and saved on the settings page.' : 'How many cases or how much rack area it holds, and its temperature and humidity: check them and save the settings page.',
    done,
    link: CHECKLIST_LINKS.dryingRoom,
  };
}

async function polishersItem(): Promise<ChecklistItem> {
  const n = await Polisher.count({ where: { active: true } });
  return {
    key: 'polishers',
    label: 'Add the polishers',
    detail: n > 0 ? `${plural(n, 'polisher is', 'polishers are')} in planning.` : 'Add at least one polisher, with their hours, so that jobs can be booked.',
    done: n > 0,
    link: CHECKLIST_LINKS.polishers,
  };
}

export async function getChecklist(sequelize: Sequelize): Promise<Checklist> {
  const setup = await setupRow(sequelize);
  const items = [await pricesItem(sequelize), await labourItem(), dryingRoomItem(setup), await polishersItem()];
  return { items, allDone: items.every((i) => i.done), dismissed: Boolean(setup?.checklist_dismissed_at) };
}

/** Records that the owner saved the settings page with the drying room on it (in the caller's transaction). */
export async function markDryingRoomSaved(sequelize: Sequelize, userId: number, transaction: Transaction): Promise<void> {
  await sequelize.query(
    `INSERT INTO workshop_setup (drying_room_saved_at, drying_room_saved_by, updated_at) VALUES (now(), :userId, now())
     ON CONFLICT (workshop_id) DO UPDATE SET drying_room_saved_at = now(), drying_room_saved_by = :userId, updated_at = now()`,
    { replacements: { userId }, transaction },
  );
}

/** The owner puts the checklist away (or brings it back). */
export async function setChecklistDismissed(sequelize: Sequelize, userId: number, dismissed: boolean): Promise<Checklist> {
  await sequelize.query(
    `INSERT INTO workshop_setup (checklist_dismissed_at, checklist_dismissed_by, updated_at) VALUES (CASE WHEN :dismissed THEN now() END, :userId, now())
     ON CONFLICT (workshop_id) DO UPDATE SET checklist_dismissed_at = CASE WHEN :dismissed THEN now() END, checklist_dismissed_by = :userId, updated_at = now()`,
    { replacements: { userId, dismissed } },
  );
  return getChecklist(sequelize);
}
