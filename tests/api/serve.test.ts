/**
 * `npm run serve` as production runs it, with the demo data and the local stand-ins: the primary migrates a new
 * database, loads the demo workshops, readies their card accounts at the payment stand-in, forks its workers, and
 * the service answers and signs in; SIGTERM stops it cleanly. (It once failed at start with the demo on: the models
 * were bound to two connections in the primary.)
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import supertest from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { rootDir } from '../../server/config';
import { testDatabaseUrl } from '../helpers/app';
import { freePort } from '../helpers/ports';

const database = `shellwright_serve_${process.pid}`;
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'shellwright-serve-'));
let child: ChildProcess | undefined;

function urlFor(name: string): string {
  const url = new URL(testDatabaseUrl());
  url.pathname = `/${name}`;
  return url.toString();
}

async function onOwner(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: urlFor('postgres') });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}


afterAll(async () => {
  if (child && child.exitCode === null) child.kill('SIGKILL');
  await onOwner(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`).catch(() => undefined);
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('npm run serve', () => {
  it('starts on a new database with the demo data, answers, signs in, and stops on SIGTERM', async () => {
    await onOwner(`CREATE DATABASE "${database}"`);
    const port = await freePort();
    child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'cluster.ts')], {
      cwd: rootDir,
      env: { ...process.env, DATABASE_URL: urlFor(database), APP_DATABASE_URL: '', SHELLWRIGHT_DATA_DIR: dataDir, NODE_ENV: 'development', PORT: String(port), WEB_CONCURRENCY: '2' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    child.stdout!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    const exited = new Promise<number | null>((resolve) => child!.once('exit', (code) => resolve(code)));
    // Both workers up, or the primary gone: whichever comes first (no clock involved).
    const up = await new Promise<boolean>((resolve) => {
      const check = () => {
        if ((output.match(/Shellwright is up/g) ?? []).length >= 2) resolve(true);
      };
      child!.stdout!.on('data', check);
      void exited.then(() => resolve(false));
    });
    expect(up, output).toBe(true);

    const base = `http://127.0.0.1:${port}`;
    await supertest(base).get('/api/health').expect(200);
    const agent = supertest.agent(base);
    const csrf = (await agent.get('/api/auth/csrf').expect(200)).body.csrfToken as string;
    const login = await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email: 'estimator@example.com', password: 'shellwright-demo' });
    expect(login.status, JSON.stringify(login.body)).toBe(200);
    const list = await agent.get('/api/estimates').expect(200);
    expect(list.body.rows.length).toBeGreaterThan(0);

    child.kill('SIGTERM');
    expect(await exited, output).toBe(0);
  }, 600_000);
});
