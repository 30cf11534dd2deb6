import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { anonymous, closeTestApp, getTestApp, signIn, signInAs, testDatabaseUrl } from '../helpers/app';

const { app, sequelize } = getTestApp();
afterAll(closeTestApp);

describe('sign-in', () => {
  it('signs in a demo user, returns the user and a fresh CSRF token, and /me answers', async () => {
    const s = await anonymous(app);
    const res = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'Estimator@Example.com ', password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: 'estimator@example.com', role: 'estimator' });
    expect(res.body.user.passwordHash).toBeUndefined();
    expect(res.body.csrfToken).toMatch(/^[0-9a-f]{32,}$/);
    expect(res.body.csrfToken).not.toBe(s.csrf);
    const me = await s.agent.get('/api/auth/me').expect(200);
    expect(me.body.user.role).toBe('estimator');
  });

  it('sets an httpOnly, SameSite session cookie', async () => {
    const s = await anonymous(app);
    const res = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'sales@example.com', password: DEMO_PASSWORD });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/sw\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('refuses a wrong password with 401 problem+json', async () => {
    const s = await anonymous(app);
    const res = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'owner@example.com', password: 'not-the-password' });
    expect(res.status).toBe(401);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(JSON.parse(res.text)).toMatchObject({ status: 401, code: 'invalid_credentials' });
    await s.agent.get('/api/auth/me').expect(401);
  });

  it('names the missing field on a malformed sign-in', async () => {
    const s = await anonymous(app);
    const res = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'owner@example.com' });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'validation_failed', field: 'password' });
  });

  it('signs out: the session no longer reaches protected routes', async () => {
    const s = await signInAs(app, 'owner');
    await s.agent.get('/api/users').expect(200);
    await s.agent.post('/api/auth/logout').set('x-csrf-token', s.csrf).expect(204);
    const after = await s.agent.get('/api/users');
    expect(after.status).toBe(401);
    expect(JSON.parse(after.text).code).toBe('unauthenticated');
  });

  it('answers 401 problem+json to a signed-out caller', async () => {
    const res = await request(app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  });
});

describe('CSRF', () => {
  it('rejects a cookie-authenticated write without a token', async () => {
    const s = await signInAs(app, 'owner');
    const res = await s.agent.post('/api/users').send({ email: 'x@example.com', name: 'X', role: 'sales', password: 'long-enough-1' });
    expect(res.status).toBe(403);
    expect(JSON.parse(res.text).code).toBe('csrf_invalid');
  });

  it('rejects a write with a token from another session', async () => {
    const a = await signInAs(app, 'owner');
    const b = await anonymous(app);
    const res = await a.agent.post('/api/auth/logout').set('x-csrf-token', b.csrf);
    expect(res.status).toBe(403);
    await a.agent.get('/api/users').expect(200);
  });

  it('rejects sign-in without a token', async () => {
    const res = await request(app).post('/api/auth/login').send({ email: 'owner@example.com', password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
  });
});

describe('security headers', () => {
  it('sends helmet headers and a content security policy', async () => {
    const res = await request(app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/);
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

describe('sign-in limits', () => {
  const clear = () => sequelize.query('DELETE FROM login_attempts');
  const attempt = (s: Awaited<ReturnType<typeof anonymous>>, email: string, password: string) =>
    s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email, password });

  it('blocks an account after too many failed attempts, with 429 and Retry-After, from any address', async () => {
    await clear();
    // A separate app instance with a small limit, on the same database.
    const limited = createApp({ config: { ...loadConfig(), loginAttempts: 3 }, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    try {
      const s = await anonymous(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) statuses.push((await attempt(s, 'workshop@example.com', `wrong-${i}`)).status);
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
      // The right password is refused too while the limit holds.
      const blocked = await attempt(s, 'workshop@example.com', DEMO_PASSWORD);
      expect(blocked.status).toBe(429);
      expect(JSON.parse(blocked.text).code).toBe('too_many_attempts');
      expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
      // Another e-mail from the same address is not blocked.
      const other = await signIn(limited.app, 'estimator@example.com', DEMO_PASSWORD);
      expect(other.csrf).toBeTruthy();
    } finally {
      await limited.close();
      await clear();
    }
  });

  it('counts per address too: one address trying many accounts (password spraying) is stopped', async () => {
    await clear();
    const limited = createApp({ config: { ...loadConfig(), loginAddressAttempts: 4 }, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    try {
      const s = await anonymous(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 6; i++) statuses.push((await attempt(s, `spray-${i}@example.com`, 'Autumn2026!')).status);
      expect(statuses).toEqual([401, 401, 401, 401, 429, 429]);
      // The address is held even for a real account with its right password.
      expect((await attempt(s, 'sales@example.com', DEMO_PASSWORD)).status).toBe(429);
    } finally {
      await limited.close();
      await clear();
    }
  });

  it('keeps the counters in PostgreSQL: two instances share them, and parallel guesses cannot pass the limit', async () => {
    await clear();
    const config = { ...loadConfig(), loginAttempts: 4 };
    const a = createApp({ config, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    const b = createApp({ config, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    try {
      const [sa, sb] = await Promise.all([anonymous(a.app), anonymous(b.app)]);
      // Ten guesses at once, split across the two instances: exactly four reach the password check.
      const results = await Promise.all(Array.from({ length: 10 }, (_, i) => attempt(i % 2 ? sa : sb, 'owner@example.com', `guess-${i}`)));
      const statuses = results.map((r) => r.status).sort();
      expect(statuses.filter((st) => st === 401)).toHaveLength(4);
      expect(statuses.filter((st) => st === 429)).toHaveLength(6);
      const [row] = await sequelize.query<{ points: number }>("SELECT points FROM login_attempts WHERE key = 'account:owner@example.com'", { type: 'SELECT' as never });
      expect(Number(row!.points)).toBe(10);
    } finally {
      await Promise.all([a.close(), b.close()]);
      await clear();
    }
  });

  it('a successful sign-in clears the account counter', async () => {
    await clear();
    const s = await anonymous(app);
    expect((await attempt(s, 'sales@example.com', 'not-it-at-all')).status).toBe(401);
    await signIn(app, 'sales@example.com', DEMO_PASSWORD);
    const rows = await sequelize.query<{ key: string }>("SELECT key FROM login_attempts WHERE key = 'account:sales@example.com'", { type: 'SELECT' as never });
    expect(rows).toHaveLength(0);
    await clear();
  });
});

describe('password length as bcrypt reads it', () => {
  it('refuses a new password over 72 bytes, counting bytes not characters', async () => {
    const owner = await signInAs(app, 'owner');
    const create = (password: string) =>
      owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email: `bytes-${Math.random().toString(36).slice(2)}@example.com`, name: 'Byte Count', role: 'sales', password });
    // 40 characters, 80 bytes: under the old character limit, over what bcrypt reads.
    const accented = 'é'.repeat(40);
    const res = await create(accented);
    expect(res.status).toBe(400);
    const problem = JSON.parse(res.text);
    expect(problem.field).toBe('password');
    expect(problem.detail).toMatch(/72 bytes/);
    expect((await create('x'.repeat(73))).status).toBe(400);
    // Exactly 72 bytes is accepted and signs in; the same with one more character does not.
    const exact = 'ü'.repeat(30) + 'abcdefghijkl';
    const email = `bytes-exact-${Date.now()}@example.com`;
    await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email, name: 'Exact', role: 'sales', password: exact }).expect(201);
    await signIn(app, email, exact);
    const s = await anonymous(app);
    const longer = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email, password: `${exact}z` });
    expect(longer.status).toBe(401);
    await sequelize.query('DELETE FROM login_attempts');
  });
});
