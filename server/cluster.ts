/**
 * `npm run serve`: production serving, one process per core (node:cluster). The primary prepares the database once
 * (migrations, defaults) and starts the local stand-ins for mail and payments where the configuration leaves them
 * out, then forks the workers; each worker runs the app and they share the one port. A worker that dies is replaced;
 * SIGINT/SIGTERM stops the workers (each finishes its open requests), then the primary.
 *
 * WEB_CONCURRENCY sets the number of workers (default: the cores available to this process).
 */
import cluster, { type Worker } from 'node:cluster';
import os from 'node:os';
import { pathToFileURL } from 'node:url';
import { paymentStateFile, startLocalServices } from './fakes';
import { createAppSequelize } from './db/sequelize';
import { connectDemoWorkshops } from './seeders';
import { loadConfig } from './config';
import { resolveDatabaseUrl } from './db/connect';
import { appUrlOrExplicit, prepareDatabase, runServer } from './index';

export function workerCount(raw = process.env.WEB_CONCURRENCY): number {
  if (raw === undefined || raw === '') return os.availableParallelism();
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 256) throw new Error(`WEB_CONCURRENCY must be a whole number from 1 to 256, got "${raw}"`);
  return n;
}

async function primary(): Promise<void> {
  const count = workerCount();
  const config = loadConfig();
  const databaseUrl = await resolveDatabaseUrl(config);
  // The models bind to one connection a process: the primary prepares the database and readies the demo accounts on
  // one connection of the app's role, closed before the workers start.
  const sequelize = createAppSequelize(appUrlOrExplicit(databaseUrl));
  let appUrl: string;
  let local: Awaited<ReturnType<typeof startLocalServices>>;
  try {
    appUrl = await prepareDatabase(config, databaseUrl, sequelize);
    // One set of stand-ins for all workers, so that a payment webhook is verified whichever worker it reaches.
    local = await startLocalServices(config, { paymentsState: paymentStateFile(config) });
    // The demo workshops' card-payment accounts at the stand-in, made ready once here for every worker.
    if (config.demo && local.payments) await connectDemoWorkshops(sequelize, config, local.payments);
  } finally {
    await sequelize.close();
  }
  // Workers connect as the app's role the primary set up (and do not set it up again side by side).
  const env: Record<string, string> = { DATABASE_URL: databaseUrl, APP_DATABASE_URL: appUrl };
  if (config.mail.url) env.SMTP_URL = config.mail.url;
  if (config.payments.apiUrl) env.PAYMENTS_API_URL = config.payments.apiUrl;
  if (config.payments.secretKey) env.PAYMENTS_SECRET_KEY = config.payments.secretKey;
  if (config.payments.webhookSecret) env.PAYMENTS_WEBHOOK_SECRET = config.payments.webhookSecret;

  let stopping = false;
  const started = new Map<number, number>();
  let quickFailures = 0;
  const fork = (): Worker => {
    const w = cluster.fork(env);
    started.set(w.id, Date.now());
    return w;
  };
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) return;
    // A worker that dies within 10 s of starting cannot start (port taken, database gone): give up after five.
    quickFailures = Date.now() - (started.get(worker.id) ?? 0) < 10_000 ? quickFailures + 1 : 0;
    if (quickFailures >= 5) {
      console.error('[cluster] workers keep failing at start: stopping');
      process.kill(process.pid, 'SIGTERM');
      return;
    }
    console.error(`[cluster] worker ${worker.id} stopped (${signal ?? `exit ${code}`}): starting another`);
    setTimeout(fork, quickFailures * 1_000);
  });
  console.log(`[cluster] starting ${count} worker${count === 1 ? '' : 's'} on ${config.host}:${config.port}`);
  for (let i = 0; i < count; i++) fork();

  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      stopping = true;
      console.log(`\n[cluster] ${signal}: stopping the workers`);
      const workers = Object.values(cluster.workers ?? {}).filter((w): w is Worker => Boolean(w));
      Promise.all(
        workers.map(
          (w) =>
            new Promise<void>((resolve) => {
              w.once('exit', () => resolve());
              w.process.kill('SIGTERM');
            }),
        ),
      )
        .then(() => local.stop())
        .then(
          () => process.exit(0),
          () => process.exit(1),
        );
    });
  }
}

async function worker(): Promise<void> {
  const running = await runServer(loadConfig(), { prepared: true });
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      running.stop().then(
        () => process.exit(0),
        () => process.exit(1),
      );
    });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  (cluster.isPrimary ? primary() : worker()).catch((err: unknown) => {
    console.error(`[${cluster.isPrimary ? 'cluster' : 'server'}] could not start: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });
}
