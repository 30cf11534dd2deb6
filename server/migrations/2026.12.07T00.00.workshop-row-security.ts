import { QueryTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * Many workshops on one database, kept apart by PostgreSQL itself (row-level security).
 *
 * Generic over the schema: every base table of `public` except the truly global ones (the migrations table, the
 * session store, the sign-in limits) gets
 * - a `workshop_id integer` (added where missing, filled from the one workshop there was, NOT NULL, a foreign key to
 *   `workshops`, and marked with a comment so that `down` removes exactly the columns it added);
 * - a DEFAULT read from the per-connection setting `shellwright.workshop_id`, so every INSERT the code already makes
 *   lands in the workshop it runs under;
 * - ENABLE and FORCE ROW LEVEL SECURITY, and one policy `workshop_isolation`: a row is seen and written only when its
 *   `workshop_id` is the setting's. Without the setting a query sees nothing.
 * `workshops` itself is isolated on its `id`.
 *
 * Codes and numbers that were unique across the table become unique per workshop (species, finishing systems,
 * materials and rates by key; estimates, quotes, jobs and purchase orders by number). E-mail addresses stay unique
 * across the service (one sign-in page for everyone); tokens and payment session ids stay globally unique (random).
 *
 * Public paths (a customer's signed link, a webhook, a password reset, sign-in itself) first learn their workshop
 * from SECURITY DEFINER functions (they run as the owner, who bypasses row-level security) and then run under it.
 *
 * Tables created by later migrations are NOT covered by this one: `tests/api/row-security.test.ts` fails for any
 * table of `public` without forced row-level security, so a later migration must add its own policy.
 */

/** Tables shared by every workshop: no workshop column, no policy. */
export const GLOBAL_TABLES = ['schema_migrations', 'SequelizeMeta', 'session', 'login_attempts'] as const;

/** The setting the policies and defaults read; empty or unset means "no workshop" (NULL): nothing is visible. */
const SETTING = "NULLIF(current_setting('shellwright.workshop_id', true), '')::integer";

const ADDED_COMMENT = 'shellwright: added by the workshop row-security migration';

/** Constraints unique across the table that become unique per workshop: [table, old constraint, columns]. */
const PER_WORKSHOP_UNIQUE: [string, string, string][] = [
  ['species', 'species_key_key', 'key'],
  ['finishing_systems', 'finishing_systems_key_key', 'key'],
  ['materials', 'materials_key_key', 'key'],
  ['labour_rates', 'labour_rates_key_key', 'key'],
  ['estimates', 'estimates_number_key', 'number'],
  ['quotes', 'quotes_number_key', 'number'],
  ['jobs', 'jobs_number_key', 'number'],
  ['purchase_orders', 'purchase_orders_number_key', 'number'],
];

async function tablesOf(sequelize: MigrationContext['sequelize']): Promise<{ table: string; hasColumn: boolean }[]> {
  const rows = await sequelize.query<{ table_name: string; has_column: boolean }>(
    `SELECT t.table_name,
            EXISTS (SELECT 1 FROM information_schema.columns c
                     WHERE c.table_schema = 'public' AND c.table_name = t.table_name AND c.column_name = 'workshop_id') AS has_column
       FROM information_schema.tables t
      WHERE t.table_schema = 'public' AND t.table_type = 'BASE TABLE' AND t.table_name NOT IN (:globals)
      ORDER BY t.table_name`,
    { type: QueryTypes.SELECT, replacements: { globals: [...GLOBAL_TABLES] } },
  );
  return rows.map((r) => ({ table: r.table_name, hasColumn: r.has_column }));
}

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    const [first] = await sequelize.query<{ id: number | null }>('SELECT min(id) AS id FROM workshops', { type: QueryTypes.SELECT, transaction });
    const firstId = first?.id ?? null;

    for (const { table, hasColumn } of await tablesOf(sequelize)) {
      const t = q(table);
      if (table === 'workshops') {
        await run(`ALTER TABLE workshops ENABLE ROW LEVEL SECURITY`);
        await run(`ALTER TABLE workshops FORCE ROW LEVEL SECURITY`);
        await run(`CREATE POLICY workshop_isolation ON workshops USING (id = ${SETTING}) WITH CHECK (id = ${SETTING})`);
        continue;
      }
      if (!hasColumn) {
        await run(`ALTER TABLE ${t} ADD COLUMN workshop_id integer`);
        await run(`COMMENT ON COLUMN ${t}.workshop_id IS '${ADDED_COMMENT}'`);
        const [count] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM ${t}`, { type: QueryTypes.SELECT, transaction });
        if (Number(count?.n ?? 0) > 0) {
          if (firstId === null) throw new Error(`table ${table} has rows but there is no workshop to give them`);
          await run(`UPDATE ${t} SET workshop_id = ${Number(firstId)}`);
        }
        await run(`ALTER TABLE ${t} ALTER COLUMN workshop_id SET NOT NULL`);
        await run(`ALTER TABLE ${t} ADD CONSTRAINT ${q(`${table}_workshop_fk`)} FOREIGN KEY (workshop_id) REFERENCES workshops (id) ON DELETE CASCADE`);
        await run(`CREATE INDEX ${q(`${table}_workshop_idx`)} ON ${t} (workshop_id)`);
      }
      await run(`ALTER TABLE ${t} ALTER COLUMN workshop_id SET DEFAULT ${SETTING}`);
      await run(`ALTER TABLE ${t} ENABLE ROW LEVEL SECURITY`);
      await run(`ALTER TABLE ${t} FORCE ROW LEVEL SECURITY`);
      await run(`CREATE POLICY workshop_isolation ON ${t} USING (workshop_id = ${SETTING}) WITH CHECK (workshop_id = ${SETTING})`);
    }

    for (const [table, constraint, column] of PER_WORKSHOP_UNIQUE) {
      await run(`ALTER TABLE ${q(table)} DROP CONSTRAINT ${q(constraint)}`);
      await run(`ALTER TABLE ${q(table)} ADD CONSTRAINT ${q(`${table}_workshop_${column}`)} UNIQUE (workshop_id, ${q(column)})`);
    }

    // Lookups for paths that do not know their workshop yet. They run as the owner (who bypasses row-level
    // security) and answer one workshop id, never a row.
    await run(`
      CREATE FUNCTION shellwright_workshop_of_user(p_user_id integer) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM users WHERE id = p_user_id $$`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_email(p_email text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM users WHERE lower(email) = lower(p_email) $$`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_quote_token(p_token_hash text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM quotes WHERE token_hash = p_token_hash $$`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_payment_session(p_session_id text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM payments WHERE provider_session_id = p_session_id $$`);
    await run(`
      CREATE FUNCTION shellwright_workshop_of_reset(p_token_hash text) RETURNS integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT workshop_id FROM password_resets WHERE token_hash = p_token_hash $$`);
    await run(`
      CREATE FUNCTION shellwright_workshop_ids() RETURNS SETOF integer
        LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public
        AS $$ SELECT id FROM workshops ORDER BY id $$`);
  });
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const run = (sql: string) => sequelize.query(sql, { transaction });
    for (const fn of ['workshop_of_user(integer)', 'workshop_of_email(text)', 'workshop_of_quote_token(text)', 'workshop_of_payment_session(text)', 'workshop_of_reset(text)', 'workshop_ids()']) {
      await run(`DROP FUNCTION IF EXISTS shellwright_${fn}`);
    }
    for (const [table, constraint, column] of PER_WORKSHOP_UNIQUE) {
      await run(`ALTER TABLE ${q(table)} DROP CONSTRAINT ${q(`${table}_workshop_${column}`)}`);
      await run(`ALTER TABLE ${q(table)} ADD CONSTRAINT ${q(constraint)} UNIQUE (${q(column)})`);
    }
    for (const { table, hasColumn } of await tablesOf(sequelize)) {
      const t = q(table);
      await run(`DROP POLICY IF EXISTS workshop_isolation ON ${t}`);
      await run(`ALTER TABLE ${t} NO FORCE ROW LEVEL SECURITY`);
      await run(`ALTER TABLE ${t} DISABLE ROW LEVEL SECURITY`);
      if (!hasColumn) continue;
      const [added] = await sequelize.query<{ added: boolean }>(
        `SELECT col_description(:table::regclass, a.attnum) = :comment AS added
           FROM pg_attribute a WHERE a.attrelid = :table::regclass AND a.attname = 'workshop_id'`,
        { type: QueryTypes.SELECT, transaction, replacements: { table: t, comment: ADDED_COMMENT } },
      );
      if (added?.added) await run(`ALTER TABLE ${t} DROP COLUMN workshop_id`);
      else await run(`ALTER TABLE ${t} ALTER COLUMN workshop_id DROP DEFAULT`);
    }
  });
}
