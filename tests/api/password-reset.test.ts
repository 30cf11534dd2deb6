/**
 * "Forgot your password?": a link by e-mail through the outbox and the local mail catcher, that works once, within
 * its hour, for an active account only; the request says the same whatever the address, and the stored copy of the
 * message never keeps a working link.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../server/services/users';
import { anonymous, closeTestApp, getTestApp, signIn, startServices, testDatabaseUrl } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD } from '../helpers/workshops';

const { app, sequelize } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
beforeAll(async () => {
  services = await startServices();
});
afterAll(async () => {
  // The reset requests counted against this address would otherwise slow the browser tests' own reset.
  await sequelize.query(`DELETE FROM login_attempts WHERE key LIKE 'reset:%'`);
  await services?.stop();
  await closeTestApp();
});

const EMAIL = 'reset.me@example.com';
const OLD = 'an old and long password';

/** The messages the mail catcher received for one address (the queue may deliver other workshops' mail meanwhile). */
const mailTo = (email: string) => services.mail!.messages.filter((m) => m.to.includes(email));

/** The reset link from a raw message: quoted-printable soft breaks removed, `=3D` read back as `=`. */
function tokenFrom(raw: string): string {
  const text = raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
  const m = /\/reset-password\/([A-Za-z0-9_-]{20,})/.exec(text);
  if (!m) throw new Error('no reset link in the message');
  return m[1]!;
}

async function ask(email: string) {
  const s = await anonymous(app);
  return s.agent.post('/api/auth/password-reset').set('x-csrf-token', s.csrf).send({ email });
}

async function complete(token: string, password: string) {
  const s = await anonymous(app);
  return s.agent.post('/api/auth/password-reset/complete').set('x-csrf-token', s.csrf).send({ token, password });
}

describe('password reset by e-mailed link', () => {
  it('e-mails a link that sets a new password once; the old password and the stored link stop working', async () => {
    await sequelize.query(`INSERT INTO users (email, name, role, password_hash, active, created_at, updated_at) VALUES (:email, 'Reset Tester', 'sales', :hash, true, now(), now())`, {
      replacements: { email: EMAIL, hash: await hashPassword(OLD) },
    });
    const before = mailTo(EMAIL).length;
    const res = await ask('Reset.Me@example.com ');
    expect(res.status).toBe(202);
    await expect.poll(() => mailTo(EMAIL).length).toBe(before + 1);
    const message = mailTo(EMAIL).at(-1)!;
    expect(message.to).toEqual([EMAIL]);
    const token = tokenFrom(message.raw);

    // The outbox keeps the message, but not a working link.
    const [stored] = (await sequelize.query(`SELECT text_body, html_body FROM outbox WHERE to_address = :email ORDER BY id DESC LIMIT 1`, { replacements: { email: EMAIL }, type: 'SELECT' as never })) as unknown as { text_body: string; html_body: string }[];
    expect(stored!.text_body).not.toContain(token);
    expect(stored!.html_body).not.toContain(token);

    // Too short a password is refused and spends nothing.
    const short = await complete(token, 'short');
    expect(JSON.parse(short.text)).toMatchObject({ status: 400, field: 'password' });
    expect((await complete(token, 'a brand new long password')).status).toBe(204);
    await signIn(app, EMAIL, 'a brand new long password');
    await expect(signIn(app, EMAIL, OLD)).rejects.toThrow(/401/);
    // Single use.
    const again = await complete(token, 'yet another long password');
    expect(JSON.parse(again.text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
  });

  it('an expired link, a made-up token and an unknown address open nothing, and the answer gives nothing away', async () => {
    const before = mailTo(EMAIL).length;
    const unknown = await ask('nobody.here@example.com');
    const known = await ask(EMAIL);
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    await expect.poll(() => mailTo(EMAIL).length).toBe(before + 1);
    expect(mailTo('nobody.here@example.com')).toEqual([]);
    const token = tokenFrom(mailTo(EMAIL).at(-1)!.raw);
    await sequelize.query(`UPDATE password_resets SET expires_at = now() - interval '1 minute' WHERE used_at IS NULL`);
    expect(JSON.parse((await complete(token, 'too late a password')).text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
    expect(JSON.parse((await complete('x'.repeat(43), 'a made up token pw')).text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
    expect(JSON.parse((await complete('../../etc', 'a made up token pw')).text)).toMatchObject({ status: 400, field: 'token' });
    expect(JSON.parse((await ask('not an address')).text)).toMatchObject({ status: 400, field: 'email' });
  });

  it('parallel requests for one address send at most three links an hour', async () => {
    await sequelize.query(`DELETE FROM password_resets`);
    const before = mailTo(EMAIL).length;
    const answers = await Promise.all(Array.from({ length: 6 }, () => ask(EMAIL)));
    expect(answers.every((a) => a.status === 202 || a.status === 429)).toBe(true);
    const [{ n }] = (await sequelize.query(`SELECT count(*)::int AS n FROM password_resets`, { type: 'SELECT' as never })) as unknown as [{ n: number }];
    expect(n).toBeLessThanOrEqual(3);
    await expect.poll(() => mailTo(EMAIL).length).toBe(before + n);
  });

  it('works for a user of a second workshop: the link is kept in, and resolved under, that workshop', async () => {
    // The requests above used up this address's allowance of reset requests (a global counter, not a workshop's).
    await sequelize.query(`DELETE FROM login_attempts WHERE key LIKE 'reset:%'`);
    const other = await createOtherWorkshop(sequelize, 'Spiritlamp Joinery');
    const email = other.emails.estimator;
    expect((await ask(email)).status).toBe(202);
    await expect.poll(() => mailTo(email).length).toBe(1);
    const token = tokenFrom(mailTo(email)[0]!.raw);

    const owner = new pg.Client({ connectionString: testDatabaseUrl() });
    await owner.connect();
    try {
      // The reset row and its message belong to workshop B; the owner's lookup names B for the link's hash.
      const { rows } = await owner.query<{ workshop_id: number; resolved: number }>(
        `SELECT r.workshop_id, shellwright_workshop_of_reset(r.token_hash) AS resolved
           FROM password_resets r JOIN users u ON u.id = r.user_id WHERE u.email = $1`,
        [email],
      );
      expect(rows).toEqual([{ workshop_id: other.id, resolved: other.id }]);
      const outbox = await owner.query<{ workshop_id: number }>('SELECT workshop_id FROM outbox WHERE to_address = $1', [email]);
      expect(outbox.rows).toEqual([{ workshop_id: other.id }]);
    } finally {
      await owner.end();
    }

    expect((await complete(token, 'workshop b new password')).status).toBe(204);
    const s = await signIn(app, email, 'workshop b new password');
    expect((await s.agent.get('/api/auth/me').expect(200)).body.user.email).toBe(email);
    await expect(signIn(app, email, OTHER_PASSWORD)).rejects.toThrow(/401/);
    expect(JSON.parse((await complete(token, 'and once more please')).text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
  });
});
