/**
 * Each workshop keeps its own time zone within one process: the clock, the owed list's days and ages, and the money
 * report's months follow the zone of the workshop the request runs under. Two workshops, one in Auckland and one in
 * Los Angeles, each invoice at the same instant near midnight UTC on 31 October 2026: Auckland's invoice is dated
 * 1 November (UTC+13 in its summer), Los Angeles's 31 October (UTC−7 until 1 November), and the two are asked at once.
 */
import fc from 'fast-check';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { daysBetween, today } from '../../shared/time';
import { placeholderPriceDay } from '../../server/seeders/defaults';
import { noteWorkshopTimeZone, runAsWorkshop } from '../../server/db/workshop-context';
import { closeTestApp, getTestApp, signIn, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD } from '../helpers/workshops';

const { app, sequelize } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });
let services: Awaited<ReturnType<typeof startServices>>;
const INSTANT = '2026-10-31T23:30:00Z';
const shops: { id: number; zone: string; day: string; month: string; owner: Session; invoice: string }[] = [
  { id: 0, zone: 'Pacific/Auckland', day: '2026-11-01', month: '2026-11', owner: undefined as never, invoice: 'INV-TZ-A' },
  { id: 0, zone: 'America/Los_Angeles', day: '2026-10-31', month: '2026-10', owner: undefined as never, invoice: 'INV-TZ-B' },
];

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const input = { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish' };

/** An accepted quote of the workshop, by the real path; its id and customer. */
async function agreement(s: Session, tag: string): Promise<{ quoteId: number; customerId: number }> {
  const c = await post(s, '/api/customers', { name: `Zone customer ${tag}`, email: `zone.${tag}@example.com` }).expect(201);
  const p = await post(s, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Walnut upright ${tag}` }).expect(201);
  const e = await post(s, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  await post(s, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(s, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(s, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  await request(app).post(`/api/public/quotes/${String(sent.body.link).split('/q/')[1]}/accept`).send({ name: `Zone customer ${tag}`, acceptTerms: true }).expect(200);
  return { quoteId: q.body.id as number, customerId: c.body.id as number };
}

beforeAll(async () => {
  await owner.connect();
  services = await startServices();
  for (const [i, shop] of shops.entries()) {
    const w = await createOtherWorkshop(sequelize, i === 0 ? 'Kowhai Street Polishers' : 'Sycamore Court Finishing');
    shop.id = w.id;
    await owner.query(`UPDATE workshops SET settings = jsonb_set(settings, '{timeZone}', to_jsonb($2::text)) WHERE id = $1`, [w.id, shop.zone]);
    shop.owner = await signIn(app, w.emails.owner, OTHER_PASSWORD);
    const { quoteId, customerId } = await agreement(shop.owner, `${process.pid}-${i}`);
    // An invoice issued at the chosen instant (the owner's connection writes it as issued; documents are never edited).
    // A new workshop has no prices yet: the agreement is given its total, as the money report's tests do.
    await owner.query('UPDATE quotes SET total = 1200, accepted_total = 1200, accepted_deposit = 300 WHERE id = $1', [quoteId]);
    const inserted = await owner.query(
      `INSERT INTO account_documents (workshop_id, kind, seq, number, quote_id, customer_id, currency, total, net, tax, tax_pct, tax_label, balance_due, content, issued_at)
       SELECT $1, 'invoice', 9001, $2, $3, $4, q.currency, q.accepted_total, q.accepted_total, 0, 0, 'Tax', q.accepted_total, '{}'::jsonb, $5 FROM quotes q WHERE q.id = $3`,
      [w.id, shop.invoice, quoteId, customerId, INSTANT],
    );
    expect(inserted.rowCount).toBe(1);
  }
});
afterAll(async () => {
  await owner.end();
  await services?.stop();
  await closeTestApp();
});

describe('time zones per workshop', () => {
  it("gives each unit of work its own workshop's day for the same instant", async () => {
    const at = new Date(INSTANT);
    const days = await Promise.all(
      shops.map((s) =>
        runAsWorkshop(s.id, async () => {
          noteWorkshopTimeZone(s.zone);
          await Promise.resolve();
          return today(undefined, at);
        }),
      ),
    );
    expect(days).toEqual(shops.map((s) => s.day));
  });

  it("dates and ages the owed list in each workshop's own zone, asked at the same time", async () => {
    const pages = await Promise.all(shops.map((s) => s.owner.agent.get('/api/accounts/owed?pageSize=100').expect(200)));
    shops.forEach((s, i) => {
      const rows = pages[i]!.body.rows as { invoiceNumber: string; invoicedOn: string; ageDays: number }[];
      expect(rows.map((r) => r.invoiceNumber)).toEqual([s.invoice]);
      expect(rows[0]!.invoicedOn).toBe(s.day);
      expect(rows[0]!.ageDays).toBe(daysBetween(s.day, today(s.zone)));
    });
  });

  it("counts the invoice in each workshop's own month in the money report, asked at the same time", async () => {
    const reports = await Promise.all(shops.map((s) => s.owner.agent.get('/api/reports/money?from=2026-10-01&to=2026-11-30').expect(200)));
    shops.forEach((s, i) => {
      const months = reports[i]!.body.months as { month: string; invoiced: string }[];
      const invoiced = Object.fromEntries(months.map((m) => [m.month, m.invoiced]));
      expect(Number(invoiced[s.month])).toBeGreaterThan(0);
      expect(invoiced[s.month === '2026-11' ? '2026-10' : '2026-11']).toBe('0.00');
      expect(reports[i]!.body.owed.rows[0].invoicedOn).toBe(s.day);
    });
  });

  it('counts the placeholder prices of a new workshop from a day that is past or today on every clock (property)', () => {
    // The zones furthest behind and ahead of UTC (UTC−12 and UTC+14), and the default one.
    const zones = ['Etc/GMT+12', 'Pacific/Pago_Pago', 'America/Los_Angeles', 'Europe/London', 'Pacific/Auckland', 'Pacific/Kiritimati'];
    fc.assert(
      fc.property(fc.date({ min: new Date('2020-01-01T00:00:00Z'), max: new Date('2040-12-31T23:59:59Z'), noInvalidDate: true }), (now) => {
        for (const zone of zones) expect(placeholderPriceDay(now) <= today(zone, now)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it('makes the first estimate of a new workshop whose owner sets the zone furthest behind UTC', async () => {
    const w = await createOtherWorkshop(sequelize, 'Tern Quay Polishers');
    await owner.query(`UPDATE workshops SET settings = jsonb_set(settings, '{timeZone}', to_jsonb('Etc/GMT+12'::text)) WHERE id = $1`, [w.id]);
    const s = await signIn(app, w.emails.owner, OTHER_PASSWORD);
    const c = await post(s, '/api/customers', { name: 'Tern customer', email: `tern.${process.pid}@example.com` }).expect(201);
    const p = await post(s, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: 'Walnut upright' }).expect(201);
    const e = await post(s, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input });
    expect(e.status, JSON.stringify(e.body)).toBe(201);
  });
});
