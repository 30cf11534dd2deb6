/**
 * `npm run bench:rls`: what row-level security costs. 1,000 workshops × 50 estimates in a database of its own; the
 * estimates list (a page of 25, newest first, with customer and piece) and an estimate's detail (with its current
 * revision), each run
 * - as the app's role under row-level security, the workshop named only by the setting (no filter in the query);
 * - as the owning role (which bypasses row-level security) with the workshop filter written in the query.
 * Prints medians and 95th percentiles and the ratio RLS / filter. Figures, never pass/fail.
 */
import path from 'node:path';
import pg from 'pg';
import { rootDir } from '../../server/config';
import { ensureAppRole } from '../../server/db/app-role';
import { clusterUrl, describeCluster, ensureDatabase, startCluster } from '../../server/db/cluster';
import { createMigrator } from '../../server/db/migrator';
import { createSequelize } from '../../server/db/sequelize';

const WORKSHOPS = 1_000;
const PER_WORKSHOP = 50;
const SAMPLES = 400;

const LIST = (filter: boolean) => `
  SELECT e.id, e.number, e.title, e.state, e.total, e.updated_at, c.name AS customer, p.description AS piece
    FROM estimates e JOIN customers c ON c.id = e.customer_id JOIN pieces p ON p.id = e.piece_id
   WHERE NOT e.archived ${filter ? 'AND e.workshop_id = $1 AND c.workshop_id = $1 AND p.workshop_id = $1' : ''}
   ORDER BY e.updated_at DESC, e.id DESC LIMIT 25`;
const DETAIL = (filter: boolean) => `
  SELECT e.*, r.input, r.result, c.name AS customer
    FROM estimates e JOIN estimate_revisions r ON r.id = e.current_revision_id JOIN customers c ON c.id = e.customer_id
   WHERE e.id = $2 ${filter ? 'AND e.workshop_id = $1 AND r.workshop_id = $1 AND c.workshop_id = $1' : ''}`;

async function fill(ownerUrl: string): Promise<void> {
  const owner = createSequelize(ownerUrl, { poolMax: 2 });
  await createMigrator(owner, { quiet: true }).up();
  const [[{ n }]] = (await owner.query('SELECT count(*)::int AS n FROM workshops')) as [[{ n: number }], unknown];
  if (n < WORKSHOPS) {
    console.log(`[bench:rls] filling ${WORKSHOPS} workshops × ${PER_WORKSHOP} estimates…`);
    await owner.transaction(async (transaction) => {
      const q = (sql: string) => owner.query(sql, { transaction });
      await q(`INSERT INTO workshops (name, settings, created_at, updated_at) SELECT 'Bench workshop ' || g, '{}'::jsonb, now(), now() FROM generate_series(1, ${WORKSHOPS}) g`);
      await q(`INSERT INTO users (workshop_id, email, name, role, password_hash, created_at, updated_at)
               SELECT id, 'owner' || id || '@bench.example', 'Owner ' || id, 'owner', 'x', now(), now() FROM workshops`);
      await q(`INSERT INTO customers (workshop_id, name, created_at, updated_at)
               SELECT w.id, 'Customer ' || w.id || '-' || g, now(), now() FROM workshops w, generate_series(1, 10) g`);
      await q(`INSERT INTO pieces (workshop_id, customer_id, kind, description, created_at, updated_at)
               SELECT c.workshop_id, c.id, 'table', 'Table ' || c.id || '-' || g, now(), now() FROM customers c, generate_series(1, 5) g`);
      await q(`INSERT INTO estimates (workshop_id, number, customer_id, piece_id, owner_id, title, valid_until, currency, total, labour_hours, created_at, updated_at)
               SELECT p.workshop_id, 'EST-' || p.id, p.customer_id, p.id, u.id, 'Refinish ' || p.description, DATE '2027-06-30', 'GBP', 100 + p.id % 900, 3,
                      now() - (p.id || ' seconds')::interval, now() - (p.id || ' seconds')::interval
                 FROM pieces p JOIN users u ON u.workshop_id = p.workshop_id`);
      await q(`INSERT INTO estimate_revisions (workshop_id, estimate_id, number, input, result, catalog_version, catalog, total, labour_hours, created_at)
               SELECT workshop_id, id, 1, '{}'::jsonb, '{}'::jsonb, 'bench', '{}'::jsonb, total, labour_hours, now() FROM estimates`);
      await q(`UPDATE estimates e SET current_revision_id = r.id FROM estimate_revisions r WHERE r.estimate_id = e.id`);
    });
    await owner.query('ANALYZE');
  }
  await owner.close();
}

function stats(ms: number[]): { median: number; p95: number } {
  const s = [...ms].sort((a, b) => a - b);
  return { median: s[Math.floor(s.length / 2)]!, p95: s[Math.floor(s.length * 0.95)]! };
}

async function main(): Promise<void> {
  const dataDir = path.join(rootDir, '.data', 'bench');
  const cluster = describeCluster(dataDir);
  startCluster(cluster);
  await ensureDatabase(cluster, 'shellwright_bench_rls');
  const ownerUrl = clusterUrl(cluster, 'shellwright_bench_rls');
  await fill(ownerUrl);
  const appUrl = await ensureAppRole(ownerUrl);
  const app = new pg.Client({ connectionString: appUrl });
  const owner = new pg.Client({ connectionString: ownerUrl });
  await app.connect();
  await owner.connect();
  const { rows: picks } = await owner.query<{ w: number; e: number }>(
    `SELECT DISTINCT ON (workshop_id) workshop_id AS w, id AS e FROM estimates WHERE workshop_id IN (SELECT id FROM workshops ORDER BY random() LIMIT ${SAMPLES}) ORDER BY workshop_id, random()`,
  );
  const time = async (fn: () => Promise<unknown>) => {
    const t = process.hrtime.bigint();
    await fn();
    return Number(process.hrtime.bigint() - t) / 1e6;
  };
  const runs = { listRls: [] as number[], listFilter: [] as number[], detailRls: [] as number[], detailFilter: [] as number[] };
  for (let round = 0; round < 2; round++) {
    // The first round warms the caches; only the second is kept.
    const keep = round === 1;
    for (const { w, e } of picks) {
      await app.query("SELECT set_config('shellwright.workshop_id', $1, false)", [String(w)]);
      const a = await time(() => app.query(LIST(false)));
      const b = await time(() => owner.query(LIST(true), [w]));
      const c = await time(() => app.query(DETAIL(false).replace('$2', '$1'), [e]));
      const d = await time(() => owner.query(DETAIL(true), [w, e]));
      if (keep) {
        runs.listRls.push(a);
        runs.listFilter.push(b);
        runs.detailRls.push(c);
        runs.detailFilter.push(d);
      }
    }
  }
  const { rows: count } = await owner.query<{ n: number }>('SELECT count(*)::int AS n FROM estimates');
  console.log(`\nrow-level security against the workshop filter alone: ${WORKSHOPS} workshops, ${count[0]!.n} estimates, ${picks.length} workshops sampled`);
  for (const [name, rls, filter] of [['estimates list (25 newest)', runs.listRls, runs.listFilter], ['estimate detail', runs.detailRls, runs.detailFilter]] as const) {
    const r = stats(rls);
    const f = stats(filter);
    console.log(
      `${name.padEnd(28)} RLS median ${r.median.toFixed(3)} ms, p95 ${r.p95.toFixed(3)} ms | filter median ${f.median.toFixed(3)} ms, p95 ${f.p95.toFixed(3)} ms | ratio (median) ${(r.median / f.median).toFixed(2)}`,
    );
  }
  await app.end();
  await owner.end();
}

main().then(
  () => process.exit(0),
  (err: unknown) => {
    console.error(err);
    process.exit(1);
  },
);
