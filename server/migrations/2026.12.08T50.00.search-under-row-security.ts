/**
 * Text search that still reads the trigram indexes under row-level security.
 *
 * PostgreSQL refuses to use a condition as an index condition when it could leak the values of rows a policy hides
 * and a policy applies to the table: ILIKE (`texticlike`) is not marked LEAKPROOF (a pattern can raise an error
 * that depends on the data), so as the app's role every `%text%` search of migration `2026.12.03T17.10` read the
 * whole workshop's rows one by one instead of its trigram index (the selective estimates search at 10 000 estimates:
 * 1 ms as the owner, 126 ms as the app).
 *
 * These functions run the same matches as the owner (who is not bound by the policies, as the workshop lookups of
 * `2026.12.07T00.00`) with the workshop written in the query, where the planner combines it with the trigram
 * indexes. They read the workshop from the connection's own setting, so a caller can only search the workshop it
 * already runs under (none: no row), and they answer ids only; the caller's query then reads the rows under the
 * policies by id, which is leakproof and indexed. Called in a select list (`ARRAY(SELECT f(:like) LIMIT n)`) they
 * hand their ids over one at a time, so a LIMIT there stops the scan early.
 */
import type { MigrationContext } from '../db/migrator';

const WORKSHOP = "NULLIF(current_setting('shellwright.workshop_id', true), '')::integer";

/** [function, the table, the columns any of which may match]. */
const SEARCHES: [string, string, string[]][] = [
  ['shellwright_search_estimates', 'estimates', ['number', 'title']],
  ['shellwright_search_customer_names', 'customers', ['name']],
  ['shellwright_search_customers', 'customers', ['name', 'email', 'phone']],
  ['shellwright_search_pieces', 'pieces', ['description']],
  ['shellwright_search_quotes', 'quotes', ['number', 'recipient']],
];

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    for (const [fn, table, columns] of SEARCHES) {
      await sequelize.query(
        `CREATE FUNCTION ${fn}(p_like text) RETURNS SETOF integer
           LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
           AS $$ SELECT id FROM ${table} WHERE workshop_id = ${WORKSHOP} AND (${columns.map((c) => `${c} ILIKE p_like`).join(' OR ')}) $$`,
        { transaction },
      );
    }
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    for (const [fn] of SEARCHES) await sequelize.query(`DROP FUNCTION IF EXISTS ${fn}(text)`, { transaction });
  });
}
