/**
 * `npm run bench:load`: autocannon on loopback against the server as `npm run serve` runs it (node:cluster, in
 * processes of its own), with 1 and then 2 worker processes: the calculator preview, the estimates list at 10 000
 * estimates, a broad and a selective text search and an estimate's detail, beside a bare Express endpoint served the
 * same way. Prints requests per second (the median of the one-second counts, and the mean), p50/p99 latency, the
 * ratio to the bare endpoint and the errors; the query plans of the list and of the three search boxes; the client's
 * initial JavaScript (gzipped) against its 250 KB budget; and the time to make a quote PDF. Figures only, no
 * pass/fail. Options: BENCH_SECONDS (default 8), BENCH_CONNECTIONS (default 10), BENCH_PROCESSES (default "1,2").
 *
 * Everything runs as production does: the served app connects as `shellwright_app` under row-level security (its
 * primary migrates as the owner and sets the role up), signed in as the demo workshop's estimator, whose workshop
 * holds the 10 000 estimates beside a neighbour workshop with as many; the run prints the role the app's connections
 * use to prove it. The plans and the PDF are taken through the same role, under the same workshop. */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import autocannon from 'autocannon';
import pg from 'pg';
import { buildClientIfNeeded } from '../../server/cli/build-client';
import { rootDir } from '../../server/config';
import { stopCluster } from '../../server/db/cluster';
import { renderQuotePdf } from '../../server/pdf/quote-pdf';
import { listCustomers } from '../../server/services/customers';
import { listEstimates } from '../../server/services/estimates';
import { listQuotes } from '../../server/services/quotes';
import { estimateDocument } from '../../server/services/quotes';
import { BENCH_DATA_DIR, benchDatabase, signInHttp } from './bench-env';
import { freePort } from '../helpers/ports';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
const PROCESSES = (process.env.BENCH_PROCESSES ?? '1,2').split(',').map(Number);

interface Row {
  name: string;
  /** The median of the run's one-second request counts. */
  rps: number;
  mean: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
}

async function run(name: string, opts: autocannon.Options): Promise<Row> {
  const result = await autocannon({ connections: CONNECTIONS, duration: SECONDS, ...opts });
  return { name, rps: result.requests.p50, mean: result.requests.average, p50: result.latency.p50, p99: result.latency.p99, errors: result.errors + result.timeouts, non2xx: result.non2xx };
}

function initialJsKb(): { files: string[]; gzipKb: number } {
  const html = fs.readFileSync(path.join(rootDir, 'dist', 'index.html'), 'utf8');
  const files = [...html.matchAll(/(?:src|href)="(\/assets\/[^"]+\.js)"/g)].map((m) => m[1]!);
  const bytes = files.reduce((sum, f) => sum + gzipSync(fs.readFileSync(path.join(rootDir, 'dist', f))).length, 0);
  return { files, gzipKb: bytes / 1024 };
}


interface Served {
  url: string;
  stop(): Promise<void>;
}

/**
 * Starts `script` under node:cluster with `processes` workers and waits (at most three minutes: the machine may be busy) until each worker has
 * printed `ready`.
 */
async function serve(script: string, processes: number, ready: RegExp, env: Record<string, string> = {}): Promise<Served> {
  const port = await freePort();
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, script)], {
    cwd: rootDir,
    env: { ...process.env, ...env, PORT: String(port), WEB_CONCURRENCY: String(processes) },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    let up = 0;
    let buffered = '';
    const timer = setTimeout(() => {
      // Stop it, or it would stay behind this script.
      child.kill('SIGTERM');
      reject(new Error(`${script}: ${up} of ${processes} workers up after three minutes`));
    }, 180_000);
    child.once('exit', () => reject(new Error(`${script} stopped before it was up`)));
    child.stdout!.on('data', (chunk: Buffer) => {
      buffered += chunk.toString();
      const lines = buffered.split('\n');
      buffered = lines.pop()!;
      up += lines.filter((l) => ready.test(l)).length;
      if (up >= processes) {
        clearTimeout(timer);
        resolve();
      }
    });
  });
  return {
    url: `http://127.0.0.1:${port}`,
    stop: async () => {
      child.kill('SIGTERM');
      await exited;
    },
  };
}

/** The roles the served app's connections use, read by the owner from pg_stat_activity, with their RLS attributes. */
async function appRoles(ownerUrl: string): Promise<string> {
  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ usename: string; n: number; rolsuper: boolean; rolbypassrls: boolean }>(
      `SELECT a.usename, count(*)::int AS n, r.rolsuper, r.rolbypassrls
         FROM pg_stat_activity a JOIN pg_roles r ON r.rolname = a.usename
        WHERE a.datname = current_database() AND a.pid <> pg_backend_pid() AND a.application_name <> 'pg_dump'
        GROUP BY 1, 3, 4 ORDER BY 1`,
    );
    return `the app's connections: ${rows.map((r) => `${r.n} as ${r.usename} (${r.rolsuper || r.rolbypassrls ? 'BYPASSES row-level security' : 'bound by row-level security'})`).join(', ')}`;
  } finally {
    await client.end();
  }
}

function printRows(rows: Row[]): void {
  const base = rows[0]!.rps;
  console.log('endpoint'.padEnd(46) + 'req/s'.padStart(9) + 'mean'.padStart(8) + 'p50 ms'.padStart(9) + 'p99 ms'.padStart(9) + 'ratio'.padStart(8) + 'errors'.padStart(8) + 'non-2xx'.padStart(9));
  for (const r of rows) {
    console.log(
      r.name.padEnd(46) +
        r.rps.toFixed(0).padStart(9) +
        r.mean.toFixed(0).padStart(8) +
        String(r.p50).padStart(9) +
        String(r.p99).padStart(9) +
        (r.rps / base).toFixed(3).padStart(8) +
        String(r.errors).padStart(8) +
        String(r.non2xx).padStart(9),
    );
  }
}

async function main(): Promise<void> {
  await buildClientIfNeeded();
  // `sequelize` is the app's role; queries outside a request run under the demo workshop (the signed-in user's).
  const { cluster, url, config, sequelize, workshopId } = await benchDatabase();
  const serverEnv = { DATABASE_URL: url, SHELLWRIGHT_DATA_DIR: BENCH_DATA_DIR, NODE_ENV: 'development', SHELLWRIGHT_LOGIN_ATTEMPTS: '1000' };
  try {
    const [{ id }] = (await sequelize.query("SELECT id FROM estimates WHERE number LIKE 'EST-%' ORDER BY id LIMIT 1"))[0] as [{ id: number }];
    const preview = JSON.stringify({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' });
    const [[{ matches }]] = (await sequelize.query(
      `SELECT count(*)::int AS matches FROM estimates e JOIN customers c ON c.id = e.customer_id JOIN pieces p ON p.id = e.piece_id
        WHERE NOT e.archived AND (e.number ILIKE '%grand%' OR e.title ILIKE '%grand%' OR c.name ILIKE '%grand%' OR p.description ILIKE '%grand%')`,
    )) as [[{ matches: number }], unknown];

    console.log(`Node ${process.version}; ${CONNECTIONS} connections, ${SECONDS} s each, loopback; autocannon in this process, the servers in their own.`);
    const [[{ mine }]] = (await sequelize.query('SELECT count(*)::int AS mine FROM estimates')) as [[{ mine: number }], unknown];
    console.log(`Signed in to workshop ${workshopId}, which sees ${mine} estimates under row-level security; the search "grand" matches ${matches} of them.`);
    const summary: { processes: number; rows: Row[] }[] = [];
    for (const processes of PROCESSES) {
      console.log(`\n${processes} process${processes === 1 ? '' : 'es'} (node:cluster, as npm run serve):`);
      const rows: Row[] = [];
      const bare = await serve('tests/bench/bare-server.ts', processes, /^\[bare\] up/);
      try {
        rows.push(await run('bare Express GET /bare', { url: `${bare.url}/bare` }));
      } finally {
        await bare.stop();
      }
      const app = await serve('server/cluster.ts', processes, /Shellwright is up/, serverEnv);
      try {
        const { cookie, csrf } = await signInHttp(app.url, 'estimator@example.com');
        const headers = { cookie, 'content-type': 'application/json', 'x-csrf-token': csrf };
        if (processes === PROCESSES[0]) console.log(await appRoles(url));
        rows.push(await run('POST /api/calc/preview (default grand)', { url: `${app.url}/api/calc/preview`, method: 'POST', headers, body: preview }));
        rows.push(await run('GET /api/estimates (10 000, page 1)', { url: `${app.url}/api/estimates?sort=updatedAt&dir=desc&page=1&pageSize=25`, headers }));
        rows.push(await run('GET /api/estimates?q=grand&sort=total p.3', { url: `${app.url}/api/estimates?q=grand&sort=total&dir=desc&page=3`, headers }));
        rows.push(await run('GET /api/estimates?q=0042 (selective)', { url: `${app.url}/api/estimates?q=0042`, headers }));
        rows.push(await run(`GET /api/estimates/${id} (detail)`, { url: `${app.url}/api/estimates/${id}`, headers }));
      } finally {
        await app.stop();
      }
      printRows(rows);
      summary.push({ processes, rows });
    }
    if (summary.length > 1) {
      console.log('\nthroughput by processes (req/s):');
      console.log('endpoint'.padEnd(46) + summary.map((s) => `${s.processes} proc`.padStart(10)).join('') + 'gain'.padStart(8));
      for (let i = 0; i < summary[0]!.rows.length; i++) {
        const values = summary.map((s) => s.rows[i]!.rps);
        console.log(summary[0]!.rows[i]!.name.padEnd(46) + values.map((v) => v.toFixed(0).padStart(10)).join('') + (values.at(-1)! / values[0]!).toFixed(2).padStart(8));
      }
    }

    // The query plans of the list's first page and of the search boxes, as the services send them, through the app's
    // role under the signed-in workshop (the policies' conditions show in the plans).
    const captured: string[] = [];
    const options = (sequelize as unknown as { options: { logging: unknown } }).options;
    const logging = options.logging;
    options.logging = (sql: string) => captured.push(sql.replace(/^Executing \([^)]*\): /, ''));
    // [what, the call, also show the plan with sequential scans off (a table small enough that reading it whole is
    // cheaper: the plan PostgreSQL switches to as it grows)]
    const plans: [string, () => Promise<unknown>, boolean][] = [
      ['estimates list, first page', () => listEstimates({ sort: 'updatedAt', dir: 'desc', page: 1, pageSize: 25, archived: 'false' } as never), false],
      ['estimates search "grand" (most rows match), page 3 by total', () => listEstimates({ q: 'grand', sort: 'total', dir: 'desc', page: 3, pageSize: 25, archived: 'false' } as never), false],
      ['estimates search "0042" (selective)', () => listEstimates({ q: '0042', sort: 'updatedAt', dir: 'desc', page: 1, pageSize: 25, archived: 'false' } as never), false],
      ['customers search "load customer 77"', () => listCustomers(sequelize, { q: 'load customer 77', sort: 'name', dir: 'asc', page: 1, pageSize: 25, archived: 'false' } as never), true],
      ['quotes search "EST-2026"', () => listQuotes({ q: 'EST-2026', sort: 'updatedAt', dir: 'desc', page: 1, pageSize: 25 } as never), true],
    ];
    for (const [what, call, alsoWithoutSeqScan] of plans) {
      captured.length = 0;
      await call();
      const select = captured.find((q) => /^SELECT/.test(q) && /ORDER BY/.test(q))!.replace(/;\s*$/, '');
      const [plan] = await sequelize.query(`EXPLAIN (ANALYZE, COSTS OFF) ${select}`);
      console.log(`\nplan of the ${what}:`);
      for (const line of plan as { 'QUERY PLAN': string }[]) console.log(`  ${line['QUERY PLAN']}`);
      if (alsoWithoutSeqScan) {
        await sequelize.transaction(async (transaction) => {
          await sequelize.query('SET LOCAL enable_seqscan = off', { transaction });
          const [forced] = await sequelize.query(`EXPLAIN (ANALYZE, COSTS OFF) ${select}`, { transaction });
          console.log('  the same with sequential scans off:');
          for (const line of forced as { 'QUERY PLAN': string }[]) console.log(`    ${line['QUERY PLAN']}`);
        });
      }
    }
    options.logging = logging;

    const js = initialJsKb();
    console.log(`\ninitial JavaScript: ${js.files.length} file(s), ${js.gzipKb.toFixed(1)} KB gzipped (budget 250 KB)`);

    const doc = await estimateDocument(id, config.uploadsDir);
    const times: number[] = [];
    for (let i = 0; i < 12; i++) {
      const t = performance.now();
      await renderQuotePdf(doc);
      times.push(performance.now() - t);
    }
    times.sort((a, b) => a - b);
    console.log(`quote PDF: median ${times[6]!.toFixed(0)} ms, p90 ${times[10]!.toFixed(0)} ms (12 renders, ${(await renderQuotePdf(doc)).length / 1024 | 0} KB)`);
  } finally {
    await sequelize.close();
    stopCluster(cluster);
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
