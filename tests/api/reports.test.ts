/**
 * The owner's reports through the API, against hand-worked fixtures: quotes of this file's own placed in a quiet
 * month long past (no other quotes live there), and a job of its own booked in a week far ahead, read before and
 * after it is booked. Both reports and their CSV exports are the owner's only.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobDetail } from '../../shared/schemas/planning';
import type { CapacityReport, QuotesReport } from '../../shared/schemas/reports';
import { today } from '../../shared/time';
import { Quote } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app } = getTestApp();
let owner: Session;
let planner: Session;
let estimator: Session;
let sales: Session;

let services: Awaited<ReturnType<typeof startServices>>;

afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

let made = 0;
async function draftQuote(): Promise<number> {
  made++;
  const c = await post(sales, '/api/customers', { name: `Report customer ${process.pid} ${made}`, email: `report.${made}.${process.pid}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: `Grand ${made}` }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  return q.body.id as number;
}

/** Sends the quote and accepts it by its link, as the customer does: an agreement with its accepted total and deposit. */
async function agreeQuote(id: number): Promise<void> {
  const sent = await post(sales, `/api/quotes/${id}/send`, {}).expect(200);
  await request(app).post(`/api/public/quotes/${String(sent.body.link).split('/q/')[1]}/accept`).send({ name: 'Report customer', acceptTerms: true }).expect(200);
}

/** Pays the accepted quote's deposit by a bank transfer recorded by hand, which moves it to "deposit paid". */
async function payDeposit(id: number): Promise<void> {
  const q = await Quote.findByPk(id);
  await post(sales, `/api/accounts/quotes/${id}/payments`, { method: 'bank-transfer', amount: Number(q!.acceptedDeposit).toFixed(2), receivedOn: today(), reference: 'Report deposit' }).expect(201);
  expect((await Quote.findByPk(id))!.state).toBe('deposit-paid');
}

beforeAll(async () => {
  services = await startServices();
  [owner, planner, estimator, sales] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'workshop'), signInAs(app, 'estimator'), signInAs(app, 'sales')]);
});

describe('the quotes report', () => {
  it('counts by month, converts and times the answers as worked by hand', async () => {
    // A quiet quarter long past, one year a run (process ids differ), so no other quotes fall in it.
    const year = 2001 + (process.pid % 8);
    const at = (md: string, time = '10:00') => new Date(`${year}-${md}T${time}:00Z`);
    const ids = [await draftQuote(), await draftQuote(), await draftQuote(), await draftQuote()];
    // The agreements are made by the real path (accepted by link, the deposit recorded), then moved back in time.
    await agreeQuote(ids[0]!);
    await agreeQuote(ids[3]!);
    await payDeposit(ids[3]!);
    // 1: sent 10 Jan, opened 11 Jan, accepted 14 Jan (4 days).
    await Quote.update({ sentAt: at('01-10'), viewedAt: at('01-11'), acceptedAt: at('01-14'), validUntil: `${year}-02-10` }, { where: { id: ids[0] } });
    // 2: sent 20 Jan, opened 2 Feb, declined 3 Feb (14 days).
    await Quote.update({ state: 'declined', sentAt: at('01-20'), viewedAt: at('02-02'), declinedAt: at('02-03'), validUntil: `${year}-02-20` }, { where: { id: ids[1] } });
    // 3: sent 5 Feb, never answered, valid until 7 Mar: expired in March.
    await Quote.update({ state: 'expired', sentAt: at('02-05'), validUntil: `${year}-03-07` }, { where: { id: ids[2] } });
    // 4: sent 10 Feb 10:00, accepted 11 Feb 22:00 (1.5 days), deposit paid since.
    await Quote.update({ sentAt: at('02-10'), viewedAt: null, acceptedAt: at('02-11', '22:00'), validUntil: `${year}-03-10` }, { where: { id: ids[3] } });

    const res = await owner.agent.get(`/api/reports/quotes?from=${year}-01-01&to=${year}-03-31`).expect(200);
    const r = res.body as QuotesReport;
    expect(r.months).toEqual([
      { month: `${year}-01`, sent: 2, opened: 1, accepted: 1, declined: 0, expired: 0 },
      { month: `${year}-02`, sent: 2, opened: 1, accepted: 1, declined: 1, expired: 0 },
      { month: `${year}-03`, sent: 0, opened: 0, accepted: 0, declined: 0, expired: 1 },
    ]);
    expect(r.totals).toEqual({ sent: 4, opened: 2, accepted: 2, declined: 1, expired: 1 });
    // 2 of the 4 sent were accepted.
    expect(r.conversionPct).toBe(50);
    // Answers after 4, 14 and 1.5 days: median 4, mean 19.5 / 3 = 6.5.
    expect(r.decide).toEqual({ answered: 3, medianDays: 4, meanDays: 6.5 });

    const csv = await owner.agent.get(`/api/reports/quotes.csv?from=${year}-01-01&to=${year}-03-31`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.headers['content-disposition']).toContain(`quotes-${year}-01-01-${year}-03-31.csv`);
    expect(csv.text.replace(/^\ufeff/, '').split('\r\n').slice(0, 3)).toEqual([
      '"Month","Sent","Opened","Accepted","Declined","Expired"',
      `"${year}-01","2","1","1","0","0"`,
      `"${year}-02","2","1","1","1","0"`,
    ]);
  });

  it('says which end of the period is wrong, and is the owner\u2019s only', async () => {
    const back = await owner.agent.get('/api/reports/quotes?from=2026-03-01&to=2026-02-01');
    expect(back.status).toBe(400);
    expect(back.body.field).toBe('to');
    const bad = await owner.agent.get('/api/reports/capacity?from=2026-02-30&to=2026-03-01');
    expect(bad.status).toBe(400);
    expect(bad.body.field).toBe('from');
    const long = await owner.agent.get('/api/reports/capacity?from=2020-01-01&to=2026-01-01');
    expect(long.status).toBe(400);
    for (const s of [planner, estimator, sales]) {
      expect((await s.agent.get('/api/reports/quotes?from=2026-01-01&to=2026-01-31')).status).toBe(403);
      expect((await s.agent.get('/api/reports/capacity.csv?from=2026-01-01&to=2026-01-31')).status).toBe(403);
    }
  });
});

describe('the capacity report', () => {
  function addDays(date: string, n: number): string {
    const d = new Date(`${date}T12:00:00Z`);
    d.setUTCDate(d.getUTCDate() + n);
    return d.toISOString().slice(0, 10);
  }
  const dayNo = (date: string) => Math.floor(Date.parse(`${date}T00:00:00Z`) / 86_400_000);

  it('adds a booked job\u2019s bay-days and hands-on hours to its weeks', async () => {
    const c = await owner.agent.get('/api/reports/capacity?from=2026-01-05&to=2026-01-11').expect(200);
    const today = (c.body as CapacityReport).today;
    const wd = (new Date(`${today}T12:00:00Z`).getUTCDay() + 6) % 7;
    // A Monday 44 weeks ahead: clear of the demo's jobs and of the other files' dates.
    const monday = addDays(addDays(today, -wd), 44 * 7);
    const to = addDays(monday, 5 * 7 - 1);
    const url = `/api/reports/capacity?from=${monday}&to=${to}`;
    const before = (await owner.agent.get(url).expect(200)).body as CapacityReport;
    expect(before.weeks).toHaveLength(5);
    expect(before.weeks.map((w) => w.week)).toEqual([0, 1, 2, 3, 4].map((i) => addDays(monday, i * 7)));
    expect(before.weeksBehind).toBe(0);
    expect(before.weeksAhead).toBe(5);

    const quoteId = await draftQuote();
    const sent = await post(sales, `/api/quotes/${quoteId}/send`, {}).expect(200);
    const token = String(sent.body.link).split('/q/')[1];
    await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Report customer', acceptTerms: true }).expect(200);
    const created = await post(planner, '/api/jobs', { quoteId });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const booked = await post(planner, `/api/jobs/${created.body.id}/booking`, { mode: 'date', start: monday, confirm: true });
    expect(booked.status, JSON.stringify(booked.body)).toBe(200);
    const job = booked.body as JobDetail;
    const after = (await owner.agent.get(url).expect(200)).body as CapacityReport;

    // The room: one bay on every day its stay touches (from its first day to the day it leaves).
    const first = Math.max(dayNo(job.roomStart!.slice(0, 10)), dayNo(monday));
    const lastTouched = dayNo(job.roomEnd!.slice(0, 10)) - (job.roomEnd!.endsWith('T00:00') ? 1 : 0);
    const roomIn = Math.min(lastTouched, dayNo(to)) - first + 1;
    const added = after.weeks.reduce((t, w) => t + w.roomBooked, 0) - before.weeks.reduce((t, w) => t + w.roomBooked, 0);
    expect(added).toBeCloseTo(roomIn * job.bays, 1);
    // Polishers: the sessions' hands-on hours that fall in the five weeks.
    const min = (t: string) => Date.parse(`${t}:00Z`) / 60_000;
    const windowEnd = min(`${addDays(to, 1)}T00:00`);
    const hours = job.sessions.flatMap((s) => s.segments).reduce((t, g) => t + Math.max(0, Math.min(min(g.end), windowEnd) - min(g.start)), 0) / 60;
    const addedHours = after.weeks.reduce((t, w) => t + w.polisherHoursBooked, 0) - before.weeks.reduce((t, w) => t + w.polisherHoursBooked, 0);
    expect(addedHours).toBeCloseTo(hours, 0);
    expect(after.weeks.every((w) => w.roomAvailable === before.weeks[0]!.roomAvailable)).toBe(true);

    const past = (await owner.agent.get(`/api/reports/capacity?from=${addDays(today, -21)}&to=${addDays(today, 13)}`).expect(200)).body as CapacityReport;
    expect(past.weeksBehind).toBe(3);
    expect(past.weeks.filter((w) => !w.past)[0]!.week <= today).toBe(true);

    const csv = await owner.agent.get(`/api/reports/capacity.csv?from=${monday}&to=${to}`).expect(200);
    expect(csv.text.replace(/^\ufeff/, '').split('\r\n')[0]).toContain('"Room booked (');
    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });
});
