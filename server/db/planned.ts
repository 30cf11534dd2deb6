/**
 * Reads whose query plan PostgreSQL keeps: a SELECT sent as a named prepared statement on the pooled connection,
 * so that the database plans it once per connection instead of on every request. For the lists and the detail the
 * planning took two to three times as long as running the query (about 1.7 ms against 0.6 ms for the estimates'
 * first page under row-level security); a kept plan takes a few microseconds.
 *
 * - `replacements` are written into the text as `sequelize.query` writes them (escaped); they decide the statement's
 *   shape (the sort, the page, a state), so each shape is its own statement. A statement with no parameters is
 *   planned once and that plan is kept.
 * - `bind` values are sent as parameters `$1…` (an id, a list of ids): PostgreSQL plans the first five runs for their
 *   values and then keeps a generic plan if it costs no more.
 * The connection still carries the workshop of the work that takes it (the pool's acquire hook of
 * workshop-context.ts runs as for any query), and row-level security applies as it does to every query: a plan
 * holds the policies' conditions, which read the connection's setting when the plan runs.
 *
 * A connection keeps at most MAX_STATEMENTS; past that it forgets them all (DEALLOCATE ALL) and starts again.
 */
import { createHash } from 'node:crypto';
import type { Sequelize, Transaction } from 'sequelize';
import sqlUtils from 'sequelize/lib/utils/sql';
import type * as SqlUtils from 'sequelize/lib/utils/sql';

// Sequelize's own writer of replacements (a CommonJS module whose names Node cannot see from ESM).
const { injectReplacements } = sqlUtils as unknown as typeof SqlUtils;

const MAX_STATEMENTS = 100;

interface PgClient {
  query(query: { name: string; text: string; values: unknown[] } | string): Promise<{ rows: unknown[] }>;
  connection?: { parsedStatements?: Record<string, string> };
  _queryQueue?: unknown[];
  _sentQueryQueue?: unknown[];
  _getActiveQuery?: () => unknown;
}

/** Nothing running or waiting on the connection (node-postgres's own queues; unknown counts as busy). */
function idle(client: PgClient): boolean {
  return typeof client._getActiveQuery === 'function' && !client._getActiveQuery() && client._queryQueue?.length === 0 && (client._sentQueryQueue?.length ?? 0) === 0;
}

interface ConnectionManager {
  getConnection(options: { type: 'SELECT' }): Promise<PgClient>;
  releaseConnection(connection: PgClient): void;
}

const statements = new WeakMap<PgClient, Set<string>>();

export interface PlannedOptions {
  replacements?: Record<string, unknown>;
  bind?: unknown[];
  transaction?: Transaction | null;
}

export async function plannedSelect<T>(sequelize: Sequelize, sql: string, { replacements, bind = [], transaction }: PlannedOptions = {}): Promise<T[]> {
  const internals = sequelize as unknown as { dialect: Parameters<typeof injectReplacements>[1]; options: { logging?: unknown }; connectionManager: ConnectionManager };
  const text = replacements ? injectReplacements(sql, internals.dialect, replacements as Parameters<typeof injectReplacements>[2]) : sql;
  const name = `sw_${createHash('sha1').update(text).digest('base64url')}`;
  const logging = internals.options.logging;
  if (typeof logging === 'function') (logging as (sql: string) => void)(`Executing (default): ${text}${bind.length > 0 ? ` -- with ${JSON.stringify(bind)}` : ''}`);
  const manager = internals.connectionManager;
  const client = transaction ? ((transaction as unknown as { connection: PgClient }).connection) : await manager.getConnection({ type: 'SELECT' });
  try {
    let names = statements.get(client);
    if (!names) statements.set(client, (names = new Set()));
    // Forgotten only while nothing else is queued on the connection (a transaction's reads may be): the client's
    // record of what is prepared is cleared as DEALLOCATE becomes the active query, so what follows prepares again.
    if (!names.has(name) && names.size >= MAX_STATEMENTS && idle(client)) {
      const forgetting = client.query('DEALLOCATE ALL');
      if (client.connection?.parsedStatements) client.connection.parsedStatements = {};
      names.clear();
      await forgetting;
    }
    const result = await client.query({ name, text, values: bind });
    names.add(name);
    return result.rows as T[];
  } finally {
    if (!transaction) manager.releaseConnection(client);
  }
}
