/**
 * `npm run bench:editor`: how long the estimate editor takes, in Debian's headless Chromium (playwright-core), from
 * a key typed in a dimension to the recomputed figures on screen, for the default grand (its length, in the
 * template) and for a 200-part piece (one part's length, in the parts table). The built app runs as `npm run serve`
 * runs it, against the bench database (tests/bench/bench-env.ts).
 *
 * Each sample is one keystroke (a backspace or a digit, so the length stays readable): from the key's event time to
 * the first frame after the live figures changed (a MutationObserver on the figures, then requestAnimationFrame).
 * Prints the median and p90 against the one-frame target of 16 ms. Figures only, no pass/fail.
 * Options: BENCH_KEYS (keystrokes per piece, default 40), BENCH_CPU_THROTTLE (Chromium CPU slow-down, default 1),
 * BENCH_PROFILE=1 (keep CPU profiles of the typing).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { buildClientIfNeeded } from '../../server/cli/build-client';
import { rootDir } from '../../server/config';
import { stopCluster } from '../../server/db/cluster';
import { BIG_PARTS } from '../fixtures/golden/cases';
import { launchBrowser } from '../helpers/browser';
import { BENCH_DATA_DIR, benchDatabase, signInHttp } from './bench-env';
import { freePort } from '../helpers/ports';

const KEYS = Number(process.env.BENCH_KEYS ?? 40);
const THROTTLE = Number(process.env.BENCH_CPU_THROTTLE ?? 1);
const TARGET_MS = 16;
/** BENCH_PROFILE=1 keeps a CPU profile of each piece's typing in tests/artifacts (open it in Chromium's DevTools). */
const PROFILE = process.env.BENCH_PROFILE === '1';


/** The app in one worker process, as `npm run serve` runs it; resolves once it says it is up. */
async function serveApp(env: Record<string, string>): Promise<{ url: string; stop: () => Promise<void> }> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server/cluster.ts')], {
    cwd: rootDir,
    env: { ...process.env, ...env, PORT: String(port), WEB_CONCURRENCY: '1' },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => {
      // Stop it, or it would stay behind this script.
      child.kill('SIGTERM');
      reject(new Error('the app was not up after three minutes'));
    }, 180_000);
    child.once('exit', () => reject(new Error('the app stopped before it was up')));
    child.stdout!.on('data', (chunk: Buffer) => {
      if (/Shellwright is up/.test(chunk.toString())) {
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

interface Mark {
  key: number;
  changed: number;
  frame: number;
}

declare global {
  interface Window {
    __editorBench?: { marks: Mark[] };
  }
}

/** Watches the live figures: each key's time, the time they changed after it, and the next frame's. */
async function watchFigures(page: Page): Promise<void> {
  await page.evaluate(() => {
    const bench = { marks: [] as Mark[] };
    window.__editorBench = bench;
    const figures = document.querySelector('aside[aria-label="Live estimate"]');
    if (!figures) throw new Error('no live figures on the page');
    let pending: { key: number; changed?: number } | null = null;
    document.addEventListener('keydown', (e) => {
      pending = { key: e.timeStamp };
    }, true);
    new MutationObserver(() => {
      const p = pending;
      if (!p || p.changed !== undefined) return;
      p.changed = performance.now();
      requestAnimationFrame(() => {
        bench.marks.push({ key: p.key, changed: p.changed as number, frame: performance.now() });
        pending = null;
      });
    }).observe(figures, { subtree: true, childList: true, characterData: true, attributes: true });
  });
}

/** Types KEYS keystrokes in the field (backspace, digit, backspace, digit…) and returns key → frame times, ms. */
async function typeAndTime(page: Page, field: string, start: string, profileAs?: string): Promise<number[]> {
  const input = page.getByLabel(field, { exact: true }).first();
  await input.fill(start);
  await page.waitForTimeout(500);
  await input.focus();
  await input.press('End');
  await watchFigures(page);
  const cdp = PROFILE && profileAs ? await page.context().newCDPSession(page) : null;
  if (cdp) {
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.setSamplingInterval', { interval: 100 });
    await cdp.send('Profiler.start');
  }
  if (cdp) {
    // What the typing changes in the page's attributes, by element and attribute (a profile's DOM costs, named).
    await page.evaluate(() => {
      const counts: Record<string, number> = {};
      (window as unknown as { __attributeChanges: Record<string, number> }).__attributeChanges = counts;
      new MutationObserver((records) => {
        for (const r of records) {
          const el = r.target as HTMLInputElement;
          const where = el.closest('section[aria-labelledby], fieldset, li, tr')?.querySelector('h2, h3, legend')?.textContent?.slice(0, 24) ?? el.labels?.[0]?.textContent?.slice(0, 24) ?? '';
          const key = `${el.tagName.toLowerCase()} ${r.attributeName} in "${where.trim()}"`;
          counts[key] = (counts[key] ?? 0) + 1;
        }
      }).observe(document.body, { subtree: true, attributes: true });
    });
  }
  const times: number[] = [];
  for (let i = 0; i < KEYS; i++) {
    const key = i % 2 === 0 ? 'Backspace' : String((i * 7) % 10);
    await page.keyboard.press(key);
    await page.waitForFunction((n) => (window.__editorBench?.marks.length ?? 0) >= n, i + 1, { timeout: 10_000 });
    // Let the frame finish before the next key.
    await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0))));
  }
  if (cdp && profileAs) {
    const { profile } = await cdp.send('Profiler.stop');
    fs.mkdirSync(path.join(rootDir, 'tests', 'artifacts'), { recursive: true });
    const file = path.join(rootDir, 'tests', 'artifacts', `editor-${profileAs}.cpuprofile`);
    fs.writeFileSync(file, JSON.stringify(profile));
    console.log(`CPU profile of the typing: ${path.relative(rootDir, file)}`);
    const changes = await page.evaluate(() => (window as unknown as { __attributeChanges: Record<string, number> }).__attributeChanges);
    const top = Object.entries(changes).sort((a, b) => b[1] - a[1]).slice(0, 6);
    console.log(`attribute changes per keystroke: ${top.map(([k, n]) => `${k} ${(n / KEYS).toFixed(1)}`).join(', ') || 'none'}`);
  }
  const marks = await page.evaluate(() => window.__editorBench!.marks);
  for (const m of marks) times.push(m.frame - m.key);
  return times;
}

function stats(times: number[]): { median: number; p90: number; max: number } {
  const s = [...times].sort((a, b) => a - b);
  const at = (q: number): number => s[Math.min(s.length - 1, Math.floor(q * s.length))] as number;
  return { median: at(0.5), p90: at(0.9), max: s[s.length - 1] as number };
}

async function main(): Promise<void> {
  await buildClientIfNeeded();
  const { cluster, url, sequelize } = await benchDatabase({ estimates: 0 });
  const app = await serveApp({ DATABASE_URL: url, SHELLWRIGHT_DATA_DIR: BENCH_DATA_DIR, NODE_ENV: 'development', SHELLWRIGHT_LOGIN_ATTEMPTS: '1000' });
  const browser = await launchBrowser();
  try {
    const [[piece]] = (await sequelize.query('SELECT p.id, p.customer_id AS "customerId" FROM pieces p ORDER BY p.id LIMIT 1')) as [[{ id: number; customerId: number }], unknown];
    const { cookie, csrf } = await signInHttp(app.url, 'estimator@example.com');
    const create = async (input: unknown, title: string): Promise<number> => {
      const res = await fetch(`${app.url}/api/estimates`, {
        method: 'POST',
        headers: { cookie, 'content-type': 'application/json', 'x-csrf-token': csrf },
        body: JSON.stringify({ customerId: piece.customerId, pieceId: piece.id, title, input }),
      });
      if (!res.ok) throw new Error(`creating the bench estimate failed: ${res.status} ${await res.text()}`);
      return ((await res.json()) as { id: number }).id;
    };
    const grandId = await create({ piece: { template: 'grand', dimensions: { length: '1900' } }, system: 'full-repolish', startDate: '2025-03-03' }, 'Editor bench: grand');
    const bigId = await create({ piece: { parts: BIG_PARTS }, system: 'full-repolish', startDate: '2025-03-03' }, 'Editor bench: 200 parts');

    const [name, value] = cookie.split('=') as [string, string];
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    await context.addCookies([{ name, value, url: app.url }]);
    const page = await context.newPage();
    if (THROTTLE > 1) {
      const cdp = await context.newCDPSession(page);
      await cdp.send('Emulation.setCPUThrottlingRate', { rate: THROTTLE });
    }

    console.log(`Chromium ${browser.version()} headless; ${KEYS} keystrokes per piece${THROTTLE > 1 ? `; CPU slowed ${THROTTLE}×` : ''}; target ${TARGET_MS} ms (one frame).`);
    const rows: Array<[string, number[]]> = [];
    await page.goto(`${app.url}/estimates/${grandId}/edit`);
    await page.getByTestId('piece-area').waitFor();
    rows.push(['default grand: its length, in the template', await typeAndTime(page, 'Length', '1900', 'grand')]);

    await page.goto(`${app.url}/estimates/${bigId}/edit`);
    await page.getByTestId('row-area-0').waitFor();
    rows.push(['200-part piece: one part\'s length', await typeAndTime(page, 'Length of Part 1', '600', '200-parts')]);

    console.log(`${'key to figures on screen'.padEnd(46)}${'median'.padStart(9)}${'p90'.padStart(9)}${'max'.padStart(9)}${'target'.padStart(9)}`);
    for (const [what, times] of rows) {
      const s = stats(times);
      console.log(`${what.padEnd(46)}${s.median.toFixed(1).padStart(9)}${s.p90.toFixed(1).padStart(9)}${s.max.toFixed(1).padStart(9)}${String(TARGET_MS).padStart(9)}  ${s.median <= TARGET_MS ? 'met' : 'not met'} (median, ms)`);
    }
    await context.close();
    await sequelize.query("DELETE FROM estimates WHERE title LIKE 'Editor bench:%'").catch(() => undefined);
  } finally {
    await browser.close();
    await app.stop();
    await sequelize.close();
    stopCluster(cluster);
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exitCode = 1;
});
