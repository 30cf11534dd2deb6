/**
 * Two instances of the app in one process, each with its own caches and its own LISTEN connection, on the one test
 * database: a change made through one (or by plain SQL) reaches the other's next request. Waits are on the
 * notifications themselves (SharedCaches.settle sends a marker through PostgreSQL and waits for it to come back),
 * never on a clock.
 */
import { once } from 'node:events';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import supertest from 'supertest';
import { createApp, type BuiltApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createAppSequelize } from '../../server/db/sequelize';
import type { Invalidation, SharedCaches } from '../../server/services/shared-caches';
import { demoWorkshopFallback, signIn, signInAs, testAppDatabaseUrl, testDatabaseUrl, type Session } from '../helpers/app';
import { today as workshopToday } from '../../shared/time';

// As the app connects: the app role, bound by row-level security, in the demo workshop outside a request.
const url = testAppDatabaseUrl();
let fallback: () => Promise<number | null> = async () => null;
const sequelize = createAppSequelize(url, { fallback: () => fallback() });
fallback = demoWorkshopFallback(sequelize);
const config = loadConfig();
let a: BuiltApp;
let b: BuiltApp;

beforeAll(async () => {
  a = createApp({ config, sequelize, databaseUrl: url, serveClient: false });
  b = createApp({ config, sequelize, databaseUrl: url, serveClient: false });
  await Promise.all([a.caches.ready, b.caches.ready]);
});
afterAll(async () => {
  await a?.close();
  await b?.close();
  await sequelize.close();
});

/** Resolves when `caches` has applied an invalidation that `match` accepts. */
async function invalidated(caches: SharedCaches, match: (c: Invalidation) => boolean): Promise<void> {
  for (;;) {
    const [change] = (await once(caches.events, 'invalidated')) as [Invalidation];
    if (match(change)) return;
  }
}

const PASSWORD = 'a-long-test-password-17';

async function newUser(owner: Session, role: 'owner' | 'estimator' | 'sales'): Promise<{ id: number; email: string }> {
  const email = `cache-${role}-${Date.now()}-${Math.random().toString(36).slice(2, 7)}@example.com`;
  const res = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email, name: 'Cache Test', role, password: PASSWORD });
  expect(res.status).toBe(201);
  return { id: res.body.id as number, email };
}

async function sessionExpiry(userId: number): Promise<number> {
  const [row] = await sequelize.query<{ expire: Date }>(`SELECT max(expire) AS expire FROM session WHERE (sess->'passport'->>'user') = :id`, {
    replacements: { id: String(userId) },
    type: QueryTypes.SELECT,
  });
  return row!.expire.getTime();
}

describe('users cached per instance, dropped on every instance', () => {
  let ownerOnA: Session;
  beforeAll(async () => {
    ownerOnA = await signInAs(a.app, 'owner');
  });

  it('deactivating a user on A: B refuses their next request', async () => {
    const user = await newUser(ownerOnA, 'estimator');
    const onB = await signIn(b.app, user.email, PASSWORD);
    await onB.agent.get('/api/estimates').expect(200);
    await onB.agent.get('/api/estimates').expect(200); // now from B's memory

    const heard = invalidated(b.caches, (c) => c.kind === 'user' && c.id === user.id);
    await ownerOnA.agent.patch(`/api/users/${user.id}`).set('x-csrf-token', ownerOnA.csrf).send({ active: false }).expect(200);
    await heard;
    await onB.agent.get('/api/estimates').expect(401);
  });

  it('a change made outside the app (plain SQL) reaches both instances: a new role, then deactivated', async () => {
    const user = await newUser(ownerOnA, 'owner');
    const cookie = await signInCookie(b.app, user.email);
    for (const app of [a.app, b.app, a.app, b.app]) await get(app, cookie, '/api/users').expect(200);

    // A role that may not list users, written straight to the table: the session itself is untouched.
    await sequelize.query("UPDATE users SET role = 'sales' WHERE id = :id", { replacements: { id: user.id } });
    await Promise.all([a.caches.settle(), b.caches.settle()]);
    for (const app of [a.app, b.app]) await get(app, cookie, '/api/users').expect(403);

    await sequelize.query('UPDATE users SET active = false WHERE id = :id', { replacements: { id: user.id } });
    await Promise.all([a.caches.settle(), b.caches.settle()]);
    for (const app of [a.app, b.app]) await get(app, cookie, '/api/estimates').expect(401);
  });

  it("writes a session's expiry at sign-in, not again on each request within minutes", async () => {
    const user = await newUser(ownerOnA, 'sales');
    const s = await signIn(a.app, user.email, PASSWORD);
    // Wind the stored expiry back an hour: a write on the next requests would move it to 12 hours from now.
    await sequelize.query(`UPDATE session SET expire = expire - interval '1 hour' WHERE (sess->'passport'->>'user') = :id`, { replacements: { id: String(user.id) } });
    const wound = await sessionExpiry(user.id);
    for (let i = 0; i < 3; i++) await s.agent.get('/api/estimates').expect(200);
    expect(await sessionExpiry(user.id)).toBe(wound);
    // Another instance has not written it yet: its first request does, once.
    const cookie = await signInCookie(a.app, user.email);
    await sequelize.query(`UPDATE session SET expire = expire - interval '1 hour' WHERE (sess->'passport'->>'user') = :id`, { replacements: { id: String(user.id) } });
    await get(b.app, cookie, '/api/estimates').expect(200);
    await get(b.app, cookie, '/api/estimates').expect(200);
    const [row] = await sequelize.query<{ ahead: number }>(
      `SELECT extract(epoch FROM max(expire) - now())::int AS ahead FROM session WHERE (sess->'passport'->>'user') = :id`,
      { replacements: { id: String(user.id) }, type: QueryTypes.SELECT },
    );
    expect(row!.ahead).toBeGreaterThan(11 * 3600);
  });
});

describe('sessions read from memory per instance, dropped on every instance', () => {
  async function sessionUser(): Promise<{ id: number; email: string; cookie: string; sid: string }> {
    const owner = await signInAs(a.app, 'owner');
    const user = await newUser(owner, 'estimator');
    const cookie = await signInCookie(a.app, user.email);
    const [row] = await sequelize.query<{ sid: string }>(`SELECT sid FROM session WHERE (sess->'passport'->>'user') = :id`, {
      replacements: { id: String(user.id) },
      type: QueryTypes.SELECT,
    });
    return { ...user, cookie, sid: row!.sid };
  }
  const whoAmI = async (app: BuiltApp['app'], cookie: string): Promise<number> => {
    const res = await get(app, cookie, '/api/auth/me');
    return res.status === 200 ? (res.body.user.id as number) : res.status;
  };
  /** Runs SQL on the session table as the owner with the triggers off (replica), so that no instance hears of it. */
  async function unannounced(sql: string, replacements: Record<string, unknown>): Promise<void> {
    const owner = createAppSequelize(testDatabaseUrl(), { poolMax: 1 });
    try {
      await owner.transaction(async (transaction) => {
        await owner.query('SET LOCAL session_replication_role = replica', { transaction });
        await owner.query(sql, { replacements, transaction });
      });
    } finally {
      await owner.close();
    }
  }

  it('an instance answers a session from memory: a change the database does not announce is not seen there', async () => {
    const u = await sessionUser();
    expect(await whoAmI(b.app, u.cookie)).toBe(u.id); // B reads it from the database and keeps it
    await unannounced('DELETE FROM session WHERE sid = :sid', { sid: u.sid });
    expect(await whoAmI(b.app, u.cookie)).toBe(u.id); // from B's memory
    expect(await whoAmI(a.app, u.cookie)).toBe(401); // A's copy was dropped when A wrote it at sign-in: it reads the database
  });

  it('signing out on A ends the session on B at once', async () => {
    const u = await sessionUser();
    for (const app of [a.app, b.app, b.app]) expect(await whoAmI(app, u.cookie)).toBe(u.id);
    const heard = invalidated(b.caches, (c) => c.kind === 'session');
    const csrf = (await get(a.app, u.cookie, '/api/auth/csrf').expect(200)).body.csrfToken as string;
    await supertest(a.app).post('/api/auth/logout').set('cookie', u.cookie).set('x-csrf-token', csrf).expect((r) => expect(r.status).toBeLessThan(300));
    await heard;
    expect(await whoAmI(b.app, u.cookie)).toBe(401);
  });

  it('a session deleted, rewritten or cut short by plain SQL reaches both instances', async () => {
    // Deleted (as "sign out everywhere" and a password reset do).
    const gone = await sessionUser();
    for (const app of [a.app, b.app, a.app, b.app]) expect(await whoAmI(app, gone.cookie)).toBe(gone.id);
    await sequelize.query('DELETE FROM session WHERE sid = :sid', { replacements: { sid: gone.sid } });
    await Promise.all([a.caches.settle(), b.caches.settle()]);
    for (const app of [a.app, b.app]) expect(await whoAmI(app, gone.cookie)).toBe(401);

    // Its data rewritten: now another user's session.
    const first = await sessionUser();
    const second = await sessionUser();
    for (const app of [a.app, b.app, a.app, b.app]) expect(await whoAmI(app, first.cookie)).toBe(first.id);
    await sequelize.query(`UPDATE session SET sess = jsonb_set(sess::jsonb, '{passport,user}', to_jsonb(:other::int))::json WHERE sid = :sid`, {
      replacements: { sid: first.sid, other: second.id },
    });
    await Promise.all([a.caches.settle(), b.caches.settle()]);
    for (const app of [a.app, b.app]) expect(await whoAmI(app, first.cookie)).toBe(second.id);

    // Its expiry brought forward to the past.
    const cut = await sessionUser();
    for (const app of [a.app, b.app, a.app, b.app]) expect(await whoAmI(app, cut.cookie)).toBe(cut.id);
    await sequelize.query("UPDATE session SET expire = now() - interval '1 second' WHERE sid = :sid", { replacements: { sid: cut.sid } });
    await Promise.all([a.caches.settle(), b.caches.settle()]);
    for (const app of [a.app, b.app]) expect(await whoAmI(app, cut.cookie)).toBe(401);
  });
});

describe('the catalog cached per instance, dropped on every instance', () => {
  it('a price change on A changes the catalog B prices with', async () => {
    const ownerOnA = await signInAs(a.app, 'owner');
    const salesOnB = await signInAs(b.app, 'sales');
    const before = await salesOnB.agent.get('/api/calc/catalog').expect(200);
    await salesOnB.agent.get('/api/calc/catalog').expect(200); // now from B's memory
    const flakes = (before.body.catalog.materials as { key: string; packs: { size: number; price: string }[] }[]).find((m) => m.key === 'shellac-flakes')!;

    const [pack] = await sequelize.query<{ id: number }>(
      "SELECT p.id FROM material_packs p JOIN materials m ON m.id = p.material_id WHERE m.key = 'shellac-flakes' AND NOT p.archived ORDER BY p.size LIMIT 1",
      { type: QueryTypes.SELECT },
    );
    const today = workshopToday();
    const heard = invalidated(b.caches, (c) => c.kind === 'catalog');
    const res = await ownerOnA.agent.post(`/api/price-list/packs/${pack!.id}/prices`).set('x-csrf-token', ownerOnA.csrf).send({ price: '987.65', effectiveFrom: today });
    expect(res.status).toBe(201);
    try {
      await heard;
      const after = await salesOnB.agent.get('/api/calc/catalog').expect(200);
      expect(after.body.catalog.version).not.toBe(before.body.catalog.version);
      const flakesAfter = (after.body.catalog.materials as typeof flakes[]).find((m) => m.key === 'shellac-flakes')!;
      expect(flakesAfter.packs.map((p) => p.price)).toContain('987.65');
      expect(flakes.packs.map((p) => p.price)).not.toContain('987.65');
      // A's own next request sees it too (dropped locally before A answered the write).
      const onA = await ownerOnA.agent.get('/api/calc/catalog').expect(200);
      expect(onA.body.catalog.version).toBe(after.body.catalog.version);
    } finally {
      await sequelize.query("DELETE FROM pack_prices WHERE pack_id = :id AND price = 987.65 AND effective_from = :today", { replacements: { id: pack!.id, today } });
      await Promise.all([a.caches.settle(), b.caches.settle()]);
    }
    const restored = await salesOnB.agent.get('/api/calc/catalog').expect(200);
    expect(restored.body.catalog.version).toBe(before.body.catalog.version);
  });
});

/** Signs in through `app` and returns the session cookie, which either instance accepts. */
async function signInCookie(app: BuiltApp['app'], email: string): Promise<string> {
  const first = await supertest(app).get('/api/auth/csrf').expect(200);
  const cookie0 = String(first.headers['set-cookie']![0]).split(';')[0]!;
  const res = await supertest(app).post('/api/auth/login').set('cookie', cookie0).set('x-csrf-token', first.body.csrfToken).send({ email, password: PASSWORD });
  expect(res.status).toBe(200);
  return String(res.headers['set-cookie']![0]).split(';')[0]!;
}

const get = (app: BuiltApp['app'], cookie: string, path: string) => supertest(app).get(path).set('cookie', cookie);
