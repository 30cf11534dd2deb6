/**
 * Mail goes out from the workshop: its name as the display name of the service's sending address (MAIL_FROM's
 * address, so the service's own sender checks pass) and Reply-To the workshop's own e-mail, for two workshops sending
 * side by side through the local mail catcher.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sendingAddress } from '../../server/services/mail';
import { closeTestApp, getTestApp, signIn, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD } from '../helpers/workshops';

const { app, sequelize, config } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });
let services: Awaited<ReturnType<typeof startServices>>;
const shops: { name: string; email: string | null; session: Session; to: string }[] = [];

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const input = { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish' };

beforeAll(async () => {
  await owner.connect();
  services = await startServices();
  const specs = [
    { name: 'Larkspur Mews Polishing', email: `office-${process.pid}@larkspur-mews.example` },
    { name: 'Hollins Yard Finishers', email: null },
  ];
  for (const [i, spec] of specs.entries()) {
    const w = await createOtherWorkshop(sequelize, spec.name);
    await owner.query('UPDATE workshops SET email = $2 WHERE id = $1', [w.id, spec.email]);
    shops.push({ ...spec, session: await signIn(app, w.emails.owner, OTHER_PASSWORD), to: `customer-${process.pid}-${i}@example.com` });
  }
});
afterAll(async () => {
  await owner.end();
  await services?.stop();
  await closeTestApp();
});

/** A header of a raw message, unfolded. */
function header(raw: string, name: string): string | undefined {
  const head = raw.split(/\r?\n\r?\n/)[0]!.replace(/\r?\n[ \t]+/g, ' ');
  return new RegExp(`^${name}: (.*)$`, 'im').exec(head)?.[1]?.trim();
}

describe('mail from the workshop', () => {
  it('reads the sending address out of MAIL_FROM', () => {
    expect(sendingAddress('Shellwright quotes <quotes@shellwright.invalid>')).toBe('quotes@shellwright.invalid');
    expect(sendingAddress('quotes@shellwright.invalid')).toBe('quotes@shellwright.invalid');
  });

  it("sends each workshop's quote with its name on the service's address, and Reply-To its own e-mail when it has one", async () => {
    const sent = await Promise.all(
      shops.map(async (s, i) => {
        const c = await post(s.session, '/api/customers', { name: `Mail customer ${i}`, email: s.to }).expect(201);
        const p = await post(s.session, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Walnut upright ${i}` }).expect(201);
        const e = await post(s.session, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
        await post(s.session, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
        const q = await post(s.session, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
        await post(s.session, `/api/quotes/${q.body.id}/send`, {}).expect(200);
      }),
    );
    expect(sent).toHaveLength(2);
    const address = sendingAddress(config.mail.from);
    for (const s of shops) {
      const mail = services.mail!.messages.find((m) => m.to.includes(s.to));
      expect(mail, s.name).toBeDefined();
      expect(mail!.from).toBe(address);
      expect(header(mail!.raw, 'From')).toBe(`${s.name} <${address}>`);
      if (s.email) expect(header(mail!.raw, 'Reply-To')).toBe(s.email);
      else expect(header(mail!.raw, 'Reply-To')).toBeUndefined();
    }
  });
});
