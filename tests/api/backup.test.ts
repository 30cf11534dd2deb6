/** `npm run db:backup` and `db:restore` round-trip: a backup restored elsewhere holds the same rows. */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { rootDir } from '../../server/config';
import { testDatabaseUrl } from '../helpers/app';

const scratchName = `shellwright_restore_${process.pid}`;
const file = path.join(os.tmpdir(), `shellwright-backup-${process.pid}.dump`);

function urlFor(database: string): string {
  const url = new URL(testDatabaseUrl());
  url.pathname = `/${database}`;
  return url.toString();
}

async function withClient<T>(url: string, fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

function db(command: string, url: string, arg: string): string {
  return execFileSync(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'cli', 'db.ts'), command, arg], {
    cwd: rootDir,
    env: { ...process.env, DATABASE_URL: url },
    encoding: 'utf8',
    stdio: ['ignore', 'pipe', 'pipe'],
  });
}

const counts = (url: string) =>
  withClient(url, async (c) => {
    const tables = ['users', 'customers', 'pieces', 'estimates', 'estimate_revisions', 'materials', 'pack_prices', 'schema_migrations'];
    const out: Record<string, number> = {};
    for (const t of tables) out[t] = Number((await c.query(`SELECT count(*) FROM ${t}`)).rows[0].count);
    return out;
  });

afterAll(async () => {
  fs.rmSync(file, { force: true });
  await withClient(urlFor('postgres'), (c) => c.query(`DROP DATABASE IF EXISTS "${scratchName}" WITH (FORCE)`)).catch(() => {});
});

describe('backup and restore', () => {
  it('restores a backup into an empty database with the same rows, and a second restore undoes later changes', async () => {
    const source = testDatabaseUrl();
    db('backup', source, file);
    expect(fs.statSync(file).size).toBeGreaterThan(10_000);
    await withClient(urlFor('postgres'), (c) => c.query(`CREATE DATABASE "${scratchName}"`));
    const target = urlFor(scratchName);
    db('restore', target, file);
    expect(await counts(target)).toEqual(await counts(source));
    await withClient(target, (c) => c.query("INSERT INTO customers (workshop_id, name, created_at, updated_at) VALUES ((SELECT min(id) FROM workshops), 'Added after the backup', now(), now())"));
    db('restore', target, file);
    const after = await withClient(target, (c) => c.query("SELECT count(*) FROM customers WHERE name = 'Added after the backup'"));
    expect(Number(after.rows[0].count)).toBe(0);
    // A hang guard, not a speed target: three runs of the CLI (each a Node.js start, pg_dump or pg_restore) take
    // most of 30 s on a busy 2-core machine.
  }, 180_000);

  it('refuses to restore a file that is not a backup, and leaves the database as it was', async () => {
    const bogus = path.join(os.tmpdir(), `not-a-backup-${process.pid}.dump`);
    fs.writeFileSync(bogus, 'this is not a dump');
    try {
      const target = urlFor(scratchName);
      const before = await counts(target);
      expect(() => db('restore', target, bogus)).toThrow();
      expect(await counts(target)).toEqual(before);
    } finally {
      fs.rmSync(bogus, { force: true });
    }
  }, 180_000);
});
