/**
 * Database chores on the private cluster (or DATABASE_URL where it applies):
 *   start | stop | migrate | rollback | reset | backup [file] | restore <file>
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../config';
import { clientProgram, clusterUrl, describeCluster, ensureDatabase, findServerBin, startCluster, stopCluster } from '../db/cluster';
import { DEV_DATABASE, resolveDatabaseUrl } from '../db/connect';
import { createMigrator } from '../db/migrator';
import { createSequelize } from '../db/sequelize';
import { prepareDatabase } from '../index';
import { QUEUE_SCHEMA } from '../services/messages/queue';

const config = loadConfig();

function pgTool(name: string): string {
  const bin = findServerBin();
  return bin ? clientProgram({ binDir: bin }, name) : name;
}

function stamp(): string {
  return new Date().toISOString().replace(/[:]/g, '-').replace(/\..+$/, '');
}

async function withDb<T>(fn: (url: string) => Promise<T>): Promise<T> {
  const url = await resolveDatabaseUrl(config);
  return fn(url);
}

async function main(command: string | undefined, arg: string | undefined): Promise<void> {
  switch (command) {
    case 'start': {
      const cluster = describeCluster(config.dataDir);
      startCluster(cluster);
      await ensureDatabase(cluster, DEV_DATABASE);
      console.log(`[db] running on 127.0.0.1:${cluster.port}, data in ${cluster.dataDir}`);
      return;
    }
    case 'stop':
      stopCluster(describeCluster(config.dataDir));
      return;
    case 'migrate':
    case 'rollback':
      await withDb(async (url) => {
        const sequelize = createSequelize(url);
        const migrator = createMigrator(sequelize);
        if (command === 'migrate') await migrator.up();
        else await migrator.down();
        await sequelize.close();
      });
      return;
    case 'reset': {
      if (config.databaseUrl) throw new Error('db:reset only resets the private cluster; unset DATABASE_URL');
      const cluster = describeCluster(config.dataDir);
      startCluster(cluster);
      await ensureDatabase(cluster, DEV_DATABASE, { fresh: true });
      fs.rmSync(config.uploadsDir, { recursive: true, force: true });
      // Migrations as the owner, then the defaults and demo through the app's role, which row-level security binds
      // (as `npm start` does): seeding as the owner would see every workshop's rows at once.
      await prepareDatabase(config, clusterUrl(cluster, DEV_DATABASE));
      console.log(`[db] reset: fresh database with migrations${config.demo ? ' and the demo workshops' : ''}`);
      return;
    }
    case 'backup':
      await withDb(async (url) => {
        const dir = path.join(config.dataDir, 'backups');
        fs.mkdirSync(dir, { recursive: true });
        const file = path.resolve(arg ?? path.join(dir, `shellwright-${stamp()}.dump`));
        // The message queue's own schema (pg-boss) is left out: it is rebuilt when the app starts, and messages still
        // queued in the outbox are put back on the queue then (docs/messages.md).
        const result = spawnSync(pgTool('pg_dump'), ['--format=custom', '--no-owner', `--exclude-schema=${QUEUE_SCHEMA}`, '--file', file, url], { stdio: 'inherit' });
        if (result.status !== 0) throw new Error('pg_dump failed');
        console.log(`[db] backup written to ${file}`);
      });
      return;
    case 'restore':
      if (!arg) throw new Error('usage: npm run db:restore -- <file.dump>');
      if (!fs.existsSync(arg)) throw new Error(`no such backup file: ${arg}`);
      await withDb(async (url) => {
        const result = spawnSync(pgTool('pg_restore'), ['--clean', '--if-exists', '--no-owner', `--exclude-schema=${QUEUE_SCHEMA}`, '--single-transaction', '--dbname', url, arg], {
          stdio: 'inherit',
        });
        if (result.status !== 0) throw new Error('pg_restore failed: the database was left as it was');
        console.log(`[db] restored from ${arg}`);
      });
      return;
    default:
      throw new Error('usage: db.ts start|stop|migrate|rollback|reset|backup [file]|restore <file>');
  }
}

main(process.argv[2], process.argv[3]).catch((err: unknown) => {
  console.error(`[db] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
