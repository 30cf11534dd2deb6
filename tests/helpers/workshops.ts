/** A second workshop for isolation tests: its own row, defaults, and one user per role (their e-mails unique per call). */
import { randomBytes } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import { ROLES, type Role } from '../../shared/schemas/auth';
import { runAsWorkshop } from '../../server/db/workshop-context';
import { User } from '../../server/models';
import { DEFAULT_SETTINGS, ensureDefaults } from '../../server/seeders/defaults';
import { hashPassword } from '../../server/services/users';
import { createWorkshop } from '../../server/services/workshops';

export const OTHER_PASSWORD = 'another-workshop-pass';

export interface OtherWorkshop {
  id: number;
  emails: Record<Role, string>;
}

export async function createOtherWorkshop(sequelize: Sequelize, name = 'Quillon Row Restorers'): Promise<OtherWorkshop> {
  const tag = randomBytes(4).toString('hex');
  const id = await createWorkshop(sequelize, { name, email: `hello-${tag}@quillon-row.example`, phone: null, address: null, settings: DEFAULT_SETTINGS });
  const passwordHash = await hashPassword(OTHER_PASSWORD);
  const emails = {} as Record<Role, string>;
  await runAsWorkshop(id, async () => {
    await ensureDefaults(sequelize);
    for (const role of ROLES) {
      emails[role] = `${role}-${tag}@quillon-row.example`;
      await User.create({ email: emails[role], name: `${role[0]!.toUpperCase()}${role.slice(1)} of ${name}`, role, passwordHash, lastLoginAt: null });
    }
  });
  return { id, emails };
}

/** The table behind a path parameter, from the path segment before it. */
export const PARAM_TABLES: Record<string, string> = {
  users: 'users',
  'labour-rates': 'labour_rates',
  'accounts/quotes': 'quotes',
  documents: 'account_documents',
  'finishing-systems': 'finishing_systems',
  species: 'species',
  stock: 'materials',
  jobs: 'jobs',
  sessions: 'job_sessions',
  polishers: 'polishers',
  materials: 'materials',
  packs: 'material_packs',
  'price-files': 'price_file_previews',
  'purchase-orders': 'purchase_orders',
  pieces: 'pieces',
  photos: 'piece_photos',
  'progress-photos': 'piece_photos',
  variations: 'job_variations',
  estimates: 'estimates',
  quotes: 'quotes',
  outbox: 'outbox',
  payments: 'payments',
  customers: 'customers',
  invitations: 'invitations',
};

export function tableOf(path: string, param: string): string | undefined {
  const before = path.split(`/:${param}`)[0]!.split('/');
  const last = before.at(-1)!;
  if (param === 'number') return 'estimate_revisions';
  return PARAM_TABLES[`${before.at(-2)}/${last}`] ?? PARAM_TABLES[last];
}

/** A client of the database's owner (past row-level security), as the tests that compare workshops hold one. */
interface OwnerClient {
  query<R extends object>(sql: string, values?: unknown[]): Promise<{ rows: R[] }>;
}

/**
 * Up to `perTable` ids of a workshop's rows in each table the route parameters name (the newest first, then the
 * oldest), read by the owner. An id may be a number or a uuid, so they are text.
 */
export async function idsOfWorkshop(owner: OwnerClient, workshopId: number, perTable = 1): Promise<Map<string, string[]>> {
  const ids = new Map<string, string[]>();
  for (const table of new Set([...Object.values(PARAM_TABLES), 'estimate_revisions'])) {
    const { rows } = await owner.query<{ id: string }>(
      `(SELECT id::text AS id FROM "${table}" WHERE workshop_id = $1 ORDER BY ctid DESC LIMIT $2)
       UNION (SELECT id::text FROM "${table}" WHERE workshop_id = $1 ORDER BY ctid LIMIT $2)`,
      [workshopId, Math.max(1, Math.ceil(perTable / 2))],
    );
    if (rows.length) ids.set(table, rows.map((r) => r.id).slice(0, perTable));
  }
  return ids;
}

/**
 * Rows that reference a row of another workshop, over every foreign key between two workshop tables (those whose
 * columns do not already include `workshop_id`): `table.column → parent (n rows)` for each key that has any. Foreign
 * keys are checked by PostgreSQL past row-level security, so only the services' reading first keeps this empty.
 */
export async function crossWorkshopReferences(owner: OwnerClient): Promise<string[]> {
  const { rows: keys } = await owner.query<{ child: string; parent: string; cols: string[]; pcols: string[] }>(
    `SELECT cl.relname::text AS child, pcl.relname::text AS parent,
            array_agg(a.attname::text ORDER BY k.ord) AS cols, array_agg(pa.attname::text ORDER BY k.ord) AS pcols
       FROM pg_constraint con
       JOIN pg_class cl ON cl.oid = con.conrelid
       JOIN pg_class pcl ON pcl.oid = con.confrelid
       JOIN pg_namespace n ON n.oid = cl.relnamespace AND n.nspname = 'public'
       CROSS JOIN LATERAL unnest(con.conkey, con.confkey) WITH ORDINALITY AS k(c, pc, ord)
       JOIN pg_attribute a ON a.attrelid = con.conrelid AND a.attnum = k.c
       JOIN pg_attribute pa ON pa.attrelid = con.confrelid AND pa.attnum = k.pc
      WHERE con.contype = 'f'
        AND EXISTS (SELECT 1 FROM pg_attribute w WHERE w.attrelid = con.conrelid AND w.attname = 'workshop_id' AND NOT w.attisdropped)
        AND EXISTS (SELECT 1 FROM pg_attribute w WHERE w.attrelid = con.confrelid AND w.attname = 'workshop_id' AND NOT w.attisdropped)
      GROUP BY con.oid, cl.relname, pcl.relname`,
  );
  const checks = keys.filter((k) => !k.cols.includes('workshop_id'));
  if (checks.length === 0) return [];
  const sql = checks
    .map((k, i) => {
      const on = k.cols.map((c, j) => `c."${c}" = p."${k.pcols[j]}"`).join(' AND ');
      return `SELECT ${i} AS i, count(*)::int AS n FROM "${k.child}" c JOIN "${k.parent}" p ON ${on} WHERE c.workshop_id <> p.workshop_id`;
    })
    .join(' UNION ALL ');
  const { rows } = await owner.query<{ i: number; n: number }>(sql);
  return rows.filter((r) => r.n > 0).map((r) => `${checks[r.i]!.child}.${checks[r.i]!.cols.join(',')} → ${checks[r.i]!.parent} (${r.n} rows)`);
}
