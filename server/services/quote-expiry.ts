/**
 * Quote expiry without writes on reads. A sent or opened quote past its valid-until day *reads* as expired
 * everywhere (quoteStateOn in JavaScript, the SQL expressions below in queries), and is *written* as expired, with
 * its estimates, by the writes that answer a quote and by a sweep the app runs every five minutes.
 */
import type { Sequelize, Transaction } from 'sequelize';
import { OPEN_QUOTE_STATES, QUOTE_MOVES, mirrorEstimate } from '@shared/schemas/state-moves';
import { today } from '@shared/time';
import { Quote } from '../models';
import { allWorkshopIds, runAsWorkshop } from '../db/workshop-context';
import { loadSettings } from './catalog';

/** How often the app writes down the quotes that ran out. */
export const EXPIRY_SWEEP_MS = 5 * 60_000;

const OPEN = OPEN_QUOTE_STATES.map((s) => `'${s}'`).join(', ');

function sqlDate(day: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(day)) throw new Error(`not a date: ${day}`);
  return `'${day}'::date`;
}

/** A quote's state as read today, in SQL (`q` is the quotes table's alias, or empty for the bare table). */
export function quoteStateSql(q = '', day: string = today()): string {
  const c = (col: string) => (q ? `${q}.${col}` : col);
  return `(CASE WHEN ${c('state')} IN (${OPEN}) AND ${c('valid_until')} < ${sqlDate(day)} THEN 'expired' ELSE ${c('state')} END)`;
}

/**
 * An estimate's state as read today, in SQL: a sent or opened estimate named by a sent or opened quote that ran out
 * reads as expired, as the sweep will write it (`e` is the estimates table's alias).
 */
export function estimateStateSql(e = 'e', day: string = today()): string {
  return `(CASE WHEN ${e}.state IN (${OPEN}) AND EXISTS (
      SELECT 1 FROM quote_lines xl JOIN quotes xq ON xq.id = xl.quote_id
       WHERE xl.estimate_id = ${e}.id AND xq.state IN (${OPEN}) AND xq.valid_until < ${sqlDate(day)})
    THEN 'expired' ELSE ${e}.state END)`;
}

/** Writes down the quotes past their date that nobody answered, and their estimates (the table's "expire" move). */
export async function expireQuotes(transaction?: Transaction): Promise<void> {
  const sequelize = Quote.sequelize!;
  const from = QUOTE_MOVES.expire.from.map((s) => `'${s}'`).join(', ');
  await sequelize.query(
    `WITH gone AS (
       UPDATE quotes SET state = :quoteTo, updated_at = now()
        WHERE state IN (${from}) AND valid_until < :today
        RETURNING id)
     UPDATE estimates SET state = :estimateTo, updated_at = now()
      WHERE id IN (SELECT l.estimate_id FROM quote_lines l JOIN gone g ON g.id = l.quote_id) AND state IN (${OPEN})`,
    { replacements: { today: today(), quoteTo: QUOTE_MOVES.expire.to, estimateTo: mirrorEstimate('quoted', 'expire') }, transaction },
  );
}

/**
 * Starts the sweep: once now (which also reads the workshop's time zone) and every EXPIRY_SWEEP_MS after. Returns
 * the function that stops it and waits for a sweep under way.
 */
export function startExpirySweep(sequelize: Sequelize, log: (err: unknown) => void = (err) => console.error('quote expiry sweep failed', err)): () => Promise<void> {
  let running: Promise<void> = Promise.resolve();
  let stopped = false;
  const sweep = () => {
    if (stopped) return;
    running = running
      .then(async () => {
        if (stopped) return;
        // Each workshop in turn, under its own row-level security scope and its own day.
        for (const workshopId of await allWorkshopIds(sequelize)) {
          if (stopped) return;
          await runAsWorkshop(workshopId, async () => {
            await loadSettings().catch(() => undefined);
            await sequelize.transaction((transaction) => expireQuotes(transaction));
          });
        }
      })
      .catch(log);
  };
  const timer = setInterval(sweep, EXPIRY_SWEEP_MS);
  timer.unref();
  sweep();
  return async () => {
    stopped = true;
    clearInterval(timer);
    await running;
  };
}
