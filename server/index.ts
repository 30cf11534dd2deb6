/**
 * Starts the server: connects, applies pending migrations, loads the demo workshop where allowed, listens, and
 * shuts down cleanly on SIGINT/SIGTERM. `npm start` prepares the private database first and then calls this.
 */
import cluster from 'node:cluster';
import http from 'node:http';
import { pathToFileURL } from 'node:url';
import { createApp } from './app';
import { paymentStateFile, startLocalServices } from './fakes';
import { loadConfig, type Config } from './config';
import { resolveDatabaseUrl } from './db/connect';
import { createMigrator } from './db/migrator';
import type { Sequelize } from 'sequelize';
import { appUrlOf, ensureAppRole } from './db/app-role';
import { createAppSequelize, createSequelize } from './db/sequelize';
import { initModels } from './models';
import { connectDemoWorkshops, seed } from './seeders';

export interface RunningServer {
  server: http.Server;
  url: string;
  stop(): Promise<void>;
}

/** The app's URL before the role exists (prepareDatabase creates it before the first connection is made). */
export function appUrlOrExplicit(ownerUrl: string): string {
  return process.env.APP_DATABASE_URL || appUrlOf(ownerUrl);
}

function portFromEnv(name: string): number | undefined {
  const raw = process.env[name];
  return raw ? Number(raw) : undefined;
}

/**
 * Applies pending migrations as the owning role (`databaseUrl`), sets up the app's role (`shellwright_app`, which
 * row-level security binds), and loads the defaults (and the demo workshops where allowed) through the app's role.
 * Given the app's connection, it seeds on it and leaves it open (the models bind to one connection a process);
 * otherwise it opens and closes its own. Answers the URL the app connects with.
 */
export async function prepareDatabase(config: Config, databaseUrl: string, shared?: Sequelize): Promise<string> {
  const owner = createSequelize(databaseUrl, { poolMax: 2 });
  try {
    await createMigrator(owner).up();
  } finally {
    await owner.close();
  }
  const appUrl = await ensureAppRole(databaseUrl);
  const sequelize = shared ?? createAppSequelize(appUrl);
  try {
    initModels(sequelize);
    await seed(sequelize, { demo: config.demo, uploadsDir: config.uploadsDir, log: (m) => console.log(`[demo] ${m}`) });
  } finally {
    if (!shared) await sequelize.close();
  }
  return appUrl;
}

/**
 * Prepares the database (unless `prepared`: one of several processes whose primary did it), starts the local
 * stand-ins where the configuration leaves them out, and listens.
 */
export async function runServer(config: Config = loadConfig(), opts: { prepared?: boolean } = {}): Promise<RunningServer> {
  const ownerUrl = await resolveDatabaseUrl(config);
  const appUrl = opts.prepared ? await ensureAppRole(ownerUrl) : appUrlOrExplicit(ownerUrl);
  const sequelize = createAppSequelize(appUrl);
  if (!opts.prepared) await prepareDatabase(config, ownerUrl, sequelize);
  initModels(sequelize);

  const local = await startLocalServices(config, {
    smtpPort: portFromEnv('SHELLWRIGHT_SMTP_PORT'),
    paymentsPort: portFromEnv('SHELLWRIGHT_PAYMENTS_PORT'),
    paymentsState: paymentStateFile(config),
  });
  if (local.mail) console.log(`[mail] local mail catcher on ${local.mail.url}: sent mail is kept in .data/mail and on the Outbox page`);
  if (local.payments) console.log(`[payments] local payment stand-in on ${local.payments.url}: accounts and checkouts kept in ${paymentStateFile(config)}`);
  // The demo workshops take card payments on their own ready accounts at the stand-in (never with a real provider).
  if (config.demo && local.payments) await connectDemoWorkshops(sequelize, config, local.payments);
  const built = createApp({ config, sequelize, databaseUrl: appUrl });
  const server = http.createServer(built.app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.port, config.host, resolve);
  });
  const url = `http://${config.host}:${config.port}`;
  console.log(`[server] Shellwright is up at ${url}${cluster.isWorker ? ` (worker ${cluster.worker!.id}, pid ${process.pid})` : ''}`);

  let stopping: Promise<void> | undefined;
  const stop = () => {
    stopping ??= (async () => {
      // Stop taking connections and let the requests in progress finish (their handlers still need the database,
      // closed below); idle keep-alive connections close now, and any still open after 10 s are cut.
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeIdleConnections();
      const cut = setTimeout(() => server.closeAllConnections(), 10_000);
      cut.unref();
      await closed;
      clearTimeout(cut);
      await built.close();
      await local.stop();
      await sequelize.close();
    })();
    return stopping;
  };
  return { server, url, stop };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runServer().then(
    (running) => {
      for (const signal of ['SIGINT', 'SIGTERM'] as const) {
        process.once(signal, () => {
          console.log(`\n[server] ${signal}: stopping`);
          running.stop().then(() => process.exit(0));
        });
      }
    },
    (err: unknown) => {
      console.error(`[server] could not start: ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    },
  );
}
