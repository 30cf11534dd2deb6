/**
 * Hostile input at every write route (taken from the app's route table, so new routes join by themselves):
 * wrong types, huge and negative numbers, NaN, long strings, unicode, SQL and HTML fragments, extra and missing
 * fields, oversize bodies and uploads. Every answer must be below 500; every refusal (4xx) must leave the database
 * exactly as it was, and a validation refusal must name the field.
 *
 * Then the classes of input that once reached the server's insides, each from a generator of its own, at every write
 * route and every public route: strings with NUL or unpaired surrogates, malformed percent-encoding and broken or
 * unsupported content codings, impossible dates, and huge numbers. A count of what was sent is printed.
 */
import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import pg from 'pg';
import { QueryTypes } from 'sequelize';
import { can, isPermission, ROLES, type Role } from '../../shared/roles';
import { closeTestApp, demoWorkshopId, getTestApp, signIn, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, crossWorkshopReferences, idsOfWorkshop, OTHER_PASSWORD, tableOf } from '../helpers/workshops';

const { app, routes, sequelize } = getTestApp();
/** The database's owner, for the fingerprint (see below). */
const ownerDb = new pg.Client({ connectionString: testDatabaseUrl() });
let owner: Session;
let services: Awaited<ReturnType<typeof startServices>>;
beforeAll(async () => {
  await ownerDb.connect();
  services = await startServices();
  owner = await signInAs(app, 'owner');
});
afterAll(async () => {
  // The counters this file ran up from one address would otherwise slow later files' sign-ins and resets.
  await sequelize.query('DELETE FROM login_attempts');
  await ownerDb.end();
  await services?.stop();
  await closeTestApp();
});

/**
 * Every table's contents, as one hash a table. Sessions and the shared sign-in counters (login_attempts) are left out:
 * counting a refused attempt is their job. A binary column (a mailed PDF, a photo) enters by its own md5 rather than
 * as hex text, which would make every fingerprint read megabytes of text.
 */
/**
 * Columns the message queue changes in the background while the file runs (a message queued by an earlier, accepted
 * request being delivered or retried): not a write by the request under test. A refused request that queued a message
 * still shows, as a new row.
 */
const DELIVERY_STATE: Record<string, Set<string>> = { outbox: new Set(['status', 'attempts', 'last_error', 'message_id', 'sent_at']) };
let fingerprintSql: string | undefined;
async function fingerprint(): Promise<string> {
  // Read as the owner, past row-level security: every workshop's rows count, not only the ones the app may see. The
  // tables and their columns do not change during the file, so the query is built once.
  if (!fingerprintSql) {
    const { rows: columns } = await ownerDb.query<{ t: string; c: string; binary: boolean }>(
      `SELECT c.table_name::text AS t, c.column_name::text AS c, c.data_type = 'bytea' AS binary
         FROM information_schema.columns c JOIN information_schema.tables t USING (table_schema, table_name)
        WHERE c.table_schema = 'public' AND t.table_type = 'BASE TABLE' AND c.table_name NOT IN ('session', 'login_attempts')
        ORDER BY c.table_name, c.ordinal_position`,
    );
    const tables = new Map<string, string[]>();
    for (const { t, c, binary } of columns) {
      if (DELIVERY_STATE[t]?.has(c)) continue;
      tables.set(t, [...(tables.get(t) ?? []), binary ? `md5(x."${c}")` : `x."${c}"`]);
    }
    fingerprintSql = [...tables].map(([t, cols]) => `SELECT '${t}' AS t, md5(coalesce(string_agg(md5(ROW(${cols.join(', ')})::text), '' ORDER BY md5(ROW(${cols.join(', ')})::text)), '')) AS h FROM "${t}" x`).join(' UNION ALL ');
  }
  const { rows } = await ownerDb.query<{ t: string; h: string }>(fingerprintSql);
  return rows.map((r) => `${r.t}:${r.h}`).join('|');
}

/**
 * The fingerprint before a request. A refused request's "after" is the next request's "before" (nothing else writes
 * in between), so each refusal costs one fingerprint, not two; any other answer forgets it.
 */
let lastRefused: string | undefined;
// Each test starts from a fresh fingerprint: a test's own set-up writes come between.
beforeEach(() => {
  lastRefused = undefined;
});
async function fingerprintBefore(): Promise<string> {
  const known = lastRefused;
  lastRefused = undefined;
  return known ?? fingerprint();
}
/** The fingerprint after a refused request, remembered as the next request's "before". */
async function fingerprintAfterRefusal(): Promise<string> {
  lastRefused = await fingerprint();
  return lastRefused;
}

const hostileString = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.string({ unit: 'grapheme', maxLength: 40 }),
  fc.constantFrom(
    "'; DROP TABLE users; --",
    '" OR 1=1 --',
    '<script>alert(1)</script>',
    '<img src=x onerror=alert(1)>',
    '../../../../etc/passwd',
    '%00',
    '\u0000\u202e\uFEFF',
    'NaN',
    'Infinity',
    '-1e308',
    '6 ft 3 in; SELECT 1',
    '🎹🪵',
    'x'.repeat(5000),
  ),
);
const hostileNumber = fc.oneof(fc.integer(), fc.double(), fc.constantFrom(1e308, -1e308, -1, 0, 2 ** 53, Number.MAX_SAFE_INTEGER, 0.1 + 0.2));
const leaf = fc.oneof(hostileString, hostileNumber, fc.boolean(), fc.constant(null));
const hostileValue = fc.oneof(
  { depthSize: 'small' },
  leaf,
  fc.array(leaf, { maxLength: 4 }),
  fc.dictionary(hostileString, leaf, { maxKeys: 4 }),
);

/** Field names the API uses, so that generated bodies reach past the first check. */
const FIELDS = [
  'name', 'email', 'role', 'password', 'active', 'phone', 'address', 'notes', 'customerId', 'pieceId', 'kind',
  'description', 'maker', 'year', 'serial', 'dimensions', 'conditionNotes', 'caption', 'title', 'input', 'note',
  'baseRevision', 'state', 'archived', 'ids', 'revision', 'message', 'extras', 'discountPct', 'depositPct',
  'validUntil', 'recipient', 'acceptTerms', 'reason', 'price', 'effectiveFrom', 'size', 'label', 'supplier',
  'packs', 'unit', 'key', 'stages', 'perHour', 'settings', 'hash', 'previewId', 'start', 'date', 'hours', 'actualHours',
  'temperatureC', 'humidityPct', 'piece', 'parts', 'system', 'climate', 'startDate',
];
const body = fc.oneof(
  fc.dictionary(fc.constantFrom(...FIELDS), hostileValue, { maxKeys: 6 }),
  fc.dictionary(hostileString, hostileValue, { maxKeys: 3 }),
  fc.array(leaf, { maxLength: 3 }),
  leaf,
);
const pathValue = fc.oneof(fc.constantFrom('1', '2', '999999', '0', '-1', 'abc', '1e3', '2147483648', '%27%20OR%201%3D1'), fc.nat({ max: 50 }).map(String));

/** Routes that would end the fuzzing session itself. */
const SKIP = new Set(['post /api/auth/logout', 'post /api/auth/login']);

const writes = routes.filter((r) => r.method !== 'get' && !SKIP.has(`${r.method} ${r.path}`));

function withParams(path: string, values: string[]): string {
  let i = 0;
  return path.replace(/:(\w+)/g, () => values[i++ % values.length] ?? '1');
}

describe('hostile input at every write route', () => {
  it('covers the write routes of the app', () => {
    expect(writes.length).toBeGreaterThan(20);
  });

  for (const route of writes) {
    it(`${route.method.toUpperCase()} ${route.path}: never a 5xx, a refusal changes nothing`, async () => {
      await fc.assert(
        fc.asyncProperty(body, fc.array(pathValue, { minLength: 1, maxLength: 3 }), async (payload, params) => {
          const url = withParams(route.path, params);
          const before = await fingerprintBefore();
          const agent = route.access === 'public' ? request(app) : owner.agent;
          const req = (agent as unknown as Record<string, (u: string) => request.Test>)[route.method]!(url);
          if (route.access !== 'public') req.set('x-csrf-token', owner.csrf);
          const res = await req.set('content-type', 'application/json').send(JSON.stringify(payload));
          expect(res.status, `${route.method} ${url} ${JSON.stringify(payload).slice(0, 200)} → ${res.status} ${res.text.slice(0, 300)}`).toBeLessThan(500);
          if (res.status >= 400) {
            expect(await fingerprintAfterRefusal()).toBe(before);
            if (res.status === 400) {
              const problem = JSON.parse(res.text);
              expect(problem.detail ?? problem.title).toBeTruthy();
              if (problem.code === 'validation_failed') expect(problem.field).toBeTruthy();
            }
          }
        }),
        { numRuns: 12, seed: 20261202 },
      );
    });
  }
});

describe('oversize and malformed bodies', () => {
  it('refuses a body over the limit with 413 and changes nothing', async () => {
    const before = await fingerprint();
    const res = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').send(JSON.stringify({ name: 'x'.repeat(2_000_000) }));
    expect(res.status).toBe(413);
    expect(await fingerprint()).toBe(before);
  });

  it('refuses broken JSON with 400', async () => {
    const res = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').send('{"name": ');
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).code).toBe('invalid_json');
  });

  it('stores uploads under random names whatever the file is called', async () => {
    const customers = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).send({ name: 'Upload Probe' }).expect(201);
    const piece = await owner.agent.post('/api/pieces').set('x-csrf-token', owner.csrf).send({ customerId: customers.body.id, kind: 'furniture', description: 'Probe' }).expect(201);
    const sharp = (await import('sharp')).default;
    const png = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#000' } }).png().toBuffer();
    const res = await owner.agent.post(`/api/pieces/${piece.body.id}/photos`).set('x-csrf-token', owner.csrf).attach('photos', png, '../../../../tmp/escape.png').expect(201);
    const [row] = await sequelize.query<{ file_name: string }>('SELECT file_name FROM piece_photos WHERE id = :id', { replacements: { id: res.body[0].id }, type: QueryTypes.SELECT });
    expect(row!.file_name).toMatch(/^w[0-9]+\/[0-9a-f]{32}\.png$/);
    const randomBytes = Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 7919) % 256));
    const junk = await owner.agent.post(`/api/pieces/${piece.body.id}/photos`).set('x-csrf-token', owner.csrf).attach('photos', randomBytes, 'noise.webp');
    expect(junk.status).toBe(400);
  });
});

// ------------------------------------------------------------------------------------------ classes of input

/** A string holding a NUL or an unpaired surrogate somewhere, in otherwise ordinary text. */
const badText = fc
  .tuple(fc.string({ maxLength: 12 }), fc.constantFrom('\u0000', '\uD800', '\uDBFF', '\uDC00', '\uDFFF', 'a\uD83D', '\uDE00b', '\u0000\uD800'), fc.string({ maxLength: 12 }))
  .map(([a, bad, b]) => a + bad + b);

/** Dates no calendar has, dates out of any sensible range, and near-misses of the format. */
const impossibleDate = fc.oneof(
  fc.constantFrom(
    '2026-02-30', '2025-02-29', '2100-02-29', '0000-01-01', '0000-00-00', '2026-13-01', '2026-00-10', '2026-04-31', '2026-06-31',
    '9999-12-31', '1899-12-31', '0001-01-01', '275760-09-13', '+275760-09-13', '-000001-01-01', '2026-1-5', '2026-02-30T10:00',
    '2026-12-07T24:00', '2026-12-07T23:60', '2026-12-07T10:00:61', '2026-12-07T10:00Z', '20261207', '2026-12-07 10:00', '',
  ),
  fc
    .record({ y: fc.integer({ min: 0, max: 9999 }), m: fc.integer({ min: 0, max: 13 }), d: fc.integer({ min: 0, max: 32 }) })
    .map(({ y, m, d }) => `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`),
);

/** Numbers at and past the edges of what a column or a double holds. */
const hugeNumber = fc.oneof(
  fc.constantFrom(1e308, -1e308, Number.MAX_VALUE, -Number.MAX_VALUE, Number.MIN_VALUE, 2 ** 53 + 2, -(2 ** 63), 2 ** 31, -(2 ** 31) - 1, 1e21, 9.999999999999999e22),
  fc.double({ min: 1e9, max: 1e308, noNaN: true }),
  fc.double({ min: -1e308, max: -1e9, noNaN: true }),
  fc.constantFrom('1e400', '99999999999999999999.99', '-0', '1e-400', '123456789012345678901234567890'),
);

/** Fields that take dates, at the top level and where they sit inside bodies. */
const DATE_FIELDS = ['validUntil', 'effectiveFrom', 'notBefore', 'start', 'actualEnd', 'startDate', 'from', 'to', 'date'];
const dateBody = fc.oneof(
  fc.dictionary(fc.constantFrom(...DATE_FIELDS), impossibleDate, { minKeys: 1, maxKeys: 3 }),
  fc.record({ mode: fc.constantFrom('earliest', 'date'), notBefore: impossibleDate, start: impossibleDate }),
  fc.record({ price: fc.constant('9.95'), effectiveFrom: impossibleDate }),
  fc.record({ actualEnd: impossibleDate, actualHours: fc.constant(2), temperatureC: fc.constant(20), humidityPct: fc.constant(50), notes: fc.constant('Fuzz.') }),
  fc.record({ input: fc.record({ startDate: impossibleDate }) }),
  fc.record({ daysOff: fc.array(impossibleDate, { minLength: 1, maxLength: 3 }) }),
  fc.record({ settings: fc.record({ calendar: fc.record({ closedDates: fc.array(impossibleDate, { minLength: 1, maxLength: 2 }) }) }) }),
);
/** Bad text as values, as keys, and deep inside. */
const textBody = fc.oneof(
  fc.dictionary(fc.constantFrom(...FIELDS), badText, { minKeys: 1, maxKeys: 4 }),
  fc.dictionary(badText, fc.string({ maxLength: 8 }), { minKeys: 1, maxKeys: 2 }),
  fc.record({ input: fc.record({ piece: fc.record({ notes: badText }) }), extras: fc.array(fc.record({ label: badText }), { maxLength: 2 }) }),
  fc.array(badText, { minLength: 1, maxLength: 3 }),
  badText,
);
/** Huge numbers where the API takes numbers, and in strings that read as numbers. */
const numberBody = fc.oneof(
  fc.dictionary(fc.constantFrom(...FIELDS), hugeNumber, { minKeys: 1, maxKeys: 5 }),
  fc.record({ input: fc.record({ piece: fc.record({ dimensions: fc.record({ length: hugeNumber, width: hugeNumber }) }), climate: fc.record({ temperatureC: hugeNumber, humidityPct: hugeNumber }) }) }),
  fc.record({ price: hugeNumber, effectiveFrom: fc.constant('2026-12-01') }),
  fc.record({ extras: fc.array(fc.record({ label: fc.constant('x'), hours: hugeNumber, price: hugeNumber }), { minLength: 1, maxLength: 2 }), discountPct: hugeNumber }),
);

/** Malformed percent-encoding and characters a path must not carry, as a path segment. */
const badSegment = fc.constantFrom('%ZZ', '%', '%4', '%E2%82', '%C0%AF', '%ED%A0%80', '%F0%9F', '%FF%FE', '%00', 'abc%00def', '1%00', '%E2%82%AC%E2');

/** Broken or unsupported content codings, each with the bytes it comes with. */
const badCoding = fc.constantFrom<{ encoding: string; bytes: (json: string) => Buffer }>(
  { encoding: 'gzip', bytes: (json) => Buffer.from(json) },
  { encoding: 'gzip', bytes: (json) => gzipSync(json).subarray(0, 12) },
  { encoding: 'deflate', bytes: () => Buffer.from([0x78, 0x9c, 0xff, 0xff, 0x00]) },
  { encoding: 'br', bytes: () => Buffer.from('not brotli at all') },
  { encoding: 'compress', bytes: (json) => Buffer.from(json) },
  { encoding: 'x-snappy', bytes: (json) => Buffer.from(json) },
  { encoding: 'gzip, gzip', bytes: (json) => gzipSync(gzipSync(json)) },
  { encoding: 'identity, gzip', bytes: (json) => gzipSync(json) },
);

/** Sends a Buffer as its bytes (superagent would otherwise turn it into JSON for a JSON content type). */
const rawBytes = (body: unknown) => body as string;

type FuzzClass = 'NUL/surrogates' | 'bad encodings' | 'impossible dates' | 'huge numbers';
const counts: Record<FuzzClass, { sent: number; fiveHundreds: number; statuses: Record<number, number> }> = {
  'NUL/surrogates': { sent: 0, fiveHundreds: 0, statuses: {} },
  'bad encodings': { sent: 0, fiveHundreds: 0, statuses: {} },
  'impossible dates': { sent: 0, fiveHundreds: 0, statuses: {} },
  'huge numbers': { sent: 0, fiveHundreds: 0, statuses: {} },
};
function count(cls: FuzzClass, status: number): void {
  counts[cls].sent++;
  counts[cls].statuses[status] = (counts[cls].statuses[status] ?? 0) + 1;
  if (status >= 500) counts[cls].fiveHundreds++;
}
afterAll(() => {
  const total = Object.values(counts).reduce((n, c) => n + c.sent, 0);
  const fives = Object.values(counts).reduce((n, c) => n + c.fiveHundreds, 0);
  const lines = Object.entries(counts).map(([cls, c]) => `  ${cls}: ${c.sent} requests, ${c.fiveHundreds} × 5xx, statuses ${JSON.stringify(c.statuses)}`);
  console.log(`[fuzz] ${total} requests from the input-class generators, ${fives} × 5xx\n${lines.join('\n')}`);
});

/** A quote sent to its customer, so that the public routes are reached with a real, signed token. */
let realToken = '';
beforeAll(async () => {
  const post = (url: string, body: object) => owner.agent.post(url).set('x-csrf-token', owner.csrf).send(body);
  const c = await post('/api/customers', { name: 'Fuzz Customer', email: 'fuzz.customer@example.com' }).expect(201);
  const p = await post('/api/pieces', { customerId: c.body.id, kind: 'grand', description: 'Fuzz grand' }).expect(201);
  const input = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };
  const e = await post('/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  await post(`/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(`/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(`/api/quotes/${q.body.id}/send`, {}).expect(200);
  realToken = String(sent.body.link).split('/q/')[1]!;
});

const publicRoutes = routes.filter((r) => r.access === 'public');
const classRoutes = [...writes, ...publicRoutes.filter((r) => r.method === 'get'), ...routes.filter((r) => SKIP.has(`${r.method} ${r.path}`))];

/** Sends one request as the route's caller would: signed in with a CSRF token, or as the public. */
function send(route: (typeof routes)[number], url: string) {
  const agent = route.access === 'public' ? request(app) : owner.agent;
  const req = (agent as unknown as Record<string, (u: string) => request.Test>)[route.method]!(url);
  if (route.access !== 'public') req.set('x-csrf-token', owner.csrf);
  return req;
}

function fillParams(route: (typeof routes)[number], values: string[]): string {
  let i = 0;
  return route.path.replace(/:(\w+)/g, (_m, name: string) => (name === 'token' ? realToken : (values[i++ % values.length] ?? '1')));
}

async function expectNoServerError(cls: FuzzClass, label: string, res: request.Response, before: string) {
  count(cls, res.status);
  expect(res.status, `${label} → ${res.status} ${String(res.text ?? '').slice(0, 300)}`).toBeLessThan(500);
  if (res.status >= 400 && res.status !== 429) {
    expect(await fingerprintAfterRefusal(), `${label} changed the database while refused`).toBe(before);
    const problem = JSON.parse(res.text);
    expect(problem.detail ?? problem.title).toBeTruthy();
    if (res.status === 400 && (problem.code === 'validation_failed' || problem.code === 'invalid_text')) expect(problem.field).toBeTruthy();
  }
}

describe('input classes at every write route and every public route', () => {
  it('covers the public routes too', () => {
    expect(publicRoutes.map((r) => r.path)).toEqual(expect.arrayContaining(['/api/public/quotes/:token', '/api/public/quotes/:token/accept', '/api/auth/login']));
  });

  const bodies: [FuzzClass, fc.Arbitrary<unknown>][] = [
    ['NUL/surrogates', textBody],
    ['impossible dates', dateBody],
    ['huge numbers', numberBody],
  ];
  for (const route of classRoutes) {
    const hasBody = route.method !== 'get' && route.method !== 'delete';
    it(`${route.method.toUpperCase()} ${route.path}: each class is refused cleanly, never a 5xx`, async () => {
      const params = fc.array(fc.oneof(fc.constantFrom('1', '2', '3'), fc.nat({ max: 40 }).map(String)), { minLength: 1, maxLength: 3 });
      if (hasBody) {
        for (const [cls, arb] of bodies) {
          await fc.assert(
            fc.asyncProperty(arb, params, async (payload, values) => {
              const url = fillParams(route, values);
              const before = await fingerprintBefore();
              const json = JSON.stringify(payload).replace(/"1e400"/g, '1e400');
              const res = await send(route, url).set('content-type', 'application/json').send(json);
              await expectNoServerError(cls, `${route.method} ${url} ${json.slice(0, 200)}`, res, before);
              if (cls === 'NUL/surrogates') expect([400, 401, 403, 404, 429]).toContain(res.status);
            }),
            { numRuns: 6, seed: 20261203 },
          );
        }
      }
      // Bad text and malformed escapes in the query string of any route: refused before the route runs.
      await fc.assert(
        fc.asyncProperty(fc.constantFrom('%00', 'a%00b', '%ED%A0%80', '%C0%80', '%ZZ', '%E2%82'), params, async (raw, values) => {
          const url = `${fillParams(route, values)}?q=${raw}&from=${raw}`;
          const before = await fingerprintBefore();
          const res = await send(route, url).set('content-type', 'application/json').send(hasBody ? '{}' : undefined as never);
          await expectNoServerError('NUL/surrogates', `${route.method} ${url}`, res, before);
          expect(res.status).toBe(400);
          expect(JSON.parse(res.text).field).toBe('q');
        }),
        { numRuns: 3, seed: 20261203 },
      );
      // Malformed percent-encoding in each path parameter (or after the path), and broken or unsupported codings.
      await fc.assert(
        fc.asyncProperty(badSegment, params, async (segment, values) => {
          const url = route.path.includes(':') ? route.path.replace(/:(\w+)/, segment).replace(/:(\w+)/g, () => values[0] ?? '1') : `${route.path}/${segment}`;
          const before = await fingerprintBefore();
          const res = await send(route, url).set('content-type', 'application/json').send(hasBody ? '{}' : undefined as never);
          await expectNoServerError('bad encodings', `${route.method} ${url}`, res, before);
          if (route.path.includes(':') && !['%00', 'abc%00def', '1%00'].includes(segment)) expect(res.status).toBe(400);
        }),
        { numRuns: 4, seed: 20261203 },
      );
      if (hasBody) {
        await fc.assert(
          fc.asyncProperty(badCoding, params, async (coding, values) => {
            const url = fillParams(route, values);
            const before = await fingerprintBefore();
            const res = await send(route, url).set('content-type', 'application/json').set('content-encoding', coding.encoding).serialize(rawBytes).send(coding.bytes('{"name":"Fuzz"}'));
            await expectNoServerError('bad encodings', `${route.method} ${url} content-encoding: ${coding.encoding}`, res, before);
            // Broken or unsupported codings are refused as bad input, whatever the route.
            expect(res.status, `${route.method} ${url} content-encoding: ${coding.encoding}`).toBe(400);
          }),
          { numRuns: 3, seed: 20261203 },
        );
      }
    });
  }

  it('a NUL or lone surrogate on the public accept form is a 400 naming the field, and nothing is stored', async () => {
    for (const name of ['Ada\u0000Lovelace', 'Ada \uD800', '\uDC00']) {
      const before = await fingerprint();
      const res = await request(app).post(`/api/public/quotes/${realToken}/accept`).send({ name, acceptTerms: true });
      count('NUL/surrogates', res.status);
      expect(res.status).toBe(400);
      expect(JSON.parse(res.text)).toMatchObject({ code: 'invalid_text', field: 'name' });
      expect(await fingerprint()).toBe(before);
    }
  });

  it('well-formed text survives unaltered: a surrogate pair, accents and an emoji are stored as sent', async () => {
    const name = 'Zoë Ashgrove 🎹 𝄞';
    const res = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).send({ name });
    expect(res.status).toBe(201);
    expect(res.body.name).toBe(name);
  });

  it('a gzip body is read, and then meets the same text rule', async () => {
    const ok = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', 'gzip').serialize(rawBytes).send(gzipSync(JSON.stringify({ name: 'Gzipped Customer' })));
    expect(ok.status, ok.text).toBe(201);
    const bad = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', 'gzip').serialize(rawBytes).send(gzipSync(JSON.stringify({ name: 'Bad\u0000' })));
    count('NUL/surrogates', bad.status);
    expect(JSON.parse(bad.text)).toMatchObject({ status: 400, field: 'name' });
    const broken = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', 'gzip').serialize(rawBytes).send(Buffer.from('not gzip'));
    count('bad encodings', broken.status);
    expect(broken.status).toBe(400);
    const unsupported = await owner.agent.post('/api/customers').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', 'compress').send('{}');
    count('bad encodings', unsupported.status);
    expect(unsupported.status).toBe(400);
    expect(JSON.parse(unsupported.text)).toMatchObject({ code: 'unsupported_encoding', field: 'Content-Encoding' });
  });

  it('malformed percent-encoding anywhere in a path is a 400, on API and page paths alike', async () => {
    for (const path of ['/%ZZ', '/api/%ZZ', '/api/customers/%E2%82', '/estimates/%C0', '/api/public/quotes/%ED%A0%80']) {
      const res = await request(app).get(path);
      count('bad encodings', res.status);
      expect(res.status, path).toBe(400);
      expect(JSON.parse(res.text).code).toBe('bad_path');
    }
  });
});

// ------------------------------------------------------------------------------ another workshop at the demo's objects

/**
 * The same generated requests, sent by each role of another workshop (B) at the demo workshop's (A) objects: A's ids
 * and revision numbers in the path, and A's ids in every id field of the body. A route that names an object of A in
 * its path answers 404 (or 400 for input refused before the object is looked up): never 403, never 2xx, never a 5xx.
 * A route that names none may do its work in B (a new customer of B is fine), but never shows, changes or references
 * anything of A. A's rows, read by the owner past row-level security, are the same at the end of every route.
 */
describe("another workshop's people at the demo workshop's objects", () => {
  let a = 0;
  let idsOfA = new Map<string, string[]>();
  let markersOfA: string[] = [];
  const sessionsOfB = {} as Record<Role, Session>;
  let aFingerprintSql: string | undefined;

  /** A's rows only (the workshop row by its id), as one hash a table; the outbox's delivery state left out as above. */
  async function fingerprintOfA(): Promise<string> {
    if (!aFingerprintSql) {
      const { rows: columns } = await ownerDb.query<{ t: string; c: string; binary: boolean }>(
        `SELECT c.table_name::text AS t, c.column_name::text AS c, c.data_type = 'bytea' AS binary
           FROM information_schema.columns c JOIN information_schema.tables t USING (table_schema, table_name)
          WHERE c.table_schema = 'public' AND t.table_type = 'BASE TABLE'
            AND (c.table_name = 'workshops' OR EXISTS (SELECT 1 FROM information_schema.columns w
                  WHERE w.table_schema = 'public' AND w.table_name = c.table_name AND w.column_name = 'workshop_id'))
          ORDER BY c.table_name, c.ordinal_position`,
      );
      const tables = new Map<string, string[]>();
      for (const { t, c, binary } of columns) {
        if (DELIVERY_STATE[t]?.has(c)) continue;
        tables.set(t, [...(tables.get(t) ?? []), binary ? `md5(x."${c}")` : `x."${c}"`]);
      }
      aFingerprintSql = [...tables]
        .map(([t, cols]) => `SELECT '${t}' AS t, md5(coalesce(string_agg(md5(ROW(${cols.join(', ')})::text), '' ORDER BY md5(ROW(${cols.join(', ')})::text)), '')) AS h FROM "${t}" x WHERE x.${t === 'workshops' ? 'id' : 'workshop_id'} = $1`)
        .join(' UNION ALL ');
    }
    const { rows } = await ownerDb.query<{ t: string; h: string }>(aFingerprintSql, [a]);
    return rows.map((r) => `${r.t}:${r.h}`).join('|');
  }

  beforeAll(async () => {
    a = (await demoWorkshopId(sequelize))!;
    idsOfA = await idsOfWorkshop(ownerDb, a, 3);
    const { rows } = await ownerDb.query<{ m: string }>(
      `SELECT name AS m FROM customers WHERE workshop_id = $1 UNION SELECT email FROM users WHERE workshop_id = $1
       UNION SELECT name FROM workshops WHERE id = $1 UNION SELECT number FROM estimates WHERE workshop_id = $1`,
      [a],
    );
    markersOfA = rows.map((r) => r.m).filter((m) => m.length >= 8);
    const b = await createOtherWorkshop(sequelize, 'Fuzzing Bench Polishers');
    for (const role of ROLES) sessionsOfB[role] = await signIn(app, b.emails[role], OTHER_PASSWORD);
  });

  /** A's ids of a table, as path values; a parameter of no mapped table gets A's newest estimate's. */
  const idsFor = (table: string | undefined) => idsOfA.get(table ?? 'estimates') ?? ['999999'];
  /** Id fields of request bodies and the table whose ids they carry. */
  const ID_FIELDS: Record<string, string> = {
    customerId: 'customers', pieceId: 'pieces', estimateId: 'estimates', quoteId: 'quotes', jobId: 'jobs', materialId: 'materials',
    packId: 'material_packs', polisherId: 'polishers', userId: 'users', sessionId: 'job_sessions', fromId: 'finishing_systems',
    systemId: 'finishing_systems', outboxId: 'outbox', lineId: 'purchase_orders', previewId: 'price_file_previews', keptPolisherId: 'polishers',
  };
  /** A generated body with A's ids put in its id fields (and a list of A's ids where a list of ids goes). */
  const bodyAtA = fc.tuple(body, fc.subarray(Object.keys(ID_FIELDS), { minLength: 1, maxLength: 4 }), fc.nat({ max: 2 })).map(([payload, fields, pick]) => {
    const withIds: Record<string, unknown> = payload && typeof payload === 'object' && !Array.isArray(payload) ? { ...(payload as object) } : {};
    for (const f of fields) {
      const ids = idsFor(ID_FIELDS[f]);
      withIds[f] = Number(ids[pick % ids.length]);
    }
    if (pick === 0) withIds.ids = idsFor('estimates').map(Number);
    if (pick === 1) withIds.jobIds = idsFor('jobs').map(Number);
    return Array.isArray(payload) || payload === null || typeof payload !== 'object' ? (pick === 2 ? payload : withIds) : withIds;
  });

  const OWN_KEYS = new Set(['kind', 'token']);
  const aimed = routes.filter((r) => r.access !== 'public' && !SKIP.has(`${r.method} ${r.path}`));

  it('aims at objects of A, from a workshop of its own', () => {
    for (const t of ['customers', 'pieces', 'estimates', 'quotes', 'jobs', 'users']) expect(idsOfA.has(t), t).toBe(true);
    expect(markersOfA.length).toBeGreaterThan(3);
    expect(aimed.length).toBeGreaterThan(60);
  });

  for (const route of aimed) {
    const params = [...route.path.matchAll(/:(\w+)/g)].map((m) => m[1]!);
    const namesA = params.some((p) => !OWN_KEYS.has(p));
    it(`${route.method.toUpperCase()} ${route.path}: B's roles at A's ${namesA ? 'objects → 404 or 400' : 'ids in the body → nothing of A'}`, async () => {
      const before = await fingerprintOfA();
      const pathAtA = fc.tuple(...params.map((p) => (OWN_KEYS.has(p) ? fc.constant('1') : fc.constantFrom(...(p === 'number' ? ['1', '2'] : idsFor(tableOf(route.path, p)))))));
      for (const role of ROLES) {
        if (!(route.access === 'signed-in' || (isPermission(route.access) && can(role, route.access)))) continue; // 403 for it: the role matrix's
        const s = sessionsOfB[role];
        await fc.assert(
          fc.asyncProperty(bodyAtA, params.length ? pathAtA : fc.constant([] as string[]), async (payload, values) => {
            let i = 0;
            const url = route.path.replace(/:(\w+)/g, () => values[i++]!);
            const req = (s.agent as unknown as Record<string, (u: string) => request.Test>)[route.method]!(url);
            if (route.method !== 'get') req.set('x-csrf-token', s.csrf).set('content-type', 'application/json').send(JSON.stringify(payload));
            const res = await req;
            const label = `${role} of B: ${route.method} ${url} ${route.method === 'get' ? '' : JSON.stringify(payload).slice(0, 200)} → ${res.status} ${res.text.slice(0, 300)}`;
            // 400 where the input is refused before any object is looked up (a path value of the wrong shape where A
            // holds no row of that kind), else 404: never 403, never 2xx.
            if (namesA) expect([400, 404], label).toContain(res.status);
            else {
              expect(res.status, label).toBeLessThan(500);
              expect([401, 403], label).not.toContain(res.status);
            }
            for (const m of markersOfA) expect(res.text, label).not.toContain(m);
          }),
          { numRuns: namesA ? 4 : 6, seed: 20261208 },
        );
      }
      expect(await fingerprintOfA(), `${route.path} changed A's rows`).toBe(before);
    });
  }

  it("no row of any workshop references another workshop's row", async () => {
    expect(await crossWorkshopReferences(ownerDb)).toEqual([]);
  });
});
