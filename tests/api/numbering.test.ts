/**
 * Record numbers per workshop: estimates, quotes and jobs each count from 1 in every workshop, on their own, with no
 * number given twice and none skipped, when many are made at once in two workshops side by side.
 */
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { currentYear } from '../../shared/time';
import { createSequelize } from '../../server/db/sequelize';
import { up as numbersPerWorkshop } from '../../server/migrations/2026.12.08T20.00.numbers-per-workshop';
import { closeTestApp, getTestApp, signIn, startServices, testDatabaseUrl, type Session } from '../helpers/app';
import { createOtherWorkshop, OTHER_PASSWORD } from '../helpers/workshops';

const { app, sequelize } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
const shops: { id: number; name: string; owner: Session }[] = [];

beforeAll(async () => {
  services = await startServices();
  for (const name of ['Ashgrove Polishing Rooms', 'Teasel Lane Finishers']) {
    const w = await createOtherWorkshop(sequelize, name);
    shops.push({ id: w.id, name, owner: await signIn(app, w.emails.owner, OTHER_PASSWORD) });
  }
});
afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const input = { piece: { template: 'grand', dimensions: { length: '5 ft 9 in' }, species: 'walnut', veneered: true }, system: 'full-repolish' };

/** The count of a number: EST-2026-0042 → 42 (the format is checked by the caller). */
const countOf = (n: string) => Number(/-(\d+)$/.exec(n)![1]);
/** 1..n after `start`. */
const run = (start: number, n: number) => Array.from({ length: n }, (_, i) => start + i + 1);

let made = 0;
async function estimate(s: Session): Promise<{ id: number; number: string }> {
  made++;
  const c = await post(s, '/api/customers', { name: `Numbering customer ${made}`, email: `numbering.${made}@example.com` }).expect(201);
  const p = await post(s, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: `Walnut grand ${made}` }).expect(201);
  const e = await post(s, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  return { id: e.body.id as number, number: e.body.number as string };
}

async function pricedEstimate(s: Session): Promise<number> {
  const e = await estimate(s);
  await post(s, `/api/estimates/${e.id}/state`, { state: 'priced' }).expect(200);
  return e.id;
}

async function quote(s: Session, estimateId: number): Promise<{ id: number; number: string }> {
  const q = await post(s, `/api/estimates/${estimateId}/quotes`, {}).expect(201);
  return { id: q.body.id as number, number: q.body.number as string };
}

async function acceptedQuote(s: Session): Promise<number> {
  const q = await quote(s, await pricedEstimate(s));
  const sent = await post(s, `/api/quotes/${q.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1];
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Numbering customer', acceptTerms: true }).expect(200);
  return q.id;
}

describe('numbers per workshop', () => {
  it("gives a new workshop's first estimate, quote and job the number 1 in their formats", async () => {
    const w = await createOtherWorkshop(sequelize, 'Foxglove Yard Polishers');
    const s = await signIn(app, w.emails.owner, OTHER_PASSWORD);
    const y = currentYear();
    const e = await estimate(s);
    expect(e.number).toBe(`EST-${y}-0001`);
    await post(s, `/api/estimates/${e.id}/state`, { state: 'priced' }).expect(200);
    const q = await quote(s, e.id);
    expect(q.number).toBe(`Q-${y}-0001`);
    const sent = await post(s, `/api/quotes/${q.id}/send`, {}).expect(200);
    await request(app).post(`/api/public/quotes/${String(sent.body.link).split('/q/')[1]}/accept`).send({ name: 'Numbering customer', acceptTerms: true }).expect(200);
    const job = await post(s, '/api/jobs', { quoteId: q.id }).expect(201);
    expect(job.body.number).toBe(`JOB-${y}-0001`);
  });

  it('counts estimates made at once in two workshops 1..N in each, with no number twice and none skipped', async () => {
    const seen = shops.map(() => 0);
    await fc.assert(
      fc.asyncProperty(fc.tuple(fc.integer({ min: 1, max: 6 }), fc.integer({ min: 1, max: 6 })), async (counts) => {
        const results = await Promise.all(shops.flatMap((w, i) => Array.from({ length: counts[i]! }, () => estimate(w.owner).then((e) => ({ i, e })))));
        shops.forEach((_, i) => {
          const numbers = results.filter((r) => r.i === i).map((r) => r.e.number);
          const start = seen[i]!;
          seen[i]! += counts[i]!;
          for (const n of numbers) expect(n).toMatch(new RegExp(`^EST-${currentYear()}-\\d{4}$`));
          expect(numbers.map(countOf).sort((a, b) => a - b)).toEqual(run(start, counts[i]!));
        });
      }),
      { numRuns: 4, endOnFailure: true },
    );
  });

  it('counts quotes and jobs made at once in two workshops on their own, from their start, without gaps', async () => {
    const per = 4;
    // Each workshop's quotes and jobs so far (the estimates test made none).
    const priced = await Promise.all(shops.map((w) => Promise.all(Array.from({ length: per }, () => pricedEstimate(w.owner)))));
    const quotes = await Promise.all(shops.flatMap((w, i) => priced[i]!.map((id) => quote(w.owner, id).then((q) => ({ i, q })))));
    shops.forEach((_, i) => {
      const numbers = quotes.filter((r) => r.i === i).map((r) => r.q.number);
      for (const n of numbers) expect(n).toMatch(new RegExp(`^Q-${currentYear()}-\\d{4}$`));
      expect(numbers.map(countOf).sort((a, b) => a - b)).toEqual(run(0, per));
    });

    const accepted = await Promise.all(shops.map((w) => Promise.all(Array.from({ length: per }, () => acceptedQuote(w.owner)))));
    const jobs = await Promise.all(
      shops.flatMap((w, i) => accepted[i]!.map((quoteId) => post(w.owner, '/api/jobs', { quoteId }).expect(201).then((r) => ({ i, number: r.body.number as string })))),
    );
    shops.forEach((_, i) => {
      const numbers = jobs.filter((r) => r.i === i).map((r) => r.number);
      for (const n of numbers) expect(n).toMatch(new RegExp(`^JOB-${currentYear()}-\\d{4}$`));
      expect(numbers.map(countOf).sort((a, b) => a - b)).toEqual(run(0, per));
    });
  });

  it('gives a number back when the record is not made (no gap after a refused estimate)', async () => {
    const s = shops[0]!.owner;
    const before = countOf((await estimate(s)).number);
    const c = await post(s, '/api/customers', { name: 'Numbering refused', email: 'numbering.refused@example.com' }).expect(201);
    await post(s, '/api/estimates', { customerId: c.body.id, input: { ...input, system: 'no-such-system' } }).expect(400);
    expect(countOf((await estimate(s)).number)).toBe(before + 1);
  });

  it("starts each workshop's counters, when the migration runs, at the highest number it has issued", async () => {
    const s = shops[1]!.owner;
    const last = countOf((await estimate(s)).number);
    const owner = createSequelize(testDatabaseUrl());
    try {
      // Forget this workshop's counters (as before the migration), then run the migration's step again: it is
      // written so that running it over counters that exist only moves them up.
      await owner.query(`DELETE FROM document_counters WHERE workshop_id = :id AND kind IN ('estimate', 'quote', 'job', 'purchase-order')`, { replacements: { id: shops[1]!.id } });
      await numbersPerWorkshop({ sequelize: owner, queryInterface: owner.getQueryInterface() });
      const [row] = await owner.query<{ last_number: number }>(`SELECT last_number FROM document_counters WHERE workshop_id = :id AND kind = 'estimate'`, {
        replacements: { id: shops[1]!.id },
        type: 'SELECT' as never,
      });
      expect(Number(row!.last_number)).toBe(last);
    } finally {
      await owner.close();
    }
    expect(countOf((await estimate(s)).number)).toBe(last + 1);
  });
});
