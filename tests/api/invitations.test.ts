/**
 * Invitations: the owner invites by e-mail with a role; the link (through the outbox and the local mail catcher)
 * shows the workshop and the role, and accepting it with a name and a password makes the account in that workshop and
 * signs the person in. Resend gives a new link (the old one stops working), revoke withdraws it, a week runs it out.
 * Another workshop's owner can neither see nor touch these invitations; other roles may not invite at all.
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, can } from '../../shared/roles';
import { allWorkshopIds } from '../../server/db/workshop-context';
import { closeTestApp, demoEmail, getTestApp, signIn, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD, type OtherWorkshop } from '../helpers/workshops';

const { app, sequelize } = getTestApp();
const ownerDb = new pg.Client({ connectionString: testDatabaseUrl() });
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let other: OtherWorkshop;
let ownerOfB: Session;
let demoId: number;

beforeAll(async () => {
  await ownerDb.connect();
  services = await startServices();
  demoId = (await allWorkshopIds(sequelize))[0]!;
  owner = await signInAs(app, 'owner');
  other = await createOtherWorkshop(sequelize, 'Lacquerfold Benches');
  ownerOfB = await signIn(app, other.emails.owner, OTHER_PASSWORD);
});
afterAll(async () => {
  await ownerDb.end();
  await services?.stop();
  await closeTestApp();
});

const address = () => `invitee-${randomBytes(5).toString('hex')}@example.com`;
const PASSWORD = 'a long enough password';

/** The invitation links e-mailed to an address so far (quoted-printable soft breaks removed, `=3D` read back). */
function linksTo(email: string): string[] {
  return services
    .mail!.messages.filter((m) => m.to.includes(email))
    .map((m) => {
      const text = m.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
      const found = /\/invite\/([A-Za-z0-9_-]{20,})/.exec(text);
      if (!found) throw new Error('no invitation link in the message');
      return found[1]!;
    });
}

/** Waits for the n-th link to an address and answers it. */
async function nthLink(email: string, n: number): Promise<string> {
  await expect.poll(() => linksTo(email).length).toBeGreaterThanOrEqual(n);
  return linksTo(email)[n - 1]!;
}

function invite(s: Session, body: Record<string, unknown>) {
  return s.agent.post('/api/invitations').set('x-csrf-token', s.csrf).send(body);
}

async function invited(s: Session, role = 'estimator', email = address()) {
  const res = await invite(s, { email, role });
  expect(res.status, res.text).toBe(201);
  return { ...(res.body as { id: number; email: string; state: string }), token: await nthLink(email, 1) };
}

const accept = (token: string, body: Record<string, unknown>) => request(app).post(`/api/public/invitations/${token}/accept`).send(body);

describe('inviting (owner)', () => {
  it('sends a link through the outbox, lists the invitation as waiting, and records it in the audit log', async () => {
    const email = address();
    const res = await invite(owner, { email: `  ${email.toUpperCase()} `, role: 'sales' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email, role: 'sales', state: 'pending', sendCount: 1, invitedBy: expect.any(String) });
    const days = (Date.parse(res.body.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.9);
    expect(days).toBeLessThanOrEqual(7);
    const token = await nthLink(email, 1);
    expect(res.body.delivered).toBe(true);

    // The stored copy of the message keeps no working link.
    const { rows } = await ownerDb.query<{ text_body: string; html_body: string; workshop_id: number }>(`SELECT text_body, html_body, workshop_id FROM outbox WHERE to_address = $1`, [email]);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.workshop_id).toBe(demoId);
    expect(rows[0]!.text_body + rows[0]!.html_body).not.toContain(token);
    expect(rows[0]!.text_body).toContain('Sales');

    const list = await owner.agent.get('/api/invitations').query({ q: email }).expect(200);
    expect(list.body.rows).toEqual([expect.objectContaining({ id: res.body.id, state: 'pending' })]);
    const audits = await ownerDb.query(`SELECT action FROM audit_log WHERE entity_type = 'invitation' AND entity_id = $1`, [String(res.body.id)]);
    expect(audits.rows.map((r) => r.action)).toEqual(['invitation.create']);
  });

  it('refuses an address that already has an account, here or in another workshop, without saying where', async () => {
    for (const taken of [demoEmail('sales'), other.emails.workshop]) {
      const res = await invite(owner, { email: taken, role: 'estimator' });
      expect(res.status).toBe(409);
      const problem = JSON.parse(res.text);
      expect(problem).toMatchObject({ code: 'email_has_account', field: 'email', detail: `${taken} already has an account.` });
      expect(res.text).not.toContain('Lacquerfold');
    }
  });

  it('refuses a second invitation while one is waiting here, but another workshop may invite the same address', async () => {
    const email = address();
    await invited(owner, 'sales', email);
    const again = await invite(owner, { email, role: 'estimator' });
    expect(again.status).toBe(409);
    expect(JSON.parse(again.text)).toMatchObject({ code: 'invitation_pending', field: 'email' });
    expect(JSON.parse(again.text).detail).toContain(email);
    expect((await invite(ownerOfB, { email, role: 'workshop' })).status).toBe(201);
  });

  it('parallel invitations of one address make one', async () => {
    const email = address();
    const answers = await Promise.all(Array.from({ length: 6 }, () => invite(owner, { email, role: 'sales' })));
    expect(answers.map((a) => a.status).sort()).toEqual([201, 409, 409, 409, 409, 409]);
    const { rows } = await ownerDb.query(`SELECT id FROM invitations WHERE email = $1`, [email]);
    expect(rows).toHaveLength(1);
  });

  it('answers 400 naming the field for a bad address or role, and pages and sorts the list', async () => {
    expect(JSON.parse((await invite(owner, { email: 'not an address', role: 'sales' })).text)).toMatchObject({ status: 400, field: 'email' });
    expect(JSON.parse((await invite(owner, { email: address(), role: 'wizard' })).text)).toMatchObject({ status: 400, field: 'role' });
    expect(JSON.parse((await invite(owner, { email: address() })).text)).toMatchObject({ status: 400, field: 'role' });
    expect(JSON.parse((await owner.agent.get('/api/invitations').query({ sort: 'colour' })).text)).toMatchObject({ status: 400, field: 'sort' });

    for (let i = 0; i < 3; i++) await invited(owner, 'estimator', `paging-${i}-${randomBytes(3).toString('hex')}@example.com`);
    const page1 = await owner.agent.get('/api/invitations').query({ q: 'paging-', sort: 'email', dir: 'asc', pageSize: 2 }).expect(200);
    expect(page1.body).toMatchObject({ page: 1, pageSize: 2, total: expect.any(Number) });
    expect(page1.body.rows).toHaveLength(2);
    const page2 = await owner.agent.get('/api/invitations').query({ q: 'paging-', sort: 'email', dir: 'asc', pageSize: 2, page: 2 }).expect(200);
    const emails = [...page1.body.rows, ...page2.body.rows].map((r: { email: string }) => r.email);
    expect(emails).toEqual([...emails].sort());
    expect(new Set(emails).size).toBe(emails.length);
  });
});

describe('the link', () => {
  it('shows the workshop, address, role and state, and accepting makes the user in that workshop and signs them in', async () => {
    const inv = await invited(owner, 'estimator');
    const view = await request(app).get(`/api/public/invitations/${inv.token}`).expect(200);
    const [{ name: demoName }] = (await ownerDb.query<{ name: string }>('SELECT name FROM workshops WHERE id = $1', [demoId])).rows as [{ name: string }];
    expect(view.body).toEqual({ workshopName: demoName, email: inv.email, role: 'estimator', state: 'pending', expiresAt: expect.any(String) });

    const agent = request.agent(app);
    const res = await agent.post(`/api/public/invitations/${inv.token}/accept`).send({ name: '  Ada Varnham ', password: PASSWORD });
    expect(res.status, res.text).toBe(201);
    expect(res.body.user).toMatchObject({ email: inv.email, name: 'Ada Varnham', role: 'estimator', active: true });
    expect(res.body.csrfToken).toEqual(expect.any(String));
    // Signed in, under the invitation's workshop, with the role's rights.
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user).toMatchObject({ email: inv.email, role: 'estimator' });
    expect((await agent.get('/api/invitations')).status).toBe(403);
    const { rows } = await ownerDb.query('SELECT workshop_id, role FROM users WHERE email = $1', [inv.email]);
    expect(rows).toEqual([{ workshop_id: demoId, role: 'estimator' }]);
    // The owner's list shows it accepted; the link now reads accepted and cannot be used again.
    const list = await owner.agent.get('/api/invitations').query({ q: inv.email }).expect(200);
    expect(list.body.rows[0]).toMatchObject({ state: 'accepted', acceptedAt: expect.any(String) });
    expect((await request(app).get(`/api/public/invitations/${inv.token}`).expect(200)).body.state).toBe('accepted');
    expect(JSON.parse((await accept(inv.token, { name: 'Again', password: PASSWORD })).text)).toMatchObject({ status: 409, code: 'invitation_used' });
    // And they sign in with what they chose.
    await signIn(app, inv.email, PASSWORD);
  });

  it('of workshop B makes a user of B (the link names its workshop)', async () => {
    const inv = await invited(ownerOfB, 'sales');
    const view = await request(app).get(`/api/public/invitations/${inv.token}`).expect(200);
    expect(view.body).toMatchObject({ workshopName: 'Lacquerfold Benches', role: 'sales' });
    expect((await accept(inv.token, { name: 'Bea Shellac', password: PASSWORD })).status).toBe(201);
    const { rows } = await ownerDb.query('SELECT workshop_id FROM users WHERE email = $1', [inv.email]);
    expect(rows).toEqual([{ workshop_id: other.id }]);
    // A's owner does not see B's invitation; B's does.
    expect((await owner.agent.get('/api/invitations').query({ q: inv.email }).expect(200)).body.rows).toEqual([]);
    expect((await ownerOfB.agent.get('/api/invitations').query({ q: inv.email }).expect(200)).body.rows).toHaveLength(1);
  });

  it('validates the name and password and names what is wrong, spending nothing', async () => {
    const inv = await invited(owner, 'sales');
    const short = JSON.parse((await accept(inv.token, { name: 'Cy', password: 'short' })).text);
    expect(short).toMatchObject({ status: 400, field: 'password' });
    const noName = JSON.parse((await accept(inv.token, { name: '  ', password: PASSWORD })).text);
    expect(noName).toMatchObject({ status: 400, field: 'name' });
    const tooLong = JSON.parse((await accept(inv.token, { name: 'Cy', password: 'é'.repeat(40) })).text);
    expect(tooLong).toMatchObject({ status: 400, field: 'password' });
    expect((await request(app).get(`/api/public/invitations/${inv.token}`).expect(200)).body.state).toBe('pending');
    expect((await accept(inv.token, { name: 'Cy Polisher', password: PASSWORD })).status).toBe(201);
  });

  it('unknown, malformed, expired and withdrawn links answer a clear 4xx and make no user', async () => {
    const unknown = await request(app).get(`/api/public/invitations/${'x'.repeat(43)}`);
    expect(JSON.parse(unknown.text)).toMatchObject({ status: 404, code: 'invitation_not_found' });
    expect(JSON.parse((await accept('y'.repeat(43), { name: 'Nobody', password: PASSWORD })).text)).toMatchObject({ status: 404 });
    expect(JSON.parse((await request(app).get('/api/public/invitations/..%2F..')).text)).toMatchObject({ status: 400, field: 'token' });

    const late = await invited(owner, 'sales');
    await ownerDb.query(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE id = $1`, [late.id]);
    expect((await request(app).get(`/api/public/invitations/${late.token}`).expect(200)).body.state).toBe('expired');
    expect(JSON.parse((await accept(late.token, { name: 'Too Late', password: PASSWORD })).text)).toMatchObject({ status: 410, code: 'invitation_expired' });
    expect((await owner.agent.get('/api/invitations').query({ q: late.email, state: 'expired' }).expect(200)).body.rows).toHaveLength(1);
    // An expired invitation no longer blocks a new one.
    expect((await invite(owner, { email: late.email, role: 'sales' })).status).toBe(201);

    const gone = await invited(owner, 'sales');
    const revoked = await owner.agent.post(`/api/invitations/${gone.id}/revoke`).set('x-csrf-token', owner.csrf).send({});
    expect(revoked.status).toBe(200);
    expect(revoked.body).toMatchObject({ state: 'revoked', revokedAt: expect.any(String) });
    expect(JSON.parse((await accept(gone.token, { name: 'Withdrawn', password: PASSWORD })).text)).toMatchObject({ status: 410, code: 'invitation_revoked' });
    expect(JSON.parse((await owner.agent.post(`/api/invitations/${gone.id}/revoke`).set('x-csrf-token', owner.csrf).send({})).text)).toMatchObject({ status: 409 });
    expect(JSON.parse((await owner.agent.post(`/api/invitations/${gone.id}/resend`).set('x-csrf-token', owner.csrf).send({})).text)).toMatchObject({ status: 409 });

    const { rows } = await ownerDb.query('SELECT count(*)::int AS n FROM users WHERE email = ANY($1)', [[late.email, gone.email]]);
    expect(rows[0].n).toBe(0);
    const audits = await ownerDb.query(`SELECT action FROM audit_log WHERE entity_type = 'invitation' AND entity_id = $1 ORDER BY id`, [String(gone.id)]);
    expect(audits.rows.map((r) => r.action)).toEqual(['invitation.create', 'invitation.revoke']);
  });

  it('resend sends a new link with a new week; the old link stops working', async () => {
    const inv = await invited(owner, 'workshop');
    await ownerDb.query(`UPDATE invitations SET expires_at = now() - interval '1 day' WHERE id = $1`, [inv.id]);
    const res = await owner.agent.post(`/api/invitations/${inv.id}/resend`).set('x-csrf-token', owner.csrf).send({});
    expect(res.status, res.text).toBe(200);
    expect(res.body).toMatchObject({ state: 'pending', sendCount: 2 });
    expect(Date.parse(res.body.expiresAt) - Date.now()).toBeGreaterThan(6.9 * 86_400_000);
    const fresh = await nthLink(inv.email, 2);
    expect(fresh).not.toBe(inv.token);
    expect(JSON.parse((await request(app).get(`/api/public/invitations/${inv.token}`)).text)).toMatchObject({ status: 404 });
    expect(JSON.parse((await accept(inv.token, { name: 'Old Link', password: PASSWORD })).text)).toMatchObject({ status: 404 });
    expect((await accept(fresh, { name: 'New Link', password: PASSWORD })).status).toBe(201);
    const audits = await ownerDb.query(`SELECT action FROM audit_log WHERE entity_type = 'invitation' AND entity_id = $1 ORDER BY id`, [String(inv.id)]);
    expect(audits.rows.map((r) => r.action)).toEqual(['invitation.create', 'invitation.resend', 'invitation.accept']);
    // Accepted: nothing left to resend or withdraw.
    expect((await owner.agent.post(`/api/invitations/${inv.id}/resend`).set('x-csrf-token', owner.csrf).send({})).status).toBe(409);
    expect((await owner.agent.post(`/api/invitations/${inv.id}/revoke`).set('x-csrf-token', owner.csrf).send({})).status).toBe(409);
  });

  it('parallel accepts of one link make exactly one user', async () => {
    const inv = await invited(owner, 'sales');
    const answers = await Promise.all(Array.from({ length: 8 }, (_v, i) => accept(inv.token, { name: `Racer ${i}`, password: PASSWORD })));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409, 409, 409, 409]);
    const { rows } = await ownerDb.query('SELECT count(*)::int AS n FROM users WHERE email = $1', [inv.email]);
    expect(rows[0].n).toBe(1);
    const acceptedAudit = await ownerDb.query(`SELECT count(*)::int AS n FROM audit_log WHERE action = 'invitation.accept' AND entity_id = $1`, [String(inv.id)]);
    expect(acceptedAudit.rows[0].n).toBe(1);
  });

  it('parallel accepts of two workshops’ invitations to one address make one account', async () => {
    const email = address();
    const a = await invited(owner, 'sales', email);
    const bRes = await invite(ownerOfB, { email, role: 'estimator' });
    expect(bRes.status).toBe(201);
    const bToken = await nthLink(email, 2);
    const answers = await Promise.all([accept(a.token, { name: 'Twice Asked', password: PASSWORD }), accept(bToken, { name: 'Twice Asked', password: PASSWORD })]);
    expect(answers.map((r) => r.status).sort()).toEqual([201, 409]);
    const { rows } = await ownerDb.query('SELECT count(*)::int AS n FROM users WHERE email = $1', [email]);
    expect(rows[0].n).toBe(1);
  });
});

describe('who may', () => {
  it('other roles may not list, invite, resend or revoke (403); signed out is 401', async () => {
    const inv = await invited(owner, 'sales');
    for (const role of ROLES.filter((r) => !can(r, 'manageUsers'))) {
      const s = await signInAs(app, role);
      expect((await s.agent.get('/api/invitations')).status).toBe(403);
      expect((await invite(s, { email: address(), role: 'sales' })).status).toBe(403);
      expect((await s.agent.post(`/api/invitations/${inv.id}/resend`).set('x-csrf-token', s.csrf).send({})).status).toBe(403);
      expect((await s.agent.post(`/api/invitations/${inv.id}/revoke`).set('x-csrf-token', s.csrf).send({})).status).toBe(403);
    }
    expect((await request(app).get('/api/invitations')).status).toBe(401);
  });

  it("the owner of workshop B cannot list, resend or revoke A's invitations (404), and nothing of A changes", async () => {
    const inv = await invited(owner, 'sales');
    const before = (await ownerDb.query('SELECT * FROM invitations WHERE id = $1', [inv.id])).rows[0];
    const list = await ownerOfB.agent.get('/api/invitations').query({ q: inv.email }).expect(200);
    expect(list.body.rows).toEqual([]);
    expect((await ownerOfB.agent.get('/api/invitations').expect(200)).text).not.toContain(inv.email);
    expect(JSON.parse((await ownerOfB.agent.post(`/api/invitations/${inv.id}/resend`).set('x-csrf-token', ownerOfB.csrf).send({})).text)).toMatchObject({ status: 404 });
    expect(JSON.parse((await ownerOfB.agent.post(`/api/invitations/${inv.id}/revoke`).set('x-csrf-token', ownerOfB.csrf).send({})).text)).toMatchObject({ status: 404 });
    expect((await ownerDb.query('SELECT * FROM invitations WHERE id = $1', [inv.id])).rows[0]).toEqual(before);
    expect(linksTo(inv.email)).toHaveLength(1);
  });
});
