/**
 * `npm run dev`: the API on 127.0.0.1:3000 (the same private database as `npm start`) and Vite with hot reload on
 * 127.0.0.1:5173, which proxies /api to it. Open the Vite address while you work on the client.
 */
import path from 'node:path';
import { loadConfig, rootDir } from '../config';
import { clusterUrl, describeCluster, ensureDatabase, startCluster } from '../db/cluster';
import { DEV_DATABASE } from '../db/connect';
import { runServer } from '../index';

async function main(): Promise<void> {
  const config = loadConfig();
  if (!config.databaseUrl) {
    const cluster = describeCluster(config.dataDir);
    startCluster(cluster);
    await ensureDatabase(cluster, DEV_DATABASE);
    config.databaseUrl = clusterUrl(cluster, DEV_DATABASE);
  }
  const api = await runServer(config);
  const { createServer } = await import('vite');
  const vite = await createServer({ root: rootDir, configFile: path.join(rootDir, 'vite.config.ts') });
  await vite.listen();
  vite.printUrls();
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      Promise.all([vite.close(), api.stop()]).then(
        () => process.exit(0),
        () => process.exit(1),
      );
    });
  }
}

main().catch((err: unknown) => {
  console.error(`[dev] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
