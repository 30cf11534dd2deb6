/**
 * A database of its own for the load and fault runs: a private cluster under .data/bench (so stopping it never
 * touches the development database), prepared as production prepares it: migrations as the owning role, then the
 * app's role (`shellwright_app`, bound by row-level security) loads the demo workshop. The signed-in users' workshop
 * (the demo one) gets 10 000 estimates, and a second workshop on the same tables holds as many of its own, so the
 * policies have rows to keep out, as they do on a shared service.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { loadConfig, rootDir, type Config } from '../../server/config';
import { ensureAppRole } from '../../server/db/app-role';
import { clusterUrl, describeCluster, ensureDatabase, startCluster, type Cluster } from '../../server/db/cluster';
import { createMigrator } from '../../server/db/migrator';
import type { Sequelize } from 'sequelize';
import { createAppSequelize, createSequelize } from '../../server/db/sequelize';
import { allWorkshopIds, runAsWorkshop } from '../../server/db/workshop-context';
import { initModels, User } from '../../server/models';
import { seed } from '../../server/seeders';
import { DEFAULT_SETTINGS, ensureDefaults } from '../../server/seeders/defaults';
import { createWorkshop } from '../../server/services/workshops';

export const BENCH_DATA_DIR = path.join(rootDir, '.data', 'bench');
const DATABASE = 'shellwright_bench';
const NEIGHBOUR = 'Bench neighbour workshop';

export interface BenchDb {
  cluster: Cluster;
  /** The owner's URL (migrations; what DATABASE_URL names for a served app, whose primary sets up the app role). */
  url: string;
  /** The app role's URL, as the app connects. */
  appUrl: string;
  config: Config;
  /**
   * The app role's pool, open for the caller (models are bound to it); close it when done. Work outside any
   * workshop runs under the signed-in users' workshop (`workshopId`), as a request of theirs would.
   */
  sequelize: Sequelize;
  /** The demo workshop: the one the demo users sign in to, holding the benchmark's estimates. */
  workshopId: number;
}

/**
 * Spreads the copied estimates over the load customers, each with a piece of its own described as the demo piece it
 * was copied from (so the same searches match): real workshops have a few estimates per piece, and with all of them
 * on the demo's nine pieces PostgreSQL plans the list from the pieces. Idempotent (a database filled before it is
 * spread on its next run).
 */
async function spreadEstimates(sequelize: Sequelize): Promise<void> {
  await sequelize.query(
    `INSERT INTO pieces (customer_id, kind, description, created_at, updated_at)
     SELECT c.id, d.kind, d.description, now(), now()
       FROM customers c
       JOIN LATERAL (SELECT kind, description FROM pieces WHERE customer_id NOT IN (SELECT id FROM customers WHERE name LIKE 'Load customer %')
                      ORDER BY id OFFSET (c.id % 9) LIMIT 1) d ON true
      WHERE c.name LIKE 'Load customer %' AND NOT EXISTS (SELECT 1 FROM pieces p WHERE p.customer_id = c.id)`,
  );
  await sequelize.query(
    `WITH lp AS (SELECT p.id, p.customer_id, row_number() OVER (ORDER BY p.id) - 1 AS k
                   FROM pieces p JOIN customers c ON c.id = p.customer_id WHERE c.name LIKE 'Load customer %'),
          n AS (SELECT count(*) AS n FROM lp)
     UPDATE estimates e SET piece_id = lp.id, customer_id = lp.customer_id
       FROM lp, n
      WHERE e.number LIKE 'LOAD-%' AND lp.k = substring(e.number from 6)::int % n.n AND e.piece_id <> lp.id`,
  );
}

/** Copies of the demo estimates: other numbers, spread over customers, states, totals and dates (run as the app). */
async function addEstimates(sequelize: Sequelize, count: number): Promise<void> {
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
    { replacements: { count } },
  );
}

/** A second workshop with its own customers, pieces and `count` estimates, whose words match the same searches. */
async function addNeighbour(sequelize: Sequelize, count: number): Promise<void> {
  const id = await createWorkshop(sequelize, { name: NEIGHBOUR, email: 'hello@bench-neighbour.example', phone: null, address: null, settings: DEFAULT_SETTINGS });
  await runAsWorkshop(id, async () => {
    await ensureDefaults(sequelize);
    const owner = await User.create({ email: 'owner@bench-neighbour.example', name: 'Owner of the neighbour', role: 'owner', passwordHash: 'x', lastLoginAt: null });
    await sequelize.query(
      `INSERT INTO customers (name, email, created_at, updated_at)
       SELECT 'Neighbour customer ' || g, 'neighbour' || g || '@example.com', now() - (g || ' minutes')::interval, now()
         FROM generate_series(1, 1000) g`,
    );
    await sequelize.query(
      `INSERT INTO pieces (customer_id, kind, description, created_at, updated_at)
       SELECT id, (ARRAY['grand','table','cabinet','upright'])[1 + id % 4], (ARRAY['Boudoir grand','Side table','Cabinet','Upright'])[1 + id % 4] || ' ' || id, now(), now()
         FROM customers`,
    );
    await sequelize.query(
      `INSERT INTO estimates (number, customer_id, piece_id, owner_id, title, state, valid_until, total, labour_hours, currency, created_at, updated_at)
       SELECT 'EST-2026-' || lpad(g::text, 5, '0'), p.customer_id, p.id, :owner, 'Refinish ' || p.description || ' #' || g,
              (ARRAY['draft','priced','quoted','accepted'])[1 + g % 4], DATE '2027-06-30', 100 + g % 900, 3, 'GBP',
              now() - (g || ' seconds')::interval, now() - (g || ' seconds')::interval
         FROM generate_series(1, :count) g
         JOIN LATERAL (SELECT * FROM pieces ORDER BY id OFFSET (g % 1000) LIMIT 1) p ON true`,
      { replacements: { count, owner: owner.id } },
    );
  });
}

/**
 * Starts the bench cluster and fills the bench database once (10 000 estimates in the demo workshop, as many in a
 * neighbour); later runs reuse it.
 */
export async function benchDatabase(opts: { estimates?: number; poolMax?: number } = {}): Promise<BenchDb> {
  const cluster = describeCluster(BENCH_DATA_DIR);
  startCluster(cluster);
  await ensureDatabase(cluster, DATABASE);
  const url = clusterUrl(cluster, DATABASE);
  process.env.SHELLWRIGHT_DATA_DIR = BENCH_DATA_DIR;
  const config = { ...loadConfig(), databaseUrl: url, dataDir: BENCH_DATA_DIR, uploadsDir: path.join(BENCH_DATA_DIR, 'uploads'), loginAttempts: 1000 };
  // As prepareDatabase (server/index.ts) does it: the owner migrates, the app's role loads the workshops.
  const owner = createSequelize(url, { poolMax: 2 });
  let appUrl: string;
  try {
    await createMigrator(owner, { quiet: true }).up();
    appUrl = await ensureAppRole(url);
  } finally {
    await owner.close();
  }
  let workshopId: number | null = null;
  const sequelize = createAppSequelize(appUrl, { poolMax: opts.poolMax ?? 20, fallback: async () => workshopId });
  initModels(sequelize);
  // The first demo workshop only; the neighbour below is the other workshop the figures need.
  await seed(sequelize, { demo: true, uploadsDir: config.uploadsDir, demoWorkshops: 1 });
  const [demo, ...others] = await allWorkshopIds(sequelize);
  workshopId = demo!;
  const want = opts.estimates ?? 10_000;
  const [[{ n }]] = (await runAsWorkshop(workshopId, () => sequelize.query('SELECT count(*)::int AS n FROM estimates'))) as [[{ n: number }], unknown];
  let filled = false;
  if (n < want) {
    console.log(`[bench] adding ${want - n} estimates to the demo workshop…`);
    await runAsWorkshop(workshopId, () => addEstimates(sequelize, want - n));
    filled = true;
  }
  if (want > 0) {
    const [[{ spread }]] = (await runAsWorkshop(workshopId, () =>
      sequelize.query("SELECT count(DISTINCT piece_id)::int AS spread FROM estimates WHERE number LIKE 'LOAD-%'"),
    )) as [[{ spread: number }], unknown];
    if (spread < 100) {
      console.log('[bench] spreading the estimates over pieces of their own…');
      await runAsWorkshop(workshopId, () => spreadEstimates(sequelize));
      filled = true;
    }
  }
  if (want > 0 && others.length === 0) {
    console.log(`[bench] adding a neighbour workshop with ${want} estimates of its own…`);
    await addNeighbour(sequelize, want);
    filled = true;
  }
  if (filled) {
    // Statistics are the owner's to gather (the app's role may not ANALYZE tables it does not own).
    const analyse = createSequelize(url, { poolMax: 1 });
    await analyse.query('ANALYZE').finally(() => analyse.close());
  }
  return { cluster, url, appUrl, config, sequelize, workshopId };
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
