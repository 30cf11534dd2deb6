/**
 * Planning through the API: jobs from accepted quotes, booking at the earliest start within the drying room's
 * capacity, forced dates with their overbooking, cancelling, progress with a slip, actuals against estimates and the
 * material forecast. Jobs here are booked from dates far ahead so the demo workshop's own jobs stay out of the way.
 */
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import sharp from 'sharp';
import { fromMinutes, toMinutes } from '../../shared/calc';
import { afterAll, beforeAll, describe, expect, it, onTestFinished, vi } from 'vitest';
import type { BookingPreview, JobDetail, MaterialForecast, PlanningBoard, SessionDoneResult, ActualsReport } from '../../shared/schemas/planning';
import { AuditEntry, FinishingSystem, Job } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let planner: Session;
let estimator: Session;
let sales: Session;
let capacity = 0;

afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
const patch = (s: Session, url: string, body: object) => s.agent.patch(url).set('x-csrf-token', s.csrf).send(body);
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

/** A Monday far ahead of the demo's jobs, and another for the concurrency check. */
const BASE = '2028-03-06';
const LATER = '2029-01-08';

let made = 0;
/** An estimate priced, quoted, sent and accepted by the customer through the link: the real path. */
async function acceptedQuote(): Promise<number> {
  made++;
  const c = await post(sales, '/api/customers', { name: `Planning customer ${made}`, email: `planning.customer.${made}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: `Rosewood grand ${made}` }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1];
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: `Planning customer ${made}`, acceptTerms: true }).expect(200);
  return q.body.id as number;
}

async function newJob(bays?: number): Promise<JobDetail> {
  const quoteId = await acceptedQuote();
  const res = await post(planner, '/api/jobs', bays ? { quoteId, bays } : { quoteId });
  expect(res.status).toBe(201);
  return res.body as JobDetail;
}

async function book(s: Session, id: number, body: object): Promise<JobDetail> {
  const res = await post(s, `/api/jobs/${id}/booking`, body);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as JobDetail;
}

const overlaps = (a: JobDetail, b: JobDetail) => a.roomStart! < b.roomEnd! && b.roomStart! < a.roomEnd!;

beforeAll(async () => {
  services = await startServices();
  [owner, planner, estimator, sales] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'workshop'), signInAs(app, 'estimator'), signInAs(app, 'sales')]);
  const board = await planner.agent.get('/api/planning/board').expect(200);
  capacity = (board.body as PlanningBoard).room.capacity;
});

describe('the demo board', () => {
  // Other test files may cancel demo jobs (the fuzzing walks every route): only what they cannot undo is checked.
  it('has polishers, a job with sessions done and two finished jobs with actual hours', async () => {
    const board = (await planner.agent.get('/api/planning/board').expect(200)).body as PlanningBoard;
    expect(board.days).toHaveLength(56);
    expect(board.days[0]!.date).toBe(board.from);
    const polishers = (await planner.agent.get('/api/polishers').expect(200)).body as unknown[];
    expect(polishers.length).toBeGreaterThanOrEqual(3);
    const all = (await planner.agent.get('/api/jobs').expect(200)).body as JobDetail[];
    const started = all.find((j) => j.title === 'Burr walnut baby grand');
    expect(started?.sessionsDone).toBeGreaterThanOrEqual(2);
    const finished = all.filter((j) => j.state === 'finished' && ['Boudoir grand in figured rosewood', 'Mahogany square piano with satinwood banding'].includes(j.title));
    expect(finished).toHaveLength(2);
    expect(finished.every((j) => j.actualHours > 0 && j.sessionsDone === j.sessionsTotal)).toBe(true);
  });
});

describe('jobs from accepted quotes', () => {
  it('takes the quoted revision\u2019s sessions and rests, once per quote', async () => {
    const quoteId = await acceptedQuote();
    const res = await post(planner, '/api/jobs', { quoteId });
    expect(res.status).toBe(201);
    const job = res.body as JobDetail;
    expect(job).toMatchObject({ state: 'unbooked', bays: 1, roomStart: null });
    const quote = await sales.agent.get(`/api/quotes/${quoteId}`).expect(200);
    const revision = await estimator.agent.get(`/api/estimates/${quote.body.estimate.id}/revisions/${quote.body.estimate.revision}`).expect(200);
    const sessions = revision.body.result.calendar.sessions as { stage: string; handsOnHours: number; restHours: number }[];
    expect(job.sessions).toHaveLength(sessions.length);
    job.sessions.forEach((s, i) => {
      expect(s.stage).toBe(sessions[i]!.stage);
      expect(s.handsOnHours).toBeCloseTo(sessions[i]!.handsOnHours, 1);
      expect(s.restHours).toBeCloseTo(sessions[i]!.restHours, 1);
    });
    // The largest face of the grand (its lid) is the rack area it would take in area mode.
    expect(job.areaM2).toBeGreaterThan(1);
    const again = await post(planner, '/api/jobs', { quoteId });
    expect(again.status).toBe(409);
    expect(JSON.parse(again.text).code).toBe('job_exists');
    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });

  it('refuses a quote that is not accepted, and says which field is wrong', async () => {
    const c = await post(sales, '/api/customers', { name: 'Not yet', email: 'planning.notyet@example.com' }).expect(201);
    const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: 'Grand' }).expect(201);
    const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
    await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
    const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
    const res = await post(planner, '/api/jobs', { quoteId: q.body.id });
    expect(res.status).toBe(409);
    expect(JSON.parse(res.text).code).toBe('quote_not_accepted');
    const bad = await post(planner, '/api/jobs', { quoteId: 'x' });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text).field).toBe('quoteId');
  });
});

describe('booking', () => {
  let filler: JobDetail;
  let waiting: JobDetail;
  let forced: JobDetail;

  it('at the earliest start respects the room: with every bay taken, the next job starts once one frees', async () => {
    filler = await newJob(capacity);
    filler = await book(planner, filler.id, { mode: 'earliest', notBefore: BASE });
    expect(filler.state).toBe('booked');
    expect(filler.roomStart).toBe(`${BASE}T08:00`);
    expect(filler.whyNotSooner).toEqual([]);

    waiting = await newJob();
    const preview = (await post(planner, `/api/jobs/${waiting.id}/booking/preview`, { mode: 'earliest', notBefore: BASE }).expect(200)).body as BookingPreview;
    expect(preview.roomStart >= filler.roomEnd!).toBe(true);
    expect(preview.overbooked).toBe(false);
    const full = preview.whyNotSooner.find((w) => w.code === 'room-full');
    expect(full?.from).toBe(BASE);
    expect(full?.text).toMatch(new RegExp(`drying room full \\(${capacity} of ${capacity} bays\\)`));
    // A preview writes nothing.
    expect((await planner.agent.get(`/api/jobs/${waiting.id}`).expect(200)).body.state).toBe('unbooked');

    waiting = await book(planner, waiting.id, { mode: 'earliest', notBefore: BASE });
    expect(waiting.roomStart).toBe(preview.roomStart);
    expect(waiting.whyNotSooner.some((w) => w.code === 'room-full')).toBe(true);
    expect(overlaps(filler, waiting)).toBe(false);

    const board = (await planner.agent.get(`/api/planning/board?from=${BASE}&weeks=16`).expect(200)).body as PlanningBoard;
    expect(board.days.every((d) => d.room.peak <= d.room.capacity)).toBe(true);
    expect(board.days[0]!.room.peak).toBe(capacity);
  });

  it('at a chosen date shows the overbooking first, and forces it only when confirmed', async () => {
    forced = await newJob();
    const preview = (await post(planner, `/api/jobs/${forced.id}/booking/preview`, { mode: 'date', start: BASE }).expect(200)).body as BookingPreview;
    expect(preview.overbooked).toBe(true);
    expect(preview.overbooking.room[0]).toMatchObject({ date: BASE, peak: capacity + 1, capacity, over: 1 });

    const refused = await post(planner, `/api/jobs/${forced.id}/booking`, { mode: 'date', start: BASE });
    expect(refused.status).toBe(409);
    const problem = JSON.parse(refused.text);
    expect(problem.code).toBe('overbooking_unconfirmed');
    expect(problem.detail).toContain(`${BASE}: drying room ${capacity + 1} of ${capacity} bays`);
    expect((await planner.agent.get(`/api/jobs/${forced.id}`).expect(200)).body.state).toBe('unbooked');

    forced = await book(planner, forced.id, { mode: 'date', start: BASE, confirm: true });
    expect(forced).toMatchObject({ state: 'booked', forced: true, startMode: 'date', roomStart: `${BASE}T08:00` });
    expect(forced.overbooking?.room.length).toBeGreaterThan(0);
    const entry = await AuditEntry.findOne({ where: { action: 'job.book', entityId: String(forced.id) } });
    expect(entry?.after).toMatchObject({ forced: true });

    const board = (await planner.agent.get(`/api/planning/board?from=${BASE}&weeks=1`).expect(200)).body as PlanningBoard;
    expect(board.days[0]).toMatchObject({ overbooked: true, room: { peak: capacity + 1, over: true } });
  });

  it('refuses a chosen date in the past', async () => {
    const job = await newJob();
    const res = await post(planner, `/api/jobs/${job.id}/booking/preview`, { mode: 'date', start: '2020-01-06' });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).field).toBe('start');
    const missing = await post(planner, `/api/jobs/${job.id}/booking/preview`, { mode: 'date' });
    expect(JSON.parse(missing.text).field).toBe('start');
    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });

  it('cancelling frees the place: the waiting job can then move forward', async () => {
    const cancelled = (await post(planner, `/api/jobs/${filler.id}/cancel`, {}).expect(200)).body as JobDetail;
    expect(cancelled.state).toBe('cancelled');
    const preview = (await post(planner, `/api/jobs/${waiting.id}/booking/preview`, { mode: 'earliest', notBefore: BASE }).expect(200)).body as BookingPreview;
    expect(preview.roomStart < waiting.roomStart!).toBe(true);
    expect(preview.roomStart.slice(0, 10)).toBe(BASE);
    expect(preview.whyNotSooner.some((w) => w.code === 'room-full')).toBe(false);
    const moved = await book(planner, waiting.id, { mode: 'earliest', notBefore: BASE });
    expect(moved.roomStart).toBe(preview.roomStart);
    expect(await AuditEntry.count({ where: { action: 'job.move', entityId: String(waiting.id) } })).toBe(1);
    waiting = moved;
  });

  it('two bookings at once never both take the last places', async () => {
    const [a, b] = await Promise.all([newJob(capacity - 1), newJob(2)]);
    const [ra, rb] = await Promise.all([
      post(planner, `/api/jobs/${a.id}/booking`, { mode: 'earliest', notBefore: LATER }),
      post(owner, `/api/jobs/${b.id}/booking`, { mode: 'earliest', notBefore: LATER }),
    ]);
    expect(ra.status).toBe(200);
    expect(rb.status).toBe(200);
    expect(overlaps(ra.body as JobDetail, rb.body as JobDetail)).toBe(false);
    const board = (await planner.agent.get(`/api/planning/board?from=${LATER}&weeks=16`).expect(200)).body as PlanningBoard;
    expect(board.days.every((d) => !d.room.over)).toBe(true);
  });

  it('refuses a finish time in the future, naming the field, and changes nothing', async () => {
    const first = waiting.sessions[0]!;
    // The job is booked years ahead: its planned end has not come yet.
    const res = await post(estimator, `/api/jobs/${waiting.id}/sessions/${first.id}/done`, { actualEnd: first.end, actualHours: 2, temperatureC: 20, humidityPct: 50, notes: 'Too soon.' });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'finish_in_future', field: 'actualEnd' });
    const job = (await planner.agent.get(`/api/jobs/${waiting.id}`).expect(200)).body as JobDetail;
    expect(job.sessions[0]!.done).toBe(false);
    // An impossible date is a 400 too, never a date rolled over to another day.
    const impossible = await post(estimator, `/api/jobs/${waiting.id}/sessions/${first.id}/done`, { actualEnd: '2026-02-30T10:00', actualHours: 2, temperatureC: 20, humidityPct: 50, notes: 'x' });
    expect(impossible.status).toBe(400);
    expect(JSON.parse(impossible.text).field).toBe('actualEnd');
  });

  describe('progress', () => {
    // The jobs here are booked years ahead; the clock is moved past them so that their sessions can be done.
    // Only Date is faked (timers run as usual); sessions are signed in again under the moved clock.
    beforeAll(async () => {
      vi.useFakeTimers({ toFake: ['Date'] });
      vi.setSystemTime(new Date('2031-01-06T12:00:00'));
      [estimator, owner] = await Promise.all([signInAs(app, 'estimator'), signInAs(app, 'owner')]);
    });
    afterAll(() => {
      vi.useRealTimers();
    });

    it('marks sessions done in order, with notes required', async () => {
      const first = waiting.sessions[0]!;
      const second = waiting.sessions[1]!;
      const early = await post(estimator, `/api/jobs/${waiting.id}/sessions/${second.id}/done`, { actualEnd: second.end, actualHours: 2, temperatureC: 20, humidityPct: 50, notes: 'x' });
      expect(early.status).toBe(409);
      expect(JSON.parse(early.text).code).toBe('earlier_session_open');
      const noNotes = await post(estimator, `/api/jobs/${waiting.id}/sessions/${first.id}/done`, { actualEnd: first.end, actualHours: 2, temperatureC: 20, humidityPct: 50, notes: ' ' });
      expect(noNotes.status).toBe(400);
      expect(JSON.parse(noNotes.text).field).toBe('notes');
    });

    it('a session finished late moves the rest of the job', async () => {
      const first = waiting.sessions[0]!;
      const second = waiting.sessions[1]!;
      // Finished a working day late.
      const late = fromMinutes(toMinutes(first.end!) + 24 * 60);
      const res = await post(estimator, `/api/jobs/${waiting.id}/sessions/${first.id}/done`, { actualEnd: late, actualHours: first.handsOnHours + 3, temperatureC: 16.5, humidityPct: 68, notes: 'Cold morning; the stripper worked slowly.' });
      expect(res.status, res.text).toBe(200);
      const { job, shift } = res.body as SessionDoneResult;
      expect(shift?.slipMin).toBe(24 * 60);
      expect(shift?.moved).toBeGreaterThan(0);
      expect(job.state).toBe('in-progress');
      expect(job.sessions[0]).toMatchObject({ done: true, actualEnd: late, temperatureC: 16.5, humidityPct: 68 });
      const next = job.sessions[1]!;
      expect(next.start! > second.start!).toBe(true);
      expect(next.start! >= job.sessions[0]!.restUntil!).toBe(true);
      // A slip never ends the job sooner; a later rest or a weekend may absorb it (the calendar is monotonic).
      expect(job.roomEnd! >= waiting.roomEnd!).toBe(true);
      // The plan as first booked is kept for planned against actual.
      expect(next.baselineStart).toBe(second.start);
      const stage = job.stages.find((s) => s.stage === first.stage)!;
      expect(stage.actualHours).toBeCloseTo(first.handsOnHours + 3, 2);
      waiting = job;
    });

    it('actual hours against estimates: a suggestion, applied only when the owner confirms, and audited', async () => {
      // Finish the job: every bodying session takes half as long again as estimated.
      for (const s of waiting.sessions.slice(1)) {
        const hours = s.stageKind === 'body' ? Math.round(s.handsOnHours * 150) / 100 : s.handsOnHours;
        const res = await post(estimator, `/api/jobs/${waiting.id}/sessions/${s.id}/done`, { actualEnd: s.end, actualHours: hours, temperatureC: 20, humidityPct: 50, notes: 'Done.' });
        expect(res.status, res.text).toBe(200);
        waiting = (res.body as SessionDoneResult).job;
      }
      expect(waiting.state).toBe('finished');

      const report = (await owner.agent.get('/api/planning/actuals').expect(200)).body as ActualsReport;
      expect(report.finishedJobs.map((j) => j.id)).toContain(waiting.id);
      const body = report.kinds.find((k) => k.kind === 'body')!;
      expect(body.ratio).toBeCloseTo(body.actualHours / body.estimatedHours, 3);
      expect(body.ratio!).toBeGreaterThan(1);
      const system = (await FinishingSystem.findOne({ where: { key: 'full-repolish' } }))!;
      const current = system.stages.find((s) => s.key === 'body')!.labourMinPerM2PerCoat;
      const suggestion = report.suggestions.find((s) => s.systemId === system.id && s.stageKey === 'body')!;
      // Nothing corrected yet: the suggestion rests on the finished jobs estimated with this finishing system only,
      // at their own ratio.
      expect(suggestion).toMatchObject({ current, kind: 'body' });
      expect(suggestion.jobIds).toContain(waiting.id);
      expect(suggestion.jobs).toBeLessThanOrEqual(body.jobs);
      expect(suggestion.ratio).toBeCloseTo(suggestion.actualHours / suggestion.estimatedHours, 3);
      const systemsOf = await sequelize.query<{ system: string }>(
        `SELECT DISTINCT r.result->>'system' AS system FROM jobs j JOIN estimate_revisions r ON r.id = j.revision_id WHERE j.id IN (:ids)`,
        { replacements: { ids: suggestion.jobIds }, type: QueryTypes.SELECT },
      );
      expect(systemsOf.map((x) => x.system)).toEqual(['full-repolish']);
      expect(suggestion.suggested).toBeCloseTo(Math.round(current * suggestion.ratio * 10) / 10, 1);

      // Reading the report changes nothing.
      await system.reload();
      expect(system.stages.find((s) => s.key === 'body')!.labourMinPerM2PerCoat).toBe(current);

      const applied = await post(owner, '/api/planning/actuals/apply', { items: [{ systemId: system.id, stageKey: 'body' }] });
      expect(applied.status, applied.text).toBe(200);
      expect(applied.body.applied).toEqual([{ systemId: system.id, stageKey: 'body', before: current, after: suggestion.suggested }]);
      await system.reload();
      expect(system.stages.find((s) => s.key === 'body')!.labourMinPerM2PerCoat).toBe(suggestion.suggested);
      const entry = await AuditEntry.findOne({ where: { action: 'finishing-system.calibrate', entityId: String(system.id) }, order: [['id', 'DESC']] });
      expect(entry?.before).toMatchObject({ labourMinPerM2PerCoat: { body: current } });
      expect(entry?.after).toMatchObject({ labourMinPerM2PerCoat: { body: suggestion.suggested } });

      // Once applied, the same jobs do not suggest it again: corrections never compound.
      const after = (await owner.agent.get('/api/planning/actuals').expect(200)).body as ActualsReport;
      expect(after.suggestions.find((s) => s.systemId === system.id && s.stageKey === 'body')).toBeUndefined();
      expect(after.kinds.find((k) => k.kind === 'body')?.ratio).toBe(body.ratio);
      const stale = await post(owner, '/api/planning/actuals/apply', { items: [{ systemId: system.id, stageKey: 'no-such-stage' }] });
      expect(stale.status).toBe(409);
    });
  });
});

describe('material forecast', () => {
  it('totals match the booked jobs\u2019 quoted materials, against stock, in packs', async () => {
    let job = await newJob();
    job = await book(planner, job.id, { mode: 'earliest' });
    const quote = await sales.agent.get(`/api/quotes/${job.quote.id}`).expect(200);
    const revision = await estimator.agent.get(`/api/estimates/${quote.body.estimate.id}/revisions/${quote.body.estimate.revision}`).expect(200);
    const quoted = revision.body.result.materials as { key: string; need: number }[];

    const forecast = (await planner.agent.get('/api/planning/forecast?weeks=26').expect(200)).body as MaterialForecast;
    const mine = forecast.jobs.find((j) => j.id === job.id)!;
    expect(mine.sessions).toBe(job.sessions.length);
    for (const m of quoted) expect(mine.materials[m.key]).toBeCloseTo(m.need, 0);
    for (const row of forecast.rows) {
      const fromJobs = forecast.jobs.reduce((t, j) => t + (j.materials[row.key] ?? 0), 0);
      expect(row.need).toBeCloseTo(fromJobs, 1);
      expect(row.byWeek.reduce((t, v) => t + v, 0)).toBeCloseTo(row.need, 1);
    }

    // Stock on hand the owner enters reduces what is to buy; the packs cover the rest.
    const flakes = forecast.rows.find((r) => r.key === 'shellac-flakes')!;
    await put(owner, `/api/planning/stock/${flakes.materialId}`, { quantity: 250 }).expect(200);
    expect((await put(planner, `/api/planning/stock/${flakes.materialId}`, { quantity: 1 })).status).toBe(403);
    const after = (await owner.agent.get('/api/planning/forecast?weeks=26').expect(200)).body as MaterialForecast;
    const row = after.rows.find((r) => r.key === 'shellac-flakes')!;
    expect(row.stock).toBe(250);
    expect(row.short).toBeCloseTo(Math.max(0, row.need - 250), 2);
    expect(row.packs.reduce((t, p) => t + p.size * p.count, 0)).toBeGreaterThanOrEqual(row.short);
    expect(Number(row.cost)).toBeGreaterThan(0);
    expect(Number(after.total)).toBeCloseTo(after.rows.reduce((t, r) => t + Number(r.cost), 0), 2);
    expect(await AuditEntry.count({ where: { action: 'stock.update', entityId: String(flakes.materialId) } })).toBeGreaterThan(0);
  });
});

describe('polishers', () => {
  it('the planner adds one and gives them days off', async () => {
    const res = await post(planner, '/api/polishers', { name: 'Orrin Castlemaine', hoursPerDay: 6, daysOff: ['2027-02-01'] });
    expect(res.status).toBe(201);
    const changed = await patch(planner, `/api/polishers/${res.body.id}`, { daysOff: ['2027-02-01', '2027-02-02'], active: false });
    expect(changed.body).toMatchObject({ active: false, daysOff: ['2027-02-01', '2027-02-02'] });
    const bad = await post(planner, '/api/polishers', { name: 'Too many hours', hoursPerDay: 30 });
    expect(JSON.parse(bad.text).field).toBe('hoursPerDay');
    expect(await Job.count()).toBeGreaterThan(0);
  });
});

describe('the polisher at the bench', () => {
  it('marks a session done with the materials used and a problem, and adds a camera photo to the piece', async () => {
    const job = await book(planner, (await newJob()).id, { mode: 'earliest', notBefore: '2029-09-03' });
    const first = job.sessions[0]!;
    // A session is marked done once it has finished: the clock moves past the booking (Date only), and the people
    // sign in again under it.
    vi.useFakeTimers({ toFake: ['Date'] });
    onTestFinished(() => {
      vi.useRealTimers();
    });
    vi.setSystemTime(new Date('2031-06-02T12:00:00'));
    [planner, sales] = await Promise.all([signInAs(app, 'workshop'), signInAs(app, 'sales')]);
    const done = await post(planner, `/api/jobs/${job.id}/sessions/${first.id}/done`, {
      actualEnd: first.end,
      actualHours: first.handsOnHours,
      temperatureC: 19,
      humidityPct: 78,
      notes: 'Stripped the lid and the rim.',
      materialsUsed: '2 L of stripper, a roll of wadding',
      problem: 'Blush on the lid after the damp morning.',
    });
    expect(done.status, done.text).toBe(200);
    const read = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    expect(read.sessions[0]).toMatchObject({ done: true, materialsUsed: '2 L of stripper, a roll of wadding', problem: 'Blush on the lid after the damp morning.' });
    // A session without a problem keeps none.
    const second = read.sessions[1]!;
    await post(planner, `/api/jobs/${job.id}/sessions/${second.id}/done`, { actualEnd: second.end, actualHours: 1, temperatureC: 20, humidityPct: 50, notes: 'Fine.' }).expect(200);
    expect(((await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail).sessions[1]).toMatchObject({ problem: null, materialsUsed: null });
    const tooLong = await post(planner, `/api/jobs/${job.id}/sessions/${read.sessions[2]!.id}/done`, { actualEnd: read.sessions[2]!.end, actualHours: 1, temperatureC: 20, humidityPct: 50, notes: 'x', problem: 'p'.repeat(2001) });
    expect(JSON.parse(tooLong.text)).toMatchObject({ status: 400, field: 'problem' });

    // The workshop's photo from the phone joins the photos of the job's piece.
    const png = await sharp({ create: { width: 40, height: 30, channels: 3, background: '#7a4a2a' } }).png().toBuffer();
    const photo = await planner.agent.post(`/api/jobs/${job.id}/photos`).set('x-csrf-token', planner.csrf).attach('photos', png, 'lid.png').field('captions', `${job.number}, session 1`);
    expect(photo.status, photo.text).toBe(201);
    const estimate = await planner.agent.get(`/api/estimates/${job.estimate.id}`).expect(200);
    const piece = await planner.agent.get(`/api/pieces/${estimate.body.piece.id}`).expect(200);
    expect(piece.body.photos.map((p: { caption: string }) => p.caption)).toContain(`${job.number}, session 1`);
    // Sales do not work at the bench.
    expect((await sales.agent.post(`/api/jobs/${job.id}/photos`).set('x-csrf-token', sales.csrf).attach('photos', png, 'lid.png')).status).toBe(403);
  });
});
