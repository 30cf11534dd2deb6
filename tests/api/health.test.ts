import pg from 'pg';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { closeTestApp, getTestApp, signInAs, testDatabaseUrl } from '../helpers/app';

const { app } = getTestApp();
afterAll(closeTestApp);

/** A superuser connection to the cluster's maintenance database, to take the test database away and back. */
async function admin<T>(fn: (c: pg.Client, dbName: string) => Promise<T>): Promise<T> {
  const url = new URL(testDatabaseUrl());
  const dbName = url.pathname.slice(1);
  url.pathname = '/postgres';
  const client = new pg.Client({ connectionString: url.toString() });
  await client.connect();
  try {
    return await fn(client, dbName);
  } finally {
    await client.end();
  }
}

describe('GET /api/health', () => {
  it('says ok when the database answers', async () => {
    const res = await request(app).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('answers 503 with db "down" while the database refuses connections, and recovers without a restart', async () => {
    const isSuper = await admin(async (c) => (await c.query("SELECT rolsuper FROM pg_roles WHERE rolname = current_user")).rows[0]?.rolsuper === true);
    if (!isSuper) return; // TEST_DATABASE_URL without superuser rights cannot take the database away.
    const owner = await signInAs(app, 'owner');
    await admin(async (c, db) => {
      await c.query(`ALTER DATABASE "${db}" ALLOW_CONNECTIONS false`);
      await c.query('SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()', [db]);
    });
    try {
      const down = await request(app).get('/api/health');
      expect(down.status).toBe(503);
      expect(down.body).toEqual({ status: 'degraded', db: 'down' });
      const api = await owner.agent.get('/api/users');
      expect(api.status).toBe(503);
      expect(JSON.parse(api.text).code).toBe('database_unavailable');
    } finally {
      await admin((c, db) => c.query(`ALTER DATABASE "${db}" ALLOW_CONNECTIONS true`));
    }
    const up = await request(app).get('/api/health');
    expect(up.status).toBe(200);
    expect(up.body.db).toBe('ok');
    await owner.agent.get('/api/users').expect(200);
  });
});
