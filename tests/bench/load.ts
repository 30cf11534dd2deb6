/**
 * `npm run bench:load`: autocannon on loopback against the built server — the calculator preview, the estimates
 * list at 10 000 estimates, an estimate's detail — beside a bare Express endpoint in the same run. Prints requests
 * per second, p50/p99 latency, the ratio to the bare endpoint and the errors; the query plan of the list; the
 * client's initial JavaScript (gzipped) against its 250 KB budget; and the time to make a quote PDF.
 * Figures only, no pass/fail. Options: BENCH_SECONDS (default 8), BENCH_CONNECTIONS (default 10).
 */
import fs from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import autocannon from 'autocannon';
import express from 'express';
import { createApp } from '../../server/app';
import { buildClientIfNeeded } from '../../server/cli/build-client';
import { rootDir } from '../../server/config';
import { stopCluster } from '../../server/db/cluster';
import { renderQuotePdf } from '../../server/pdf/quote-pdf';
import { estimateDocument } from '../../server/services/quotes';
import { benchDatabase, listen, signInHttp } from './bench-env';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);

interface Row {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
}

async function run(name: string, opts: autocannon.Options): Promise<Row> {
  const result = await autocannon({ connections: CONNECTIONS, duration: SECONDS, ...opts });
  return { name, rps: result.requests.average, p50: result.latency.p50, p99: result.latency.p99, errors: result.errors + result.timeouts, non2xx: result.non2xx };
}

function initialJsKb(): { files: string[]; gzipKb: number } {
  const html = fs.readFileSync(path.join(rootDir, 'dist', 'index.html'), 'utf8');
  const files = [...html.matchAll(/(?:src|href)="(\/assets\/[^"]+\.js)"/g)].map((m) => m[1]!);
  const bytes = files.reduce((sum, f) => sum + gzipSync(fs.readFileSync(path.join(rootDir, 'dist', f))).length, 0);
  return { files, gzipKb: bytes / 1024 };
}

async function main(): Promise<void> {
  await buildClientIfNeeded();
  const { cluster, url, config, sequelize } = await benchDatabase();
  const built = createApp({ config, sequelize, databaseUrl: url });
  const app = await listen(built.app);
  const bareApp = express();
  bareApp.get('/bare', (_req, res) => {
    res.json({ status: 'ok' });
  });
  const bare = await listen(bareApp);
  try {
    const { cookie, csrf } = await signInHttp(app.url, 'estimator@example.com');
    const headers = { cookie, 'content-type': 'application/json', 'x-csrf-token': csrf };
    const [{ id }] = (await sequelize.query("SELECT id FROM estimates WHERE number LIKE 'EST-%' ORDER BY id LIMIT 1"))[0] as [{ id: number }];
    const preview = JSON.stringify({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' });

    console.log(`Node ${process.version}; ${CONNECTIONS} connections, ${SECONDS} s each, loopback; one process for the app.`);
    const rows: Row[] = [];
    rows.push(await run('bare Express GET /bare', { url: `${bare.url}/bare` }));
    rows.push(await run('POST /api/calc/preview (default grand)', { url: `${app.url}/api/calc/preview`, method: 'POST', headers, body: preview }));
    rows.push(await run('GET /api/estimates (10 000, page 1)', { url: `${app.url}/api/estimates?sort=updatedAt&dir=desc&page=1&pageSize=25`, headers }));
    rows.push(await run('GET /api/estimates?q=grand&sort=total', { url: `${app.url}/api/estimates?q=grand&sort=total&dir=desc&page=3`, headers }));
    rows.push(await run(`GET /api/estimates/${id} (detail)`, { url: `${app.url}/api/estimates/${id}`, headers }));
    const base = rows[0]!.rps;
    console.log('\nendpoint'.padEnd(46) + 'req/s'.padStart(9) + 'p50 ms'.padStart(9) + 'p99 ms'.padStart(9) + 'ratio'.padStart(8) + 'errors'.padStart(8) + 'non-2xx'.padStart(9));
    for (const r of rows) {
      console.log(
        r.name.padEnd(45) +
          r.rps.toFixed(0).padStart(9) +
          String(r.p50).padStart(9) +
          String(r.p99).padStart(9) +
          (r.rps / base).toFixed(3).padStart(8) +
          String(r.errors).padStart(8) +
          String(r.non2xx).padStart(9),
      );
    }

    const [plan] = await sequelize.query(
      `EXPLAIN SELECT e.* FROM estimates e JOIN customers c ON c.id = e.customer_id
        WHERE e.archived = false ORDER BY e.updated_at DESC, e.id DESC LIMIT 25`,
    );
    console.log('\nplan of the estimates list (first page):');
    for (const line of plan as { 'QUERY PLAN': string }[]) console.log(`  ${line['QUERY PLAN']}`);

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
    await app.close();
    await bare.close();
    await built.close();
    await sequelize.close();
    stopCluster(cluster);
  }
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
