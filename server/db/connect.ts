import type { Config } from '../config';
import { clusterUrl, describeCluster, ensureDatabase, startCluster } from './cluster';

export const DEV_DATABASE = 'shellwright';

/**
 * The database URL to use: DATABASE_URL when set, otherwise the private cluster in .data/ (started and the database
 * created as needed).
 */
export async function resolveDatabaseUrl(config: Config, database = DEV_DATABASE): Promise<string> {
  if (config.databaseUrl) return config.databaseUrl;
  const cluster = describeCluster(config.dataDir);
  startCluster(cluster);
  await ensureDatabase(cluster, database);
  return clusterUrl(cluster, database);
}
