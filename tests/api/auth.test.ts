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

describe('sign-in rate limit', () => {
  it('blocks an address after too many failed attempts for one e-mail, with 429', async () => {
    // A separate app instance with a small limit, on the same database.
    const limited = createApp({ config: { ...loadConfig(), loginAttempts: 3 }, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    try {
      const s = await anonymous(limited.app);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const res = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'workshop@example.com', password: `wrong-${i}` });
        statuses.push(res.status);
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
      // The right password is refused too while the limit holds.
      const blocked = await s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: 'workshop@example.com', password: DEMO_PASSWORD });
      expect(blocked.status).toBe(429);
      expect(JSON.parse(blocked.text).code).toBe('too_many_attempts');
      // Another e-mail from the same address is not blocked.
      const other = await signIn(limited.app, 'estimator@example.com', DEMO_PASSWORD);
      expect(other.csrf).toBeTruthy();
    } finally {
      await limited.close();
    }
  });
});
