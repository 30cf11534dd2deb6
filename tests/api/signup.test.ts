/**
 * Public sign-up: a workshop and its owner in one transaction, with the defaults as the workshop's own rows and no
 * prices, kept apart from the demo workshop; the owner's address confirmed by an e-mailed link that works once,
 * within its time; an unconfirmed address cannot sign in; one account per address, even under parallel requests;
 * and the owner's first-run checklist, computed from the data.
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_SPECIES, DEFAULT_SYSTEMS } from '../../shared/calc';
import { DEMO_MATERIALS } from '../../shared/calc/presets/demo-materials';
import type { SignupInput } from '../../shared/schemas/signup';
import { today } from '../../shared/time';
import { lookupWorkshop, runAsWorkshop } from '../../server/db/workshop-context';
import { anonymous, closeTestApp, demoEmail, getTestApp, signIn, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });
let services: Awaited<ReturnType<typeof startServices>>;

beforeAll(async () => {
  services = await startServices();
  await owner.connect();
});
afterAll(async () => {
  // Sign-ups counted against this address would otherwise slow other files' own sign-ups.
  await sequelize.query(`DELETE FROM login_attempts WHERE key LIKE 'signup:%'`);
  await owner.end();
  await services?.stop();
  await closeTestApp();
});

const PASSWORD = 'a long sign-up password';
const tag = () => randomBytes(4).toString('hex');

function form(overrides: Partial<SignupInput> = {}): SignupInput {
  const t = tag();
  return {
    workshopName: `Hollowmere Polishing ${t}`,
    country: 'FR',
    currency: 'EUR',
    taxLabel: 'TVA',
    taxPct: 20,
    pricesIncludeTax: false,
    units: 'metric',
    ownerName: 'Odile Marchetant',
    email: `odile-${t}@hollowmere.example`,
    password: PASSWORD,
    ...overrides,
  };
}

const post = (path: string, body: unknown) => request(app).post(path).send(body as object);

/** The confirmation link's token from a raw message: quoted-printable soft breaks removed, `=3D` read back as `=`. */
function tokenFrom(raw: string): string {
  const text = raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
  const m = /\/confirm\/([A-Za-z0-9_-]{20,})/.exec(text);
  if (!m) throw new Error('no confirmation link in the message');
  return m[1]!;
}

/** Waits for the next message to `to` and answers its token. */
async function linkSentTo(to: string, after: number): Promise<string> {
  await expect.poll(() => services.mail!.messages.slice(after).some((m) => m.to.includes(to))).toBe(true);
  return tokenFrom(services.mail!.messages.slice(after).filter((m) => m.to.includes(to)).at(-1)!.raw);
}

/** Signs up and confirms; answers the workshop id and the owner's session. */
async function signedUpOwner(overrides: Partial<SignupInput> = {}): Promise<{ workshopId: number; input: SignupInput; session: Session }> {
  const input = form(overrides);
  const before = services.mail!.messages.length;
  await post('/api/signup', input).expect(201);
  const token = await linkSentTo(input.email, before);
  await post('/api/signup/confirm', { token }).expect(200);
  const workshopId = (await lookupWorkshop(sequelize, 'email', input.email))!;
  return { workshopId, input, session: await signIn(app, input.email, PASSWORD) };
}

describe('sign-up', () => {
  it('creates the workshop with its own defaults and no prices, the owner unconfirmed, and mails a link that works once', async () => {
    const input = form({ units: 'imperial', country: 'US', currency: 'USD', taxLabel: 'Sales tax', taxPct: 7.25, pricesIncludeTax: false });
    const before = services.mail!.messages.length;
    const res = await post('/api/signup', { ...input, email: `  ${input.email.toUpperCase()} ` });
    expect(res.status, res.text).toBe(201);
    expect(res.body.email).toBe(input.email);
    const token = await linkSentTo(input.email, before);

    const workshopId = await lookupWorkshop(sequelize, 'email', input.email);
    expect(workshopId).not.toBeNull();
    await runAsWorkshop(workshopId, async () => {
      const count = async (sql: string) => Number(((await sequelize.query(sql, { type: 'SELECT' as never })) as unknown as { n: string }[])[0]!.n);
      expect(await count('SELECT count(*) AS n FROM species')).toBe(DEFAULT_SPECIES.length);
      expect(await count('SELECT count(*) AS n FROM finishing_systems')).toBe(DEFAULT_SYSTEMS.length);
      expect(await count('SELECT count(*) AS n FROM materials')).toBe(DEMO_MATERIALS.length);
      expect(await count('SELECT count(*) AS n FROM material_packs')).toBe(DEMO_MATERIALS.reduce((n, m) => n + m.packs.length, 0));
      // Packs without prices: the only price rows are the zero "no price yet" ones, never the demo's.
      expect(await count('SELECT count(*) AS n FROM pack_prices WHERE price <> 0')).toBe(0);
      expect(await count(`SELECT count(*) AS n FROM material_packs WHERE supplier <> ''`)).toBe(0);
      expect(await count('SELECT count(*) AS n FROM labour_rates WHERE per_hour <> 0')).toBe(0);
      expect(await count('SELECT count(*) AS n FROM labour_rates')).toBeGreaterThan(0);
      expect(await count('SELECT count(*) AS n FROM customers')).toBe(0);
      expect(await count('SELECT count(*) AS n FROM users WHERE email_confirmed_at IS NULL')).toBe(1);
      // The message is in the new workshop's outbox, without a working link once sent.
      await expect.poll(async () => count(`SELECT count(*) AS n FROM outbox WHERE status = 'sent'`)).toBe(1);
      const [stored] = (await sequelize.query('SELECT to_address, subject, text_body, html_body FROM outbox', { type: 'SELECT' as never })) as unknown as { to_address: string; subject: string; text_body: string; html_body: string }[];
      expect(stored!.to_address).toBe(input.email);
      expect(stored!.subject).toMatch(/confirm/i);
      expect(stored!.text_body + stored!.html_body).not.toContain(token);
    });

    // Not confirmed yet: the right password is refused with a message that says what to do.
    const tryLogin = async (password: string) => {
      const s = await anonymous(app);
      return s.agent.post('/api/auth/login').set('x-csrf-token', s.csrf).send({ email: input.email, password });
    };
    const early = await tryLogin(PASSWORD);
    expect(early.status).toBe(403);
    expect(early.body).toMatchObject({ code: 'email_unconfirmed' });
    expect(early.body.detail).toMatch(/confirm/i);
    // A wrong password says nothing about confirmation.
    const wrong = await tryLogin('not the password at all');
    expect(wrong.status).toBe(401);

    const confirmed = await post('/api/signup/confirm', { token });
    expect(confirmed.status, confirmed.text).toBe(200);
    expect(confirmed.body).toEqual({ email: input.email });
    // Once only.
    const again = await post('/api/signup/confirm', { token });
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ code: 'confirmation_link_used', field: 'token' });

    const session = await signIn(app, input.email, PASSWORD);
    const me = await session.agent.get('/api/auth/me').expect(200);
    expect(me.body.user).toMatchObject({ role: 'owner', name: input.ownerName });
    const settings = await session.agent.get('/api/settings').expect(200);
    expect(settings.body).toMatchObject({ name: input.workshopName, email: input.email });
    expect(settings.body.settings).toMatchObject({
      units: 'imperial',
      defaultLengthUnit: 'in',
      country: 'US',
      paperSize: 'Letter',
      pricesIncludeTax: false,
      pricing: { currency: 'USD', taxLabel: 'Sales tax', taxPct: 7.25 },
    });
  });

  it('keeps the new workshop and the demo workshop apart both ways', async () => {
    const { session } = await signedUpOwner();
    const customers = await session.agent.get('/api/customers').expect(200);
    expect(customers.body.rows).toEqual([]);
    const estimates = await session.agent.get('/api/estimates').expect(200);
    expect(estimates.body.rows).toEqual([]);
    const users = await session.agent.get('/api/users').expect(200);
    expect(users.body.rows).toHaveLength(1);

    const name = `Perrimont Harrow ${tag()}`;
    await session.agent.post('/api/customers').set('x-csrf-token', session.csrf).send({ name }).expect(201);
    const demo = await signInAs(app, 'owner');
    const demoSees = await demo.agent.get('/api/customers').query({ q: name }).expect(200);
    expect(demoSees.body.rows).toEqual([]);
    const demoCustomer = (await demo.agent.get('/api/customers').expect(200)).body.rows[0];
    expect(demoCustomer).toBeTruthy();
    const newSees = await session.agent.get('/api/customers').query({ q: demoCustomer.name }).expect(200);
    expect(newSees.body.rows).toEqual([]);
    await session.agent.get(`/api/customers/${demoCustomer.id}`).expect(404);
  });

  it('counts a user the owner adds as confirmed', async () => {
    const { session } = await signedUpOwner();
    const email = `bench-${tag()}@hollowmere.example`;
    await session.agent.post('/api/users').set('x-csrf-token', session.csrf).send({ email, name: 'Bram Tillery', role: 'estimator', password: PASSWORD }).expect(201);
    await signIn(app, email, PASSWORD);
  });

  it('refuses a made-up, a malformed and an expired link; a new link can be asked for and works', async () => {
    const input = form();
    const before = services.mail!.messages.length;
    await post('/api/signup', input).expect(201);
    await linkSentTo(input.email, before);

    const forged = await post('/api/signup/confirm', { token: randomBytes(32).toString('base64url') });
    expect(forged.status).toBe(404);
    expect(forged.body).toMatchObject({ code: 'confirmation_link_unknown', field: 'token' });
    const malformed = await post('/api/signup/confirm', { token: 'short' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.field).toBe('token');

    const workshopId = await lookupWorkshop(sequelize, 'email', input.email);
    await runAsWorkshop(workshopId, () => sequelize.query(`UPDATE email_confirmations SET expires_at = now() - interval '1 minute'`));
    const token = tokenFrom(services.mail!.messages.filter((m) => m.to.includes(input.email)).at(-1)!.raw);
    const expired = await post('/api/signup/confirm', { token });
    expect(expired.status).toBe(410);
    expect(expired.body).toMatchObject({ code: 'confirmation_link_expired' });
    await expect(signIn(app, input.email, PASSWORD)).rejects.toThrow(/403/);

    // Resend answers the same for an address with no account, a confirmed one and this one; only this one gets mail.
    const mark = services.mail!.messages.length;
    const unknown = await post('/api/signup/resend', { email: `nobody-${tag()}@hollowmere.example` });
    const confirmedOne = await post('/api/signup/resend', { email: demoEmail('owner') });
    const waiting = await post('/api/signup/resend', { email: input.email });
    expect(waiting.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(confirmedOne.status).toBe(202);
    const fresh = await linkSentTo(input.email, mark);
    expect(fresh).not.toBe(token);
    expect(services.mail!.messages.slice(mark).filter((m) => !m.to.includes(input.email))).toEqual([]);
    await post('/api/signup/confirm', { token: fresh }).expect(200);
    await signIn(app, input.email, PASSWORD);
  });

  it('names the field in every refusal of the form', async () => {
    const cases: [Partial<Record<keyof SignupInput, unknown>>, string][] = [
      [{ email: 'not an address' }, 'email'],
      [{ password: 'short' }, 'password'],
      [{ password: 'é'.repeat(40) }, 'password'],
      [{ workshopName: '   ' }, 'workshopName'],
      [{ ownerName: '' }, 'ownerName'],
      [{ country: 'XX' }, 'country'],
      [{ currency: 'ZZZ' }, 'currency'],
      [{ taxPct: 150 }, 'taxPct'],
      [{ taxPct: '20' }, 'taxPct'],
      [{ taxLabel: '' }, 'taxLabel'],
      [{ units: 'cubits' }, 'units'],
      [{ pricesIncludeTax: 'yes' }, 'pricesIncludeTax'],
      [{ timeZone: 'Mars/Olympus' }, 'timeZone'],
    ];
    for (const [change, field] of cases) {
      const res = await post('/api/signup', { ...form(), ...change });
      expect(res.status, `${field}: ${res.text}`).toBe(400);
      expect(res.body.field).toBe(field);
      expect(res.body.detail).toBeTruthy();
    }
    const empty = await post('/api/signup', {});
    expect(empty.status).toBe(400);
    expect(empty.body.errors.map((e: { field: string }) => e.field)).toEqual(expect.arrayContaining(['workshopName', 'country', 'currency', 'email', 'password', 'ownerName']));
  });

  it('refuses an address that already has an account anywhere, naming the field and nothing of the other workshop', async () => {
    const res = await post('/api/signup', form({ email: demoEmail('estimator').toUpperCase() }));
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ code: 'email_taken', field: 'email' });
    const { rows } = await owner.query<{ name: string }>('SELECT name FROM workshops ORDER BY id LIMIT 1');
    expect(res.text).not.toContain(rows[0]!.name);
  });

  it('makes exactly one account and one workshop from parallel sign-ups with the same address', async () => {
    const email = `rush-${tag()}@hollowmere.example`;
    const name = `Rushbrook Finishers ${tag()}`;
    const answers = await Promise.all(Array.from({ length: 8 }, () => post('/api/signup', form({ email, workshopName: name }))));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s !== 201).every((s) => s === 409)).toBe(true);
    const users = await owner.query('SELECT id FROM users WHERE lower(email) = $1', [email]);
    expect(users.rowCount).toBe(1);
    const workshops = await owner.query('SELECT id FROM workshops WHERE name = $1', [name]);
    expect(workshops.rowCount).toBe(1);
    // The losers left no half-made workshop: no species or materials without a workshop row behind them.
    const orphans = await owner.query('SELECT count(*)::int AS n FROM species s WHERE NOT EXISTS (SELECT 1 FROM workshops w WHERE w.id = s.workshop_id)');
    expect(orphans.rows[0].n).toBe(0);
  });
});

describe('first-run checklist', () => {
  it('is computed from the data: prices, labour rates, the drying room and polishers', async () => {
    const { session } = await signedUpOwner();
    const write = (method: 'post' | 'put' | 'patch', url: string, body: object) => session.agent[method](url).set('x-csrf-token', session.csrf).send(body);
    const read = async () => (await session.agent.get('/api/workshop/checklist').expect(200)).body as { items: { key: string; done: boolean; link: string; detail: string }[]; allDone: boolean; dismissed: boolean };
    const done = async () => Object.fromEntries((await read()).items.map((i) => [i.key, i.done]));

    const first = await read();
    expect(first.items.map((i) => i.key)).toEqual(['prices', 'labourRates', 'dryingRoom', 'polishers']);
    expect(first.items.every((i) => !i.done && i.link.startsWith('/'))).toBe(true);
    expect(first.allDone).toBe(false);
    expect(first.dismissed).toBe(false);

    // Labour rates: done only when every rate is above zero.
    const rates = (await session.agent.get('/api/labour-rates').expect(200)).body as { id: number }[];
    await write('patch', `/api/labour-rates/${rates[0]!.id}`, { perHour: '38.50' }).expect(200);
    expect((await done()).labourRates).toBe(rates.length === 1);
    for (const r of rates.slice(1)) await write('patch', `/api/labour-rates/${r.id}`, { perHour: '21.00' }).expect(200);
    expect((await done()).labourRates).toBe(true);

    // Polishers: one active polisher.
    await write('post', '/api/polishers', { name: 'Wendel Apsley', hoursPerDay: 6 }).expect(201);
    expect((await done()).polishers).toBe(true);

    // The drying room: saving the settings page.
    const settings = (await session.agent.get('/api/settings').expect(200)).body;
    await write('put', '/api/settings', { name: settings.name, email: settings.email, phone: settings.phone, address: settings.address, settings: { ...settings.settings, dryingRoom: { ...settings.settings.dryingRoom, bays: 2 } } }).expect(200);
    expect((await done()).dryingRoom).toBe(true);

    // Prices: every pack the systems use; one left at zero keeps it open.
    const materials = (await session.agent.get('/api/price-list/materials').query({ pageSize: 100 }).expect(200)).body.rows as { key: string; packs: { id: number }[] }[];
    // The shellac flakes are always used (every cut is mixed from them): their first pack is priced last.
    const flakes = materials.find((m) => m.key === 'shellac-flakes')!;
    const packs = [flakes.packs[0]!.id, ...materials.flatMap((m) => m.packs.map((p) => p.id)).filter((id) => id !== flakes.packs[0]!.id)];
    for (const id of packs.slice(1)) await write('post', `/api/price-list/packs/${id}/prices`, { price: '4.20', effectiveFrom: today() }).expect(201);
    const almost = await read();
    expect(almost.items.find((i) => i.key === 'prices')!.done).toBe(false);
    expect(almost.items.find((i) => i.key === 'prices')!.detail).toMatch(/^1 of/);
    await write('post', `/api/price-list/packs/${packs[0]!}/prices`, { price: '9.99', effectiveFrom: today() }).expect(201);
    const all = await read();
    expect(all.items.every((i) => i.done)).toBe(true);
    expect(all.allDone).toBe(true);

    // The owner can put it away and bring it back; only the owner's permission reaches it.
    expect((await write('put', '/api/workshop/checklist/dismissed', { dismissed: true }).expect(200)).body.dismissed).toBe(true);
    expect((await write('put', '/api/workshop/checklist/dismissed', { dismissed: false }).expect(200)).body.dismissed).toBe(false);
    expect((await write('put', '/api/workshop/checklist/dismissed', { dismissed: 'yes' })).body.field).toBe('dismissed');
    const estimator = await signInAs(app, 'estimator');
    await estimator.agent.get('/api/workshop/checklist').expect(403);
  });
});
