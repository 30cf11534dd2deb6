/**
 * "Forgot your password?": a link by e-mail through the outbox and the local mail catcher, that works once, within
 * its hour, for an active account only; the request says the same whatever the address, and the stored copy of the
 * message never keeps a working link.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../server/services/users';
import { anonymous, closeTestApp, getTestApp, signIn, startServices } from '../helpers/app';

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
    const before = services.mail!.messages.length;
    const res = await ask('Reset.Me@example.com ');
    expect(res.status).toBe(202);
    await expect.poll(() => services.mail!.messages.length).toBe(before + 1);
    const message = services.mail!.messages.at(-1)!;
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
    const before = services.mail!.messages.length;
    const unknown = await ask('nobody.here@example.com');
    const known = await ask(EMAIL);
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    await expect.poll(() => services.mail!.messages.length).toBe(before + 1);
    const token = tokenFrom(services.mail!.messages.at(-1)!.raw);
    await sequelize.query(`UPDATE password_resets SET expires_at = now() - interval '1 minute' WHERE used_at IS NULL`);
    expect(JSON.parse((await complete(token, 'too late a password')).text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
    expect(JSON.parse((await complete('x'.repeat(43), 'a made up token pw')).text)).toMatchObject({ status: 400, code: 'reset_link_invalid' });
    expect(JSON.parse((await complete('../../etc', 'a made up token pw')).text)).toMatchObject({ status: 400, field: 'token' });
    expect(JSON.parse((await ask('not an address')).text)).toMatchObject({ status: 400, field: 'email' });
  });

  it('parallel requests for one address send at most three links an hour', async () => {
    await sequelize.query(`DELETE FROM password_resets`);
    const before = services.mail!.messages.length;
    const answers = await Promise.all(Array.from({ length: 6 }, () => ask(EMAIL)));
    expect(answers.every((a) => a.status === 202 || a.status === 429)).toBe(true);
    const [{ n }] = (await sequelize.query(`SELECT count(*)::int AS n FROM password_resets`, { type: 'SELECT' as never })) as unknown as [{ n: number }];
    expect(n).toBeLessThanOrEqual(3);
    await expect.poll(() => services.mail!.messages.length).toBe(before + n);
  });
});
