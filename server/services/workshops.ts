/**
 * Creating a workshop. The app's role sees only the workshop it runs under (row-level security on `workshops` is by
 * `id`), so a new workshop takes its id from the sequence first and is then written under that id.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { currentWorkshopId, runAsWorkshop } from '../db/workshop-context';
import { Workshop } from '../models';

export interface NewWorkshop {
  name: string;
  email: string | null;
  phone: string | null;
  address: string | null;
  settings: WorkshopSettings;
}

/** Reserves a workshop id (the sequence is granted to the app's role; no row is visible yet). */
export async function reserveWorkshopId(sequelize: Sequelize): Promise<number> {
  const [row] = await runAsWorkshop(null, () => sequelize.query<{ id: number }>("SELECT nextval('workshops_id_seq')::integer AS id", { type: QueryTypes.SELECT }));
  return Number(row!.id);
}

/** Writes the workshop row under its own id: call inside `runAsWorkshop(id, …)`, in the caller's transaction. */
export async function insertWorkshop(id: number, fields: NewWorkshop, transaction?: Transaction): Promise<Workshop> {
  return Workshop.create({ id, ...fields }, { transaction });
}

/** A new workshop with its row only (defaults come from the seeders' `ensureDefaults`). Answers its id. */
export async function createWorkshop(sequelize: Sequelize, fields: NewWorkshop): Promise<number> {
  const id = await reserveWorkshopId(sequelize);
  await runAsWorkshop(id, () => insertWorkshop(id, fields));
  return id;
}

/**
 * The workshop the current work runs under (a request's, a public link's, a background unit's): read by the scope's
 * id, never "the first workshop". Row-level security shows no other; outside any scope this is whatever workshop the
 * connection's setting names (none in the app), so callers treat null as not found.
 */
export async function currentWorkshop(transaction?: Transaction): Promise<Workshop | null> {
  const id = currentWorkshopId();
  return id === undefined ? Workshop.findOne({ transaction }) : id === null ? null : Workshop.findByPk(id, { transaction });
}
