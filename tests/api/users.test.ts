import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry, User } from '../../server/models';
import { closeTestApp, getTestApp, signIn, signInAs, type Session } from '../helpers/app';

const { app } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
});

const unique = () => `user-${Date.now()}-${Math.random().toString(36).slice(2, 8)}@example.com`;

async function addUser(role = 'sales', email = unique()) {
  const res = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email, name: 'Test Person', role, password: 'first-password-1' });
  expect(res.status).toBe(201);
  return res.body as { id: number; email: string };
}

describe('users (owner)', () => {
  it('adds a user who can then sign in, and audits it', async () => {
    const created = await addUser('estimator');
    const s = await signIn(app, created.email, 'first-password-1');
    const me = await s.agent.get('/api/auth/me').expect(200);
    expect(me.body.user.role).toBe('estimator');
    const entry = await AuditEntry.findOne({ where: { action: 'user.create', entityId: String(created.id) } });
    expect(entry?.after).toMatchObject({ role: 'estimator' });
  });

  it('refuses a duplicate e-mail with 409 and a bad one with 400 naming the field', async () => {
    const created = await addUser();
    const dup = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email: created.email.toUpperCase(), name: 'Again', role: 'sales', password: 'first-password-1' });
    expect(dup.status).toBe(409);
    const bad = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email: 'not-an-email', name: 'X', role: 'sales', password: 'first-password-1' });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text)).toMatchObject({ field: 'email' });
    const role = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email: unique(), name: 'X', role: 'wizard', password: 'first-password-1' });
    expect(JSON.parse(role.text)).toMatchObject({ status: 400, field: 'role' });
    const short = await owner.agent.post('/api/users').set('x-csrf-token', owner.csrf).send({ email: unique(), name: 'X', role: 'sales', password: 'short' });
    expect(JSON.parse(short.text)).toMatchObject({ status: 400, field: 'password' });
  });

  it('pages, sorts and searches on the server', async () => {
    const res = await owner.agent.get('/api/users?sort=email&dir=desc&pageSize=2&page=1').expect(200);
    expect(res.body.rows).toHaveLength(2);
    expect(res.body.total).toBeGreaterThanOrEqual(4);
    const emails = res.body.rows.map((r: { email: string }) => r.email);
    expect([...emails].sort().reverse()).toEqual(emails);
    const found = await owner.agent.get('/api/users?q=ESTIMATOR@').expect(200);
    expect(found.body.rows.map((r: { email: string }) => r.email)).toContain('estimator@example.com');
    const none = await owner.agent.get('/api/users?q=%25').expect(200);
    expect(none.body.rows).toHaveLength(0);
    const bad = await owner.agent.get('/api/users?sort=password');
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text).field).toBe('sort');
  });

  it('deactivating a user ends their sessions and stops new sign-ins', async () => {
    const created = await addUser('sales');
    const s = await signIn(app, created.email, 'first-password-1');
    await s.agent.get('/api/auth/me').expect(200);
    await owner.agent.patch(`/api/users/${created.id}`).set('x-csrf-token', owner.csrf).send({ active: false }).expect(200);
    await s.agent.get('/api/auth/me').expect(401);
    await expect(signIn(app, created.email, 'first-password-1')).rejects.toThrow(/401/);
    await owner.agent.patch(`/api/users/${created.id}`).set('x-csrf-token', owner.csrf).send({ active: true }).expect(200);
    await signIn(app, created.email, 'first-password-1');
  });

  it('changing a role takes effect at once', async () => {
    const created = await addUser('sales');
    const s = await signIn(app, created.email, 'first-password-1');
    await s.agent.get('/api/users').expect(403);
    await owner.agent.patch(`/api/users/${created.id}`).set('x-csrf-token', owner.csrf).send({ role: 'owner' }).expect(200);
    // The old session ended with the role change; a new one has the new role.
    await s.agent.get('/api/auth/me').expect(401);
    const again = await signIn(app, created.email, 'first-password-1');
    await again.agent.get('/api/users').expect(200);
  });

  it('resets a password: the old one stops working and open sessions end', async () => {
    const created = await addUser('workshop');
    const s = await signIn(app, created.email, 'first-password-1');
    await owner.agent.post(`/api/users/${created.id}/password`).set('x-csrf-token', owner.csrf).send({ password: 'second-password-2' }).expect(204);
    await s.agent.get('/api/auth/me').expect(401);
    await expect(signIn(app, created.email, 'first-password-1')).rejects.toThrow(/401/);
    await signIn(app, created.email, 'second-password-2');
  });

  it('keeps at least one active owner', async () => {
    const owners = await User.findAll({ where: { role: 'owner', active: true } });
    // Deactivate every other owner first so the demo owner is the last one.
    const others = owners.filter((u) => u.email !== 'owner@example.com');
    for (const o of others) await owner.agent.patch(`/api/users/${o.id}`).set('x-csrf-token', owner.csrf).send({ active: false }).expect(200);
    const me = owners.find((u) => u.email === 'owner@example.com')!;
    const res = await owner.agent.patch(`/api/users/${me.id}`).set('x-csrf-token', owner.csrf).send({ role: 'sales' });
    expect(res.status).toBe(409);
    expect(JSON.parse(res.text).code).toBe('last_owner');
    await owner.agent.get('/api/users').expect(200);
  });

  it('refuses unknown fields and a bad id', async () => {
    const created = await addUser();
    const extra = await owner.agent.patch(`/api/users/${created.id}`).set('x-csrf-token', owner.csrf).send({ passwordHash: 'x' });
    expect(extra.status).toBe(400);
    const badId = await owner.agent.patch('/api/users/abc').set('x-csrf-token', owner.csrf).send({});
    expect(JSON.parse(badId.text)).toMatchObject({ status: 400, field: 'id' });
    const missing = await owner.agent.patch('/api/users/999999').set('x-csrf-token', owner.csrf).send({ name: 'Nobody' });
    expect(missing.status).toBe(404);
  });
});
