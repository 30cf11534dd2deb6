/**
 * Hostile input at every write route (taken from the app's route table, so new routes join by themselves):
 * wrong types, huge and negative numbers, NaN, long strings, unicode, SQL and HTML fragments, extra and missing
 * fields, oversize bodies and uploads. Every answer must be below 500; every refusal (4xx) must leave the database
 * exactly as it was, and a validation refusal must name the field.
 */
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, routes, sequelize } = getTestApp();
let owner: Session;
let services: Awaited<ReturnType<typeof startServices>>;
beforeAll(async () => {
  services = await startServices();
  owner = await signInAs(app, 'owner');
});
afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

/** A fingerprint of every table's content, but the session store's (sessions roll on every request). */
async function fingerprint(): Promise<string> {
  const tables = await sequelize.query<{ name: string }>(
    `SELECT table_name::text AS name FROM information_schema.tables
      WHERE table_schema = 'public' AND table_type = 'BASE TABLE' AND table_name NOT IN ('session') ORDER BY table_name`,
    { type: QueryTypes.SELECT },
  );
  const parts = tables.map((t) => `SELECT '${t.name}' AS t, md5(coalesce(string_agg(md5(x::text), '' ORDER BY md5(x::text)), '')) AS h FROM "${t.name}" x`);
  const rows = await sequelize.query<{ t: string; h: string }>(parts.join(' UNION ALL '), { type: QueryTypes.SELECT });
  return rows.map((r) => `${r.t}:${r.h}`).join('|');
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
          const before = await fingerprint();
          const agent = route.access === 'public' ? request(app) : owner.agent;
          const req = (agent as unknown as Record<string, (u: string) => request.Test>)[route.method]!(url);
          if (route.access !== 'public') req.set('x-csrf-token', owner.csrf);
          const res = await req.set('content-type', 'application/json').send(JSON.stringify(payload));
          expect(res.status, `${route.method} ${url} ${JSON.stringify(payload).slice(0, 200)} → ${res.status} ${res.text.slice(0, 300)}`).toBeLessThan(500);
          if (res.status >= 400) {
            expect(await fingerprint()).toBe(before);
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
    expect(row!.file_name).toMatch(/^[0-9a-f]{32}\.png$/);
    const randomBytes = Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 7919) % 256));
    const junk = await owner.agent.post(`/api/pieces/${piece.body.id}/photos`).set('x-csrf-token', owner.csrf).attach('photos', randomBytes, 'noise.webp');
    expect(junk.status).toBe(400);
  });
});
