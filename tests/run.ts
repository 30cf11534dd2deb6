/**
 * `npm test`: prepares a fresh test database (the private cluster's `shellwright_test`, or TEST_DATABASE_URL),
 * proves every migration's down by migrating up, all the way down and up again, loads the demo workshop, builds the
 * client for the browser tests, makes sure Chromium is there, then runs every Vitest project.
 */
import { execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { buildClientIfNeeded } from '../server/cli/build-client';
import { loadConfig, rootDir } from '../server/config';
import { clusterUrl, describeCluster, dropDatabase, ensureDatabase, startCluster, stopCluster, type Cluster } from '../server/db/cluster';
import { createMigrator } from '../server/db/migrator';
import { ensureAppRole } from '../server/db/app-role';
import { createAppSequelize, createSequelize } from '../server/db/sequelize';
import { initModels } from '../server/models';
import { connectDemoWorkshops, seed } from '../server/seeders';
import { startPaymentProvider } from '../server/fakes/payment-provider';

const CHROMIUM = '/usr/bin/chromium';

function ensureChromium(): void {
  if (fs.existsSync(CHROMIUM)) return;
  if (process.getuid?.() !== 0) {
    throw new Error(`The browser tests need Debian's Chromium at ${CHROMIUM}: sudo apt-get install -y chromium`);
  }
  console.log('[test] installing Debian\'s chromium for the browser tests…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'chromium', 'poppler-utils'], { stdio: 'inherit', env });
}

/** A database of this run's own, so that two runs on one machine never pull a database from under each other. */
const TEST_DATABASE = `shellwright_test_${process.pid}`;

async function prepareDatabase(): Promise<{ url: string; cluster?: Cluster; started?: Cluster }> {
  const explicit = process.env.TEST_DATABASE_URL;
  if (explicit) return { url: explicit };
  const config = loadConfig();
  const cluster = describeCluster(config.dataDir);
  const started = startCluster(cluster) ? cluster : undefined;
  await ensureDatabase(cluster, TEST_DATABASE, { fresh: true });
  return { url: clusterUrl(cluster, TEST_DATABASE), cluster, started };
}

async function main(): Promise<number> {
  const vitestArgs = process.argv.slice(2);
  // Uploads made by the tests go to a folder of their own, emptied on every run.
  process.env.SHELLWRIGHT_UPLOADS_DIR = path.join(loadConfig().dataDir, `test-uploads-${process.pid}`);
  fs.rmSync(process.env.SHELLWRIGHT_UPLOADS_DIR, { recursive: true, force: true });
  const { url, cluster, started } = await prepareDatabase();
  let appUrl = '';
  try {
    const sequelize = createSequelize(url);
    const migrator = createMigrator(sequelize, { quiet: true });
    await migrator.up();
    await migrator.down({ to: 0 });
    await migrator.up();
    console.log(`[test] migrations: ${(await migrator.executed()).length} applied, each reverted and re-applied`);
    await sequelize.close();
    // The app's role (row-level security binds it) loads the demo, as `npm start` does.
    appUrl = await ensureAppRole(url);
    const app = createAppSequelize(appUrl);
    initModels(app);
    await seed(app, { demo: true, uploadsDir: loadConfig().uploadsDir });
    // The demo workshop's card-payment account, made ready at a stand-in as `npm start` does; each test file's own
    // stand-in takes it back (tests/helpers/app.ts startServices).
    const apiKey = 'sk_test_shellwright_local';
    const provider = await startPaymentProvider({ apiKey, webhookSecret: 'whsec_test_runner', webhookUrl: 'http://127.0.0.1:9/unused' });
    try {
      await connectDemoWorkshops(app, { ...loadConfig(), payments: { apiUrl: provider.url, secretKey: apiKey, webhookSecret: 'whsec_test_runner' } }, provider);
    } finally {
      await provider.stop();
    }
    await app.close();

    // The browser tests need Chromium and the built client; a run of other projects only does not.
    const projects = vitestArgs.flatMap((a, i) => (a === '--project' ? [vitestArgs[i + 1]] : a.startsWith('--project=') ? [a.slice(10)] : []));
    if (projects.length === 0 || projects.includes('e2e')) {
      ensureChromium();
      await buildClientIfNeeded((m) => console.log(m));
    }

    const artifacts = path.join(rootDir, 'tests', 'artifacts');
    fs.mkdirSync(artifacts, { recursive: true });
    const report = path.join(artifacts, 'vitest-report.json');
    fs.rmSync(report, { force: true });
    const code = await new Promise<number>((resolve) => {
      const child = spawn(
        process.execPath,
        [path.join(rootDir, 'node_modules', 'vitest', 'vitest.mjs'), 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...vitestArgs],
        { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'test', DATABASE_URL: url, APP_DATABASE_URL: appUrl, SHELLWRIGHT_TEST: '1' }, cwd: rootDir },
      );
      child.on('exit', (c, signal) => resolve(c ?? (signal ? 1 : 0)));
    });
    if (fs.existsSync(report)) {
      const r = JSON.parse(fs.readFileSync(report, 'utf8')) as { numPassedTests: number; numFailedTests: number; numPendingTests: number };
      console.log(`\ntests: ${r.numPassedTests} passed, ${r.numFailedTests} failed, ${r.numPendingTests} skipped`);
    }
    return code;
  } finally {
    if (cluster) await dropDatabase(cluster, TEST_DATABASE);
    fs.rmSync(process.env.SHELLWRIGHT_UPLOADS_DIR, { recursive: true, force: true });
    if (started) stopCluster(started);
  }
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`[test] ${err instanceof Error ? err.stack : String(err)}`);
    process.exit(1);
  },
);
