/**
 * Cross-workshop matrix. Every route of the app's route table, for every role of a second workshop (B), aimed at
 * the objects of the demo workshop (A): a route that names an object answers 404 (never 403 or the object: nothing
 * of A is revealed), a write changes nothing of A, and every list and search of B shows none of A's rows. The ids
 * come from the route table's own parameters, mapped to their tables below; a new route whose parameter is not
 * mapped fails here, so it joins the matrix when it is written.
 */
import pg from 'pg';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can, isPermission, ROLES, type Role } from '../../shared/roles';
import { closeTestApp, demoWorkshopId, getTestApp, signIn, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, crossWorkshopReferences, OTHER_PASSWORD, PARAM_TABLES, tableOf } from '../helpers/workshops';

const { app, routes, sequelize } = getTestApp();
const owner = new pg.Client({ connectionString: testDatabaseUrl() });
const sessions = {} as Record<Role, Session>;
let workshopA: number;
/** A's id in each table (one of its rows; an id may be a number or a uuid), read by the owner. */
const idsOfA = new Map<string, string>();
/** Strings only A's rows hold: customer names, user e-mails, the workshop's name. */
let markers: string[] = [];
/** A's estimate, quote, job and purchase order numbers. */
let numbersOfA: string[] = [];

/** The route's path with A's ids in it, or undefined when A has no such row yet. */
function aimedAtA(path: string): string | undefined {
  let missing = false;
  const out = path.replace(/:(\w+)/g, (_m, param: string) => {
    if (param === 'number') return '1';
    const id = idsOfA.get(tableOf(path, param)!);
    if (id === undefined) missing = true;
    return String(id ?? 999999);
  });
  return missing ? undefined : out;
}

async function fingerprintOfA(): Promise<string> {
  const parts: string[] = [];
  for (const table of [...new Set(Object.values(PARAM_TABLES)), 'estimate_revisions']) {
    const { rows } = await owner.query<{ f: string | null }>(`SELECT md5(string_agg(t::text, '|')) AS f FROM "${table}" t WHERE t.id::text = $1`, [idsOfA.get(table) ?? '-1']);
    parts.push(`${table}:${rows[0]!.f}`);
  }
  return parts.join(',');
}

const signedIn = routes.filter((r) => r.access !== 'public');
/**
 * Parameters that name something every workshop has its own of (a message template's kind), not an object of A: a
 * route whose only parameters are such keys reaches B's own and is no cross-workshop target.
 */
const OWN_KEYS = new Set(['kind']);
const withIds = signedIn.filter((r) => [...r.path.matchAll(/:(\w+)/g)].some((m) => !OWN_KEYS.has(m[1]!)));
const lists = signedIn.filter((r) => r.method === 'get' && !r.path.includes('/:'));

beforeAll(async () => {
  await owner.connect();
  workshopA = (await demoWorkshopId(sequelize))!;
  for (const table of new Set([...Object.values(PARAM_TABLES), 'estimate_revisions'])) {
    const { rows } = await owner.query<{ id: string }>(`SELECT id::text AS id FROM "${table}" WHERE workshop_id = $1 ORDER BY ctid DESC LIMIT 1`, [workshopA]);
    if (rows[0]) idsOfA.set(table, rows[0].id);
  }
  const { rows: names } = await owner.query<{ m: string }>(
    `SELECT name AS m FROM customers WHERE workshop_id = $1 UNION SELECT email FROM users WHERE workshop_id = $1 UNION SELECT name FROM workshops WHERE id = $1`,
    [workshopA],
  );
  markers = names.map((r) => r.m).filter((m) => m.length >= 8);
  // A's record numbers (EST-, Q-, JOB-, PO-), searched for in every list below.
  const { rows: numbers } = await owner.query<{ n: string }>(
    `(SELECT number AS n FROM estimates WHERE workshop_id = $1 ORDER BY id LIMIT 1) UNION ALL (SELECT number FROM quotes WHERE workshop_id = $1 ORDER BY id LIMIT 1)
     UNION ALL (SELECT number FROM jobs WHERE workshop_id = $1 ORDER BY id LIMIT 1) UNION ALL (SELECT number FROM purchase_orders WHERE workshop_id = $1 ORDER BY id LIMIT 1)`,
    [workshopA],
  );
  numbersOfA = numbers.map((r) => r.n);
  const other = await createOtherWorkshop(sequelize, 'Tallowgate Finishing Rooms');
  for (const role of ROLES) sessions[role] = await signIn(app, other.emails[role], OTHER_PASSWORD);
});
afterAll(async () => {
  await owner.end();
  await closeTestApp();
});

describe('cross-workshop matrix', () => {
  it('maps every path parameter of the route table to a table', () => {
    const unmapped = withIds.flatMap((r) => [...r.path.matchAll(/:(\w+)/g)].map((m) => m[1]!).filter((p) => !tableOf(r.path, p)).map((p) => `${r.path} :${p}`));
    expect(unmapped).toEqual([]);
  });

  it('finds objects of A for the routes to aim at', () => {
    expect(markers.length).toBeGreaterThan(3);
    expect(numbersOfA.length).toBeGreaterThanOrEqual(3);
    for (const t of ['customers', 'pieces', 'estimates', 'quotes', 'jobs', 'users', 'materials', 'piece_photos']) expect(idsOfA.has(t), t).toBe(true);
  });

  for (const route of withIds) {
    const label = `${route.method.toUpperCase()} ${route.path}`;
    for (const role of ROLES) {
      const allowed = route.access === 'signed-in' || (isPermission(route.access) && can(role, route.access));
      it(`${label}: ${role} of B on A's object → ${allowed ? '404, nothing changed' : '403'}`, async () => {
        const path = aimedAtA(route.path);
        if (!path) return; // A holds no such row (the demo has none): nothing to aim at.
        const before = route.method === 'get' ? '' : await fingerprintOfA();
        const s = sessions[role];
        const req = (s.agent as unknown as Record<string, (p: string) => request.Test>)[route.method]!(path);
        if (route.method !== 'get') req.set('x-csrf-token', s.csrf).send({});
        const res = await req;
        if (!allowed) {
          expect(res.status).toBe(403);
          return;
        }
        // A write's body is checked before its object is looked up, so an empty body may meet a 400 first; either
        // way nothing of A is shown or changed.
        expect(route.method === 'get' ? [404] : [400, 404]).toContain(res.status);
        for (const m of markers) expect(res.text).not.toContain(m);
        if (route.method !== 'get') expect(await fingerprintOfA()).toBe(before);
      });
    }
  }

  for (const route of lists) {
    it(`GET ${route.path}: every role of B sees none of A's rows, also when searching A's names and numbers`, async () => {
      for (const role of ROLES) {
        const allowed = route.access === 'signed-in' || (isPermission(route.access) && can(role, route.access));
        if (!allowed) continue;
        for (const query of [{}, { q: markers[0]!.split(' ')[0]! }, ...numbersOfA.map((n) => ({ q: n, number: n }))]) {
          const res = await sessions[role].agent.get(route.path).query(query);
          expect(res.status, `${role} ${JSON.stringify(query)}`).toBeLessThan(500);
          for (const m of [...markers, ...numbersOfA]) expect(res.text, `${role} ${route.path} ${JSON.stringify(query)}`).not.toContain(m);
        }
      }
    });
  }

  it("leaves no row of any workshop referencing another workshop's row", async () => {
    expect(await crossWorkshopReferences(owner)).toEqual([]);
  });
});
