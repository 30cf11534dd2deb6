/**
 * The two demo workshops `npm start` loads: each with its own people (one per role), customers, estimates, quotes and
 * jobs, each seeing only its own; the first keeps the lowest id (the test helpers' fallback); loading again adds
 * nothing; without the demo the seeder makes no workshop.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES } from '../../shared/roles';
import { allWorkshopIds, lookupWorkshop } from '../../server/db/workshop-context';
import { DEMOS, seed } from '../../server/seeders';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { closeTestApp, demoWorkshopId, getTestApp, signIn, testDatabaseUrl } from '../helpers/app';

const { app, sequelize, config } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });

beforeAll(() => owner.connect());
afterAll(async () => {
  await owner.end();
  await closeTestApp();
});

/** What a workshop holds of the demo's own rows (keyed by the demo customers' e-mails), read by the owner. */
async function demoRowsOf(workshopId: number, emails: string[]) {
  const { rows } = await owner.query<{ customers: number; estimates: number; quotes: number; jobs: number; users: number; polishers: number; prices: number }>(
    `SELECT (SELECT count(*)::int FROM customers WHERE workshop_id = $1 AND email = ANY($2)) AS customers,
            (SELECT count(*)::int FROM estimates e JOIN customers c ON c.id = e.customer_id WHERE e.workshop_id = $1 AND c.email = ANY($2)) AS estimates,
            (SELECT count(*)::int FROM quotes WHERE workshop_id = $1 AND estimate_id IN (SELECT e.id FROM estimates e JOIN customers c ON c.id = e.customer_id WHERE c.email = ANY($2))) AS quotes,
            (SELECT count(*)::int FROM jobs WHERE workshop_id = $1 AND quote_id IN (SELECT q.id FROM quotes q JOIN estimates e ON e.id = q.estimate_id JOIN customers c ON c.id = e.customer_id WHERE c.email = ANY($2))) AS jobs,
            (SELECT count(*)::int FROM users WHERE workshop_id = $1) AS users,
            (SELECT count(*)::int FROM polishers WHERE workshop_id = $1) AS polishers,
            (SELECT count(*)::int FROM pack_prices WHERE workshop_id = $1 AND source = 'demo') AS prices`,
    [workshopId, emails],
  );
  return rows[0]!;
}

const emailsOf = (d: (typeof DEMOS)[number]) => [...d.work.map((j) => j.customer.email), ...d.planning.jobs.map((j) => j.customer.email)];

describe('the demo workshops', () => {
  it('are two, each reached by its own owner, the first one with the lowest id', async () => {
    expect(DEMOS).toHaveLength(2);
    const ids = await Promise.all(DEMOS.map((d) => lookupWorkshop(sequelize, 'email', d.workshop.users[0]!.email)));
    expect(ids[0]).not.toBeNull();
    expect(ids[1]).not.toBeNull();
    expect(ids[0]).not.toBe(ids[1]);
    expect(ids[0]).toBe(await demoWorkshopId(sequelize));
    expect(Math.min(...(await allWorkshopIds(sequelize)))).toBe(ids[0]);
    // Every person of a demo workshop signs in to that workshop.
    for (const [i, d] of DEMOS.entries()) {
      expect(new Set(d.workshop.users.map((u) => u.role))).toEqual(new Set(ROLES));
      for (const u of d.workshop.users) expect(await lookupWorkshop(sequelize, 'email', u.email), u.email).toBe(ids[i]);
    }
  });

  it('each hold their own customers, estimates, quotes, jobs, polishers and prices', async () => {
    for (const d of DEMOS) {
      const id = (await lookupWorkshop(sequelize, 'email', d.workshop.users[0]!.email))!;
      const rows = await demoRowsOf(id, emailsOf(d));
      expect(rows.customers, d.workshop.name).toBe(emailsOf(d).length);
      expect(rows.estimates).toBeGreaterThanOrEqual(emailsOf(d).length);
      expect(rows.quotes).toBe(d.planning.jobs.length);
      expect(rows.jobs).toBe(d.planning.jobs.filter((j) => j.plan.kind !== 'accepted').length);
      expect(rows.users).toBeGreaterThanOrEqual(ROLES.length);
      expect(rows.polishers).toBeGreaterThanOrEqual(d.planning.polishers.length);
      expect(rows.prices).toBeGreaterThan(0);
    }
  });

  it("show each workshop's people only their own workshop, settings and customers", async () => {
    const [first, second] = DEMOS;
    const a = await signIn(app, first!.workshop.users[0]!.email, DEMO_PASSWORD);
    const b = await signIn(app, second!.workshop.users[1]!.email, DEMO_PASSWORD);
    const wa = await a.agent.get('/api/workshop').expect(200);
    const wb = await b.agent.get('/api/workshop').expect(200);
    expect(wa.body.name).toBe(first!.workshop.name);
    expect(wb.body.name).toBe(second!.workshop.name);
    expect(wa.body.settings.units).toBe('metric');
    expect(wb.body.settings.units).toBe('imperial');
    // Searched by each demo customer's name: found by the own workshop only.
    const search = async (who: typeof a, name: string) => JSON.stringify((await who.agent.get('/api/customers').query({ q: name }).expect(200)).body);
    for (const j of second!.work) {
      expect(await search(b, j.customer.name)).toContain(j.customer.name);
      expect(await search(a, j.customer.name)).not.toContain(j.customer.name);
    }
    for (const j of first!.work) {
      expect(await search(a, j.customer.name)).toContain(j.customer.name);
      expect(await search(b, j.customer.name)).not.toContain(j.customer.name);
    }
  });

  it('load once: seeding again, with or without the demo, adds no workshop and no demo row', async () => {
    const ids = await allWorkshopIds(sequelize);
    const before = await Promise.all(DEMOS.map(async (d) => demoRowsOf((await lookupWorkshop(sequelize, 'email', d.workshop.users[0]!.email))!, emailsOf(d))));
    await seed(sequelize, { demo: true, uploadsDir: config.uploadsDir });
    await seed(sequelize, { demo: false, uploadsDir: config.uploadsDir });
    // Other files may add workshops of their own meanwhile; the seeder adds none.
    expect((await allWorkshopIds(sequelize)).filter((id) => id <= Math.max(...ids))).toEqual(ids);
    const after = await Promise.all(DEMOS.map(async (d) => demoRowsOf((await lookupWorkshop(sequelize, 'email', d.workshop.users[0]!.email))!, emailsOf(d))));
    for (const [i, rows] of after.entries()) {
      const { customers, estimates, quotes, jobs, polishers, prices } = rows;
      expect({ customers, estimates, quotes, jobs, polishers, prices }).toEqual({
        customers: before[i]!.customers,
        estimates: before[i]!.estimates,
        quotes: before[i]!.quotes,
        jobs: before[i]!.jobs,
        polishers: before[i]!.polishers,
        prices: before[i]!.prices,
      });
    }
  });
});
