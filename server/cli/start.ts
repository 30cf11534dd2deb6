/**
 * `npm start`: the private PostgreSQL on loopback (installed and created on first run), migrations, the two demo
 * workshops, the client build when stale, then one Express process serving app and API on 127.0.0.1:3000.
 * Ctrl-C stops the server, and the private database if this command started it; the data stays in .data/.
 */
import { loadConfig } from '../config';
import { clusterUrl, describeCluster, ensureDatabase, startCluster, stopCluster, type Cluster } from '../db/cluster';
import { DEV_DATABASE } from '../db/connect';
import { runServer } from '../index';
import { DEMOS } from '../seeders';
import { DEMO_PASSWORD } from '../seeders/demo';
import { buildClientIfNeeded } from './build-client';

async function main(): Promise<void> {
  const config = loadConfig();
  let started: Cluster | undefined;
  if (!config.databaseUrl) {
    const cluster = describeCluster(config.dataDir);
    if (startCluster(cluster)) started = cluster;
    await ensureDatabase(cluster, DEV_DATABASE);
    config.databaseUrl = clusterUrl(cluster, DEV_DATABASE);
  }
  await buildClientIfNeeded();
  const running = await runServer(config);
  if (config.demo) {
    // Two invented workshops, kept apart: each person signs in to their own.
    console.log(`[start] demo sign-ins (demo only), password ${DEMO_PASSWORD}:`);
    for (const { workshop } of DEMOS) console.log(`[start]   ${workshop.name}: ${workshop.users.map((u) => u.email).join(', ')}`);
  }
  console.log('[start] Ctrl-C stops it; the data stays in .data/ for next time.');
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      console.log(`\n[start] ${signal}: stopping`);
      running
        .stop()
        .then(() => started && stopCluster(started))
        .then(
          () => process.exit(0),
          (err: unknown) => {
            console.error(err);
            process.exit(1);
          },
        );
    });
  }
}

main().catch((err: unknown) => {
  console.error(`[start] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
