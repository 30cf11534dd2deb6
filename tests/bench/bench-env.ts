/**
 * A database of its own for the load and fault runs: a private cluster under .data/bench (so stopping it never
 * touches the development database), migrated, with the demo workshop and 10 000 estimates.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { loadConfig, rootDir, type Config } from '../../server/config';
import { clusterUrl, describeCluster, ensureDatabase, startCluster, type Cluster } from '../../server/db/cluster';
import { createMigrator } from '../../server/db/migrator';
import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db/sequelize';
import { lookupWorkshop, runAsWorkshop } from '../../server/db/workshop-context';
import { initModels } from '../../server/models';
import { seed } from '../../server/seeders';

export const BENCH_DATA_DIR = path.join(rootDir, '.data', 'bench');
const DATABASE = 'shellwright_bench';

export interface BenchDb {
  cluster: Cluster;
  url: string;
  config: Config;
  /** Open for the caller (models are bound to it); close it when done. */
  sequelize: Sequelize;
}

/** Starts the bench cluster and fills the bench database once (10 000 estimates); later runs reuse it. */
export async function benchDatabase(opts: { estimates?: number; poolMax?: number } = {}): Promise<BenchDb> {
  const cluster = describeCluster(BENCH_DATA_DIR);
  startCluster(cluster);
  await ensureDatabase(cluster, DATABASE);
  const url = clusterUrl(cluster, DATABASE);
  process.env.SHELLWRIGHT_DATA_DIR = BENCH_DATA_DIR;
  const config = { ...loadConfig(), databaseUrl: url, dataDir: BENCH_DATA_DIR, uploadsDir: path.join(BENCH_DATA_DIR, 'uploads'), loginAttempts: 1000 };
  const sequelize = createSequelize(url, { poolMax: opts.poolMax ?? 20 });
  await createMigrator(sequelize, { quiet: true }).up();
  initModels(sequelize);
  // The first demo workshop only: this connection is the owner's, which row-level security does not bind, so a second
  // workshop's demo would find the first's rows by their keys.
  await seed(sequelize, { demo: true, uploadsDir: config.uploadsDir, demoWorkshops: 1 });
  const want = opts.estimates ?? 10_000;
  const [[{ n }]] = (await sequelize.query('SELECT count(*)::int AS n FROM estimates')) as [[{ n: number }], unknown];
  if (n < want) {
    console.log(`[bench] adding ${want - n} estimates…`);
    // The rows go to the demo workshop (the column's default reads the workshop setting).
    const demoWorkshop = await lookupWorkshop(sequelize, 'email', 'owner@example.com');
    await runAsWorkshop(demoWorkshop!, async () => {
    // Copies of the demo estimates: other numbers, spread over customers, states, totals and dates.
    await sequelize.query(
      `INSERT INTO customers (name, email, created_at, updated_at)
       SELECT 'Load customer ' || g, 'load' || g || '@example.com', now() - (g || ' minutes')::interval, now()
         FROM generate_series(1, 1000) g`,
    );
    await sequelize.query(
      `INSERT INTO estimates (number, customer_id, piece_id, owner_id, title, state, valid_until, revision_count, current_revision_id,
                              total, labour_hours, currency, archived, created_at, updated_at)
       SELECT 'LOAD-' || lpad(g::text, 6, '0'), e.customer_id, e.piece_id, e.owner_id, e.title || ' #' || g,
              (ARRAY['draft','priced','quoted','accepted'])[1 + g % 4], e.valid_until, e.revision_count, e.current_revision_id,
              e.total + (g % 500), e.labour_hours, e.currency, false, now() - (g || ' minutes')::interval, now() - (g || ' minutes')::interval
         FROM generate_series(1, :count) g
         JOIN LATERAL (SELECT * FROM estimates WHERE number LIKE 'EST-%' ORDER BY id OFFSET (g % 4) LIMIT 1) e ON true`,
      { replacements: { count: want - n } },
    );
    });
    await sequelize.query('ANALYZE');
  }
  return { cluster, url, config, sequelize };
}

export async function listen(handler: http.RequestListener): Promise<{ url: string; close: () => Promise<void> }> {
  const server = http.createServer(handler);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

/** Signs in over HTTP and returns the cookie and CSRF token. */
export async function signInHttp(base: string, email: string): Promise<{ cookie: string; csrf: string }> {
  const first = await fetch(`${base}/api/auth/csrf`);
  const cookie0 = (first.headers.get('set-cookie') ?? '').split(';')[0]!;
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: cookie0 },
    body: JSON.stringify({ email, password: 'shellwright-demo' }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const cookie = (res.headers.get('set-cookie') ?? '').split(';')[0]!;
  const body = (await res.json()) as { csrfToken: string };
  return { cookie, csrf: body.csrfToken };
}
