import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { closeTestApp, getTestApp, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let sales: Session;
let estimator: Session;

beforeAll(async () => {
  services = await startServices();
  sales = await signInAs(app, 'sales');
  estimator = await signInAs(app, 'estimator');
});
afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);

async function sentQuote(email: string): Promise<{ id: number; token: string; number: string }> {
  const c = await post(sales, '/api/customers', { name: `Client ${email}`, email }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: 'Upright' }).expect(201);
  const input = { piece: { template: 'upright' }, system: 'revive' };
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const s = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  return { id: q.body.id, token: s.body.link.split('/q/')[1], number: q.body.number };
}

describe('security', () => {
  it('marks the session cookie Secure behind a TLS-terminating proxy', async () => {
    const proxied = createApp({ config: { ...loadConfig(), trustProxy: true }, sequelize, databaseUrl: testDatabaseUrl(), serveClient: false });
    try {
      const res = await request(proxied.app).get('/api/auth/csrf').set('x-forwarded-proto', 'https');
      const cookie = String(res.headers['set-cookie']);
      expect(cookie).toMatch(/Secure/);
      expect(cookie).toMatch(/HttpOnly/);
      const plain = await request(proxied.app).get('/api/auth/csrf');
      expect(String(plain.headers['set-cookie'])).not.toMatch(/Secure/);
    } finally {
      await proxied.close();
    }
  });

  it('signing out deletes the session on the server, not only the cookie', async () => {
    const agent = request.agent(app);
    const csrf = (await agent.get('/api/auth/csrf')).body.csrfToken;
    const login = await agent.post('/api/auth/login').set('x-csrf-token', csrf).send({ email: 'workshop@example.com', password: DEMO_PASSWORD }).expect(200);
    const cookie = String(login.headers['set-cookie']).split(';')[0]!;
    expect(cookie).toMatch(/^sw\.sid=/);
    // The cookie works by hand while the session lives…
    await request(app).get('/api/auth/me').set('cookie', cookie).expect(200);
    await agent.post('/api/auth/logout').set('x-csrf-token', login.body.csrfToken).expect(204);
    // Replaying the old cookie by hand gets nowhere.
    const replay = await request(app).get('/api/auth/me').set('cookie', cookie);
    expect(replay.status).toBe(401);
  });

  it("a customer's link reaches only its own quote", async () => {
    const a = await sentQuote('client.a@example.com');
    const b = await sentQuote('client.b@example.com');
    const pageA = await request(app).get(`/api/public/quotes/${a.token}`).expect(200);
    expect(pageA.body.number).toBe(a.number);
    expect(JSON.stringify(pageA.body)).not.toContain(b.number);
    await request(app).post(`/api/public/quotes/${a.token}/decline`).send({ reason: 'Changed our mind' }).expect(200);
    const [row] = await sequelize.query<{ state: string }>('SELECT state FROM quotes WHERE id = :id', { replacements: { id: b.id }, type: QueryTypes.SELECT });
    expect(row!.state).toBe('quoted');
    // The public page never exposes staff data: no database ids, no internal costs. Its quote lines are known by
    // their place in the quote (1, 2, …), which is all the customer's choice needs.
    const { lines, ...rest } = pageA.body as { lines: { id: number }[] };
    expect(lines.map((l) => l.id)).toEqual(lines.map((_, i) => i + 1));
    const withoutPlaces = JSON.stringify({ ...rest, lines: lines.map(({ id: _place, ...l }) => l) });
    expect(withoutPlaces).not.toMatch(/materialsCost|labourCost|passwordHash|"id":/);
  });

  it('staff routes refuse a customer who has only a link', async () => {
    const a = await sentQuote('client.c@example.com');
    const res = await request(app).get(`/api/quotes/${a.id}`);
    expect(res.status).toBe(401);
  });

  it('a wrong password for a real account and an unknown account look the same', async () => {
    const s1 = await request.agent(app);
    const t1 = (await s1.get('/api/auth/csrf')).body.csrfToken;
    const real = await s1.post('/api/auth/login').set('x-csrf-token', t1).send({ email: 'owner@example.com', password: `${DEMO_PASSWORD}x` });
    const s2 = await request.agent(app);
    const t2 = (await s2.get('/api/auth/csrf')).body.csrfToken;
    const unknown = await s2.post('/api/auth/login').set('x-csrf-token', t2).send({ email: 'nobody@example.com', password: 'whatever-at-all' });
    expect(real.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(JSON.parse(real.text).detail).toBe(JSON.parse(unknown.text).detail);
  });
});
