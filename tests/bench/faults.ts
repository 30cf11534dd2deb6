/**
 * `npm run bench:faults`: what happens when things break, on a database of its own (.data/bench).
 * 1. PostgreSQL stops in the middle of a load run: requests must fail fast with 503 and a clear message, health must
 *    say "down", and once PostgreSQL is back the same server process must recover without a restart.
 * 2. The server is killed (SIGKILL) while estimates are being saved: after a restart every estimate must be either
 *    wholly saved or not at all (revision count, revisions and the current revision agree).
 * Prints what it saw; exits non-zero only when the script itself cannot run.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import autocannon from 'autocannon';
import { QueryTypes } from 'sequelize';
import { rootDir } from '../../server/config';
import { startCluster, stopCluster } from '../../server/db/cluster';
import { BENCH_DATA_DIR, benchDatabase, signInHttp } from './bench-env';

const PORT = Number(process.env.BENCH_PORT ?? 3917);
const base = `http://127.0.0.1:${PORT}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function startServer(url: string): ChildProcess {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'index.ts')], {
    cwd: rootDir,
    env: { ...process.env, DATABASE_URL: url, PORT: String(PORT), SHELLWRIGHT_DATA_DIR: BENCH_DATA_DIR, NODE_ENV: 'development', SHELLWRIGHT_LOGIN_ATTEMPTS: '1000' },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  child.stderr?.on('data', () => {});
  return child;
}

async function waitHealthy(timeoutMs = 60_000): Promise<number> {
  const t0 = Date.now();
  while (Date.now() - t0 < timeoutMs) {
    try {
      const res = await fetch(`${base}/api/health`);
      if (res.ok) return Date.now() - t0;
    } catch {
      /* not listening yet */
    }
    await sleep(250);
  }
  throw new Error('server did not become healthy');
}

async function main(): Promise<void> {
  const { cluster, url, sequelize } = await benchDatabase({ estimates: 2000 });
  let server = startServer(url);
  try {
    await waitHealthy();
    const { cookie, csrf } = await signInHttp(base, 'estimator@example.com');
    const headers = { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json' };

    // 1. The database goes away during a load run and comes back.
    console.log('1. PostgreSQL stopped for about 4 s during a 12 s load run on the estimates list');
    const statuses = new Map<number, number>();
    const slow503: number[] = [];
    const health: string[] = [];
    const instance = autocannon({ url: `${base}/api/estimates?page=1`, headers: { cookie }, connections: 8, duration: 12 }, () => {});
    const load = new Promise<autocannon.Result>((resolve) => instance.on('done', resolve));
    instance.on('response', (_client: unknown, statusCode: number, _bytes: number, responseTime: number) => {
      statuses.set(statusCode, (statuses.get(statusCode) ?? 0) + 1);
      if (statusCode === 503) slow503.push(responseTime);
    });
    await sleep(3_000);
    stopCluster(cluster);
    const stoppedAt = Date.now();
    for (let i = 0; i < 6; i++) {
      const res = await fetch(`${base}/api/health`);
      health.push(`${res.status} ${JSON.stringify(await res.json())}`);
      await sleep(500);
    }
    const during = await fetch(`${base}/api/estimates`, { headers: { cookie } });
    const duringBody = await during.text();
    startCluster(cluster);
    const restartedAt = Date.now();
    let recoveredAfter = -1;
    for (let i = 0; i < 60; i++) {
      const res = await fetch(`${base}/api/estimates?page=1`, { headers: { cookie } });
      if (res.ok) {
        recoveredAfter = Date.now() - restartedAt;
        break;
      }
      await sleep(250);
    }
    const result = await load;
    slow503.sort((a, b) => a - b);
    console.log(`   database down for ${((restartedAt - stoppedAt) / 1000).toFixed(1)} s`);
    console.log(`   answers by status: ${[...statuses.entries()].map(([s, n]) => `${s}: ${n}`).join(', ')}; connection errors ${result.errors}, timeouts ${result.timeouts}`);
    if (slow503.length) console.log(`   503 latency: median ${slow503[Math.floor(slow503.length / 2)]!.toFixed(0)} ms, max ${slow503[slow503.length - 1]!.toFixed(0)} ms (fail fast)`);
    console.log(`   health while down: ${health[1] ?? health[0]}`);
    console.log(`   a request while down: ${during.status} ${duringBody.slice(0, 160)}`);
    console.log(`   same process serving again ${recoveredAfter} ms after PostgreSQL restarted (no server restart)`);

    // 2. The server is killed while saves are in flight.
    console.log('\n2. Server killed with SIGKILL while revisions are being saved');
    const estimates = (await sequelize.query("SELECT id FROM estimates WHERE number LIKE 'EST-%' AND state IN ('draft','priced') ORDER BY id LIMIT 4", {
      type: QueryTypes.SELECT,
    })) as { id: number }[];
    let sent = 0;
    let answered = 0;
    const saves = estimates.map(async ({ id }) => {
      for (let i = 0; i < 50; i++) {
        try {
          const detail = (await (await fetch(`${base}/api/estimates/${id}`, { headers })).json()) as { revisionCount: number; current: { input: unknown } };
          sent++;
          const res = await fetch(`${base}/api/estimates/${id}/revisions`, { method: 'POST', headers, body: JSON.stringify({ baseRevision: detail.revisionCount, input: detail.current.input, note: 'fault run' }) });
          if (res.status === 201) answered++;
        } catch {
          return;
        }
      }
    });
    await sleep(1_500);
    server.kill('SIGKILL');
    await Promise.allSettled(saves);
    console.log(`   saves sent ${sent}, confirmed ${answered} before the kill`);
    server = startServer(url);
    const up = await waitHealthy();
    console.log(`   server back after ${up} ms`);
    const [check] = (await sequelize.query(
      `SELECT count(*) FILTER (WHERE e.revision_count <> r.n OR e.revision_count <> r.maxn OR e.current_revision_id <> r.current_id)::int AS inconsistent,
              count(*)::int AS checked, sum(r.n)::int AS revisions
         FROM estimates e
         JOIN (SELECT estimate_id, count(*) AS n, max(number) AS maxn,
                      (array_agg(id ORDER BY number DESC))[1] AS current_id
                 FROM estimate_revisions GROUP BY estimate_id) r ON r.estimate_id = e.id
        WHERE e.id IN (:ids)`,
      { replacements: { ids: estimates.map((e) => e.id) }, type: QueryTypes.SELECT },
    )) as { inconsistent: number; checked: number; revisions: number }[];
    console.log(`   estimates checked ${check!.checked}, revisions ${check!.revisions}, half-written ${check!.inconsistent}`);
    console.log(check!.inconsistent === 0 ? '   every estimate is wholly saved or not at all' : '   FOUND A HALF-WRITTEN ESTIMATE');
  } finally {
    server.kill('SIGTERM');
    await sleep(500);
    await sequelize.close().catch(() => {});
    stopCluster(cluster);
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
