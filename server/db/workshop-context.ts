/**
 * The workshop a piece of work runs under. Row-level security (migration `2026.12.07T00.00`) shows and takes only
 * the rows of the workshop named by the connection setting `shellwright.workshop_id`; this module keeps that
 * workshop in an AsyncLocalStorage and writes it on every connection the pool hands out, before any query runs.
 *
 * - A request runs under the signed-in user's workshop (the route guard enters it); a public path enters the
 *   workshop it resolved from its token or event; background work enters each workshop in turn.
 * - A connection taken outside any workshop gets the empty setting: its queries see no row and cannot insert one.
 * - A transaction takes its connection once, at its start, so it runs wholly under the workshop it began in.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type { Sequelize } from 'sequelize';
import { isTimeZone, setTimeZoneSource } from '@shared/time';

interface Scope {
  workshopId: number | null;
  /** The workshop's time zone, once read in this unit of work. */
  timeZone?: string;
}

const storage = new AsyncLocalStorage<Scope>();

/**
 * Each workshop's time zone as last read by this process (its settings' `timeZone`): "today", the record numbers'
 * year and the reports' days follow the zone of the workshop the work runs under, never one process-wide zone.
 * Written whenever the settings are read (`loadSettings`) and on entering a request's scope when not known yet.
 */
const zones = new Map<number, string>();

function scopeTimeZone(): string | undefined {
  const scope = storage.getStore();
  if (!scope || scope.workshopId === null) return undefined;
  return scope.timeZone ?? zones.get(scope.workshopId);
}
setTimeZoneSource(scopeTimeZone);

/** Records the time zone of the workshop the current work runs under (from its settings, just read). */
export function noteWorkshopTimeZone(zone: string | undefined | null): boolean {
  const scope = storage.getStore();
  if (!scope || scope.workshopId === null || !zone || !isTimeZone(zone)) return false;
  scope.timeZone = zone;
  zones.set(scope.workshopId, zone);
  return true;
}

/**
 * Makes sure the clock knows the current workshop's time zone before a handler runs: undefined when it already
 * does (or there is no workshop), else a promise that reads it from the workshop's row (one small query, once per
 * workshop and process; `loadSettings` keeps it current afterwards).
 */
export function ensureWorkshopTimeZone(sequelize: Sequelize): Promise<void> | undefined {
  const scope = storage.getStore();
  if (!scope || scope.workshopId === null || scope.timeZone || zones.has(scope.workshopId)) return undefined;
  return sequelize
    .query<{ tz: string | null }>("SELECT settings->>'timeZone' AS tz FROM workshops WHERE id = :id", { replacements: { id: scope.workshopId }, type: 'SELECT' as never })
    .then((rows) => {
      noteWorkshopTimeZone((rows as unknown as { tz: string | null }[])[0]?.tz);
    });
}

/** Runs `fn` under a workshop (or explicitly under none, with `null`). */
export function runAsWorkshop<T>(workshopId: number | null, fn: () => T): T {
  return storage.run({ workshopId }, fn);
}

/** The workshop the current work runs under; undefined outside any scope. */
export function currentWorkshopId(): number | null | undefined {
  return storage.getStore()?.workshopId;
}

interface PgClient {
  query(sql: string, values?: unknown[]): Promise<unknown>;
}

const installed = new WeakSet<Sequelize>();

/** The workshop setting a pooled connection carries now. */
const CARRIED = Symbol('shellwright.workshop_id');

/**
 * Writes the workshop setting on every connection the pool hands out. `fallback` answers for work outside any scope
 * (only the test helpers give one, so that fixtures written outside a request land in the demo workshop); without it
 * such work runs under no workshop.
 */
export function installWorkshopSetting(sequelize: Sequelize, opts: { fallback?: () => Promise<number | null> } = {}): void {
  if (installed.has(sequelize)) return;
  installed.add(sequelize);
  sequelize.addHook('afterPoolAcquire', async (connection: unknown) => {
    const scope = storage.getStore();
    const id = scope ? scope.workshopId : opts.fallback ? await opts.fallback() : null;
    const value = id === null ? '' : String(id);
    // The setting is the connection's (not a transaction's: it is written here, before any BEGIN), so a connection
    // that already carries this workshop needs no round trip.
    const client = connection as PgClient & { [CARRIED]?: string };
    if (client[CARRIED] === value) return;
    client[CARRIED] = undefined;
    await client.query("SELECT set_config('shellwright.workshop_id', $1, false)", [value]);
    client[CARRIED] = value;
  });
}

/** Every workshop's id (through the owner's lookup function: the app itself cannot list workshops). */
export async function allWorkshopIds(sequelize: Sequelize): Promise<number[]> {
  const rows = await runAsWorkshop(null, () => sequelize.query<{ id: number }>('SELECT shellwright_workshop_ids() AS id', { type: 'SELECT' as never }));
  return (rows as unknown as { id: number }[]).map((r) => Number(r.id));
}

/** One workshop lookup function's answer (see the migration), or null when it finds none. */
export async function lookupWorkshop(sequelize: Sequelize, fn: 'user' | 'email' | 'quote_token' | 'variation_token' | 'payment_session' | 'payment_account' | 'reset' | 'email_confirmation' | 'invitation', value: string | number): Promise<number | null> {
  const rows = (await runAsWorkshop(null, () =>
    sequelize.query(`SELECT shellwright_workshop_of_${fn}(:value) AS id`, { type: 'SELECT' as never, replacements: { value } }),
  )) as unknown as { id: number | null }[];
  const id = rows[0]?.id;
  return id === null || id === undefined ? null : Number(id);
}
