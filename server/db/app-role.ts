/**
 * The role the application connects as: `shellwright_app`, which does not own the tables, is not a superuser and
 * does not bypass row-level security, so the policies of migration `2026.12.07T00.00` hold for every query the app
 * makes. Migrations and this setup run as the owning role (the URL in DATABASE_URL, or the private cluster's).
 *
 * `APP_DATABASE_URL` names the app's connection when the role is managed elsewhere (a hosted database); otherwise
 * `ensureAppRole` creates the role (its password derived from the owner's, so nothing more is stored), grants it the
 * data rights on every table and sequence of `public`, and answers the owner's URL with the app's credentials.
 */
import { createHmac } from 'node:crypto';
import pg from 'pg';

export const APP_ROLE = 'shellwright_app';

function appPassword(ownerUrl: string): string {
  const owner = new URL(ownerUrl);
  return createHmac('sha256', decodeURIComponent(owner.password) || 'shellwright').update(`${APP_ROLE}@${owner.host}`).digest('base64url');
}

/** The owner's URL with the app role's name and password. */
export function appUrlOf(ownerUrl: string): string {
  const url = new URL(ownerUrl);
  url.username = APP_ROLE;
  url.password = appPassword(ownerUrl);
  return url.toString();
}

/** False only when the URL's password is refused (anything else, such as a database it may not reach yet, is not ours to fix). */
async function signsIn(url: string): Promise<boolean> {
  const probe = new pg.Client({ connectionString: url });
  try {
    await probe.connect();
    return true;
  } catch (e) {
    return (e as { code?: string }).code !== '28P01';
  } finally {
    await probe.end().catch(() => undefined);
  }
}

/** Creates or updates the app role and its grants on the owner's database; answers the URL the app connects with. */
export async function ensureAppRole(ownerUrl: string): Promise<string> {
  const explicit = process.env.APP_DATABASE_URL;
  if (explicit) return explicit;
  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  try {
    const password = appPassword(ownerUrl);
    const { rows } = await client.query<{ exists: boolean }>('SELECT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = $1) AS exists', [APP_ROLE]);
    const literal = (await client.query<{ l: string }>('SELECT quote_literal($1) AS l', [password])).rows[0]!.l;
    if (!rows[0]!.exists) {
      try {
        await client.query(`CREATE ROLE ${APP_ROLE} LOGIN NOSUPERUSER NOBYPASSRLS NOCREATEDB NOCREATEROLE PASSWORD ${literal}`);
      } catch (e) {
        // Another process on the same cluster created it first (roles belong to the cluster, not the database).
        if ((e as { code?: string }).code !== '23505' && (e as { code?: string }).code !== '42710') throw e;
      }
    } else if (!(await signsIn(appUrlOf(ownerUrl)))) {
      // The role was made when the owner's URL was another (the private cluster moved to a free port): the password
      // derived from this URL is the one to hold now. Nothing is changed while the derived password still signs in.
      await client.query(`ALTER ROLE ${APP_ROLE} PASSWORD ${literal}`);
    }
    const attrs = (await client.query<{ rolsuper: boolean; rolbypassrls: boolean }>('SELECT rolsuper, rolbypassrls FROM pg_roles WHERE rolname = $1', [APP_ROLE])).rows[0];
    if (attrs?.rolsuper || attrs?.rolbypassrls) throw new Error(`the role ${APP_ROLE} must not be a superuser nor bypass row-level security`);
    const database = (await client.query<{ d: string }>('SELECT quote_ident(current_database()) AS d')).rows[0]!.d;
    await client.query(`GRANT CONNECT, TEMPORARY ON DATABASE ${database} TO ${APP_ROLE}`);
    await client.query(`GRANT USAGE ON SCHEMA public TO ${APP_ROLE}`);
    await client.query(`GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${APP_ROLE}`);
    await client.query(`GRANT USAGE, SELECT, UPDATE ON ALL SEQUENCES IN SCHEMA public TO ${APP_ROLE}`);
    await client.query(`ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${APP_ROLE}`);
    await client.query(`ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT, UPDATE ON SEQUENCES TO ${APP_ROLE}`);
    // The message queue's own schema (pg-boss, `QUEUE_SCHEMA` in services/messages/queue.ts): its jobs carry the
    // workshop they belong to in their payload, and pg-boss creates and upgrades its tables itself when a queue starts
    // (a table per queue, too), as the app. So the app owns that schema, and only that one: PostgreSQL asks for the
    // right to create schemas in the database even when the schema exists, so the app has it; every table of the
    // workshops' data stays the owner's, under row-level security.
    await client.query(`GRANT CREATE ON DATABASE ${database} TO ${APP_ROLE}`);
    await client.query(`CREATE SCHEMA IF NOT EXISTS pgboss AUTHORIZATION ${APP_ROLE}`);
    await client.query(`GRANT ALL ON SCHEMA pgboss TO ${APP_ROLE}`);
    await client.query(`GRANT ALL ON ALL TABLES IN SCHEMA pgboss TO ${APP_ROLE}`);
    await client.query(`GRANT ALL ON ALL SEQUENCES IN SCHEMA pgboss TO ${APP_ROLE}`);
  } finally {
    await client.end();
  }
  return appUrlOf(ownerUrl);
}
