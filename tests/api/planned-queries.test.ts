/**
 * Reads whose plans PostgreSQL keeps per connection (server/db/planned.ts): on one connection that serves two
 * workshops in turn, a kept plan still answers each workshop its own rows only (row-level security reads the
 * connection's setting when the plan runs, not when it was made), the rows are those sequelize.query reads, and a
 * connection keeps a bounded number of statements.
 */
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAppSequelize } from '../../server/db/sequelize';
import { plannedSelect } from '../../server/db/planned';
import { runAsWorkshop } from '../../server/db/workshop-context';
import { Customer } from '../../server/models';
import { closeTestApp, demoWorkshopId, getTestApp, testAppDatabaseUrl } from '../helpers/app';
import { createOtherWorkshop } from '../helpers/workshops';

const { sequelize } = getTestApp();
// One connection only, so that every read below runs on the connection that kept the plans.
const single = createAppSequelize(testAppDatabaseUrl(), { poolMax: 1 });
let demo: number;
let other: number;

beforeAll(async () => {
  demo = (await demoWorkshopId(sequelize))!;
  other = (await createOtherWorkshop(sequelize, 'Planwright Case Menders')).id;
  await runAsWorkshop(other, async () => {
    for (const name of ['Orrin Tallow', 'Mabel Quince']) await Customer.create({ name, email: null, phone: null, address: null, notes: null });
  });
});
afterAll(async () => {
  await single.close();
  await closeTestApp();
});

const CUSTOMERS = 'SELECT id, workshop_id, name FROM customers WHERE NOT archived ORDER BY id';
const BY_ID = 'SELECT id, workshop_id FROM customers WHERE id = $1';

describe('plans kept per connection', () => {
  it('answer each workshop its own rows, in turn on one connection, long after the plan was kept', async () => {
    const own = async (workshop: number) =>
      runAsWorkshop(workshop, () => single.query<{ id: number; workshop_id: number; name: string }>(CUSTOMERS, { type: QueryTypes.SELECT }));
    const expected = new Map([
      [demo, await own(demo)],
      [other, await own(other)],
    ]);
    expect(expected.get(demo)!.length).toBeGreaterThan(0);
    expect(expected.get(other)!.map((c) => c.name)).toEqual(['Orrin Tallow', 'Mabel Quince']);
    const otherIds = expected.get(other)!.map((c) => c.id);
    // Twelve turns each: past the five runs after which PostgreSQL may keep a generic plan for a statement with
    // parameters (a statement without any is kept from the first run).
    for (let turn = 0; turn < 12; turn++) {
      for (const workshop of turn % 2 === 0 ? [demo, other] : [other, demo]) {
        const rows = await runAsWorkshop(workshop, () => plannedSelect<{ id: number; workshop_id: number; name: string }>(single, CUSTOMERS));
        expect(rows).toEqual(expected.get(workshop));
        // Another workshop's row by id: nothing, whoever kept the plan.
        const probe = workshop === demo ? otherIds[turn % otherIds.length]! : expected.get(demo)![0]!.id;
        expect(await runAsWorkshop(workshop, () => plannedSelect(single, BY_ID, { bind: [probe] }))).toEqual([]);
      }
    }
    const [{ n }] = await runAsWorkshop(demo, () => plannedSelect<{ n: number }>(single, `SELECT count(*)::int AS n FROM pg_prepared_statements WHERE statement = $1`, { bind: [CUSTOMERS] }));
    expect(n).toBe(1);
  });

  it('write replacements as sequelize.query does, and keep at most 100 statements on a connection', async () => {
    const name = "Quince's \\ 'workshop'";
    const [row] = await runAsWorkshop(demo, () => plannedSelect<{ v: string; n: number }>(single, 'SELECT :name::text AS v, :n::int AS n', { replacements: { name, n: 7 } }));
    expect(row).toEqual({ v: name, n: 7 });
    const kept = await runAsWorkshop(demo, () =>
      single.transaction(async (transaction) => {
        for (let i = 0; i < 150; i++) {
          const [r] = await plannedSelect<{ v: number }>(single, `SELECT $1::int + ${i} AS v`, { bind: [1], transaction });
          expect(r!.v).toBe(1 + i);
        }
        const [c] = await plannedSelect<{ n: number }>(single, 'SELECT count(*)::int AS n FROM pg_prepared_statements', { transaction });
        return c!.n;
      }),
    );
    expect(kept).toBeGreaterThan(0);
    expect(kept).toBeLessThanOrEqual(100);
  });
});
