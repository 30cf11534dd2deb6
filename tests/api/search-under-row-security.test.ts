/**
 * The search boxes under row-level security (migration 2026.12.08T50.00): the search functions read the trigram
 * indexes as the owner but answer only ids of the workshop the connection runs under, and the lists built on them
 * find exactly what an ILIKE over the workshop's own rows finds, for a selective term (ids) and a broad one (more
 * than 500 matches: the sort index is walked instead).
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runAsWorkshop } from '../../server/db/workshop-context';
import { closeTestApp, getTestApp, signIn, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD, type OtherWorkshop } from '../helpers/workshops';

const { app, sequelize } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });
/** A word only this file's rows carry (other files share the demo workshop). */
const tag = `Qz${randomBytes(4).toString('hex')}`;
let broadId: number;
let other: OtherWorkshop;
let a: Session;
let b: Session;

/** `count` estimates titled with the tag in the current workshop, on one customer and piece made for them. */
async function addTagged(count: number, ownerId: number): Promise<void> {
  const [customer] = await sequelize.query<{ id: number }>(`INSERT INTO customers (name, email, created_at, updated_at) VALUES (:name, :email, now(), now()) RETURNING id`, {
    replacements: { name: `Customer ${tag}`, email: `${tag.toLowerCase()}@example.com` },
    type: QueryTypes.SELECT,
  });
  const [piece] = await sequelize.query<{ id: number }>(`INSERT INTO pieces (customer_id, kind, description, created_at, updated_at) VALUES (:c, 'table', :d, now(), now()) RETURNING id`, {
    replacements: { c: customer!.id, d: `Side table ${tag}` },
    type: QueryTypes.SELECT,
  });
  await sequelize.query(
    `INSERT INTO estimates (number, customer_id, piece_id, owner_id, title, state, valid_until, total, labour_hours, currency, created_at, updated_at)
     SELECT 'T' || :tag || '-' || g, :c, :p, :owner, 'Refinish ' || :tag || ' no. ' || g, 'draft', DATE '2027-06-30', g, 1, 'GBP',
            now() - (g || ' seconds')::interval, now() - (g || ' seconds')::interval
       FROM generate_series(1, :count) g`,
    { replacements: { tag, c: customer!.id, p: piece!.id, owner: ownerId, count } },
  );
}

/** What a plain ILIKE over one workshop's rows finds, as the owner (the reference). */
async function expectedIds(workshopId: number, table: 'estimates' | 'customers' | 'pieces', columns: string[], like: string): Promise<number[]> {
  const { rows } = await owner.query<{ id: number }>(
    `SELECT id FROM ${table} WHERE workshop_id = $1 AND (${columns.map((c) => `${c} ILIKE $2`).join(' OR ')}) ORDER BY id`,
    [workshopId, like],
  );
  return rows.map((r) => r.id);
}

beforeAll(async () => {
  await owner.connect();
  // Both workshops are this file's own: 620 bare estimate rows (no revision) must not land in the shared demo workshop.
  const broad = await createOtherWorkshop(sequelize, 'Broad Search Restorers');
  broadId = broad.id;
  other = await createOtherWorkshop(sequelize);
  const [broadOwner] = await runAsWorkshop(broadId, () => sequelize.query<{ id: number }>(`SELECT id FROM users WHERE role = 'owner' ORDER BY id LIMIT 1`, { type: QueryTypes.SELECT }));
  const [otherOwner] = await runAsWorkshop(other.id, () => sequelize.query<{ id: number }>(`SELECT id FROM users WHERE role = 'owner' ORDER BY id LIMIT 1`, { type: QueryTypes.SELECT }));
  // A broad term in one workshop (more than 500 matches), a selective one in the other.
  await runAsWorkshop(broadId, () => addTagged(620, broadOwner!.id));
  await runAsWorkshop(other.id, () => addTagged(30, otherOwner!.id));
  a = await signIn(app, broad.emails.sales, OTHER_PASSWORD);
  b = await signIn(app, other.emails.sales, OTHER_PASSWORD);
});
afterAll(async () => {
  await owner.end();
  await closeTestApp();
});

describe('the search functions', () => {
  const FUNCTIONS: [string, 'estimates' | 'customers' | 'pieces', string[]][] = [
    ['shellwright_search_estimates', 'estimates', ['number', 'title']],
    ['shellwright_search_customer_names', 'customers', ['name']],
    ['shellwright_search_customers', 'customers', ['name', 'email', 'phone']],
    ['shellwright_search_pieces', 'pieces', ['description']],
  ];

  it('answer the ids of the workshop the connection runs under, the same as an ILIKE over its rows, and none without one', async () => {
    const terms = [tag, tag.toLowerCase(), `${tag} no. 1`, 'no. 7', '%', 'nothing-matches-this'];
    for (const [fn, table, columns] of FUNCTIONS) {
      for (const term of terms) {
        const like = `%${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
        for (const workshopId of [broadId, other.id]) {
          const rows = await runAsWorkshop(workshopId, () => sequelize.query<{ id: number }>(`SELECT ${fn}(:like) AS id`, { replacements: { like }, type: QueryTypes.SELECT }));
          expect(rows.map((r) => Number(r.id)).sort((x, y) => x - y), `${fn} ${term} in ${workshopId}`).toEqual(await expectedIds(workshopId, table, columns, like));
        }
        const none = await runAsWorkshop(null, () => sequelize.query(`SELECT ${fn}(:like) AS id`, { replacements: { like }, type: QueryTypes.SELECT }));
        expect(none).toEqual([]);
      }
    }
  });

  it('take their workshop from the connection alone: the quotes search likewise', async () => {
    const rows = await runAsWorkshop(other.id, () => sequelize.query<{ id: number }>(`SELECT shellwright_search_quotes('%') AS id`, { type: QueryTypes.SELECT }));
    const { rows: expected } = await owner.query<{ id: number }>('SELECT id FROM quotes WHERE workshop_id = $1', [other.id]);
    expect(rows.map((r) => Number(r.id)).sort()).toEqual(expected.map((r) => r.id).sort());
  });
});

describe('the lists', () => {
  /** Every id of a paged list, page by page. */
  async function allRows(session: Session, path: string): Promise<{ ids: number[]; totals: unknown[] }> {
    const ids: number[] = [];
    const totals: unknown[] = [];
    for (let page = 1; ; page++) {
      const res = await session.agent.get(`${path}&pageSize=100&page=${page}`).expect(200);
      ids.push(...res.body.rows.map((r: { id: number }) => r.id));
      totals.push(res.body.total);
      if (res.body.rows.length < 100) break;
    }
    return { ids, totals };
  }

  it('find the same estimates as an ILIKE over the workshop, for a broad term and a selective one, in order and counted', async () => {
    for (const [session, workshopId, term] of [
      [a, broadId, tag],
      [a, broadId, `${tag} no. 61`],
      [b, other.id, tag],
      [b, other.id, `${tag} no. 3`],
    ] as const) {
      const like = `%${term}%`;
      const expected = await expectedIds(workshopId, 'estimates', ['number', 'title'], like);
      const { ids } = await allRows(session, `/api/estimates?q=${encodeURIComponent(term)}&sort=total&dir=asc`);
      // Totals were written as the estimate's number in the series: ascending total is the series' order.
      const { rows: ordered } = await owner.query<{ id: number }>('SELECT id FROM estimates WHERE id = ANY($1) AND NOT archived ORDER BY total ASC, id DESC', [expected]);
      expect(ids, term).toEqual(ordered.map((r) => r.id));
    }
  });

  it('never show the other workshop’s matches, and a term matching nothing finds nothing', async () => {
    const fromA = await a.agent.get(`/api/estimates?q=${encodeURIComponent(`${tag} no. 3`)}&pageSize=100`).expect(200);
    const fromB = await b.agent.get(`/api/estimates?q=${encodeURIComponent(`${tag} no. 3`)}&pageSize=100`).expect(200);
    const idsA = new Set(fromA.body.rows.map((r: { id: number }) => r.id));
    expect(fromB.body.rows.length).toBeGreaterThan(0);
    expect(fromB.body.rows.some((r: { id: number }) => idsA.has(r.id))).toBe(false);
    const customersB = await b.agent.get(`/api/customers?q=${encodeURIComponent(tag)}`).expect(200);
    expect(customersB.body.rows).toHaveLength(1);
    const nothing = await a.agent.get(`/api/estimates?q=${encodeURIComponent(`${tag}-nothing`)}`).expect(200);
    expect(nothing.body).toMatchObject({ rows: [], total: 0 });
  });
});
