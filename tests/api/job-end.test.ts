/**
 * The job's end through the API: collection and return dates and arrangements, the piece's moves by the state table
 * (409 on a refused move), the customer's page in plain words, staff notes, progress photos shared only when staff
 * choose and only through the customer's link, the hand kept on the bodying respected by booking (and overridden),
 * and variations priced by hand or by the engine, approved or declined through their own signed link, counted in the
 * agreed total, the balance and the invoice, and laid on the board as sessions.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Decimal from 'decimal.js';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AccountDto } from '../../shared/schemas/accounts';
import type { JobEndDto, PublicJobDto, PublicVariationDto, VariationDto } from '../../shared/schemas/job-end';
import type { JobDetail } from '../../shared/schemas/planning';
import { AuditEntry, JobEvent } from '../../server/models';
import { onJobEvent, type JobEventRecord } from '../../server/services/job-events';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let planner: Session;
let estimator: Session;
let sales: Session;
const heard: JobEventRecord[] = [];
let unhook: () => void = () => undefined;

beforeAll(async () => {
  services = await startServices();
  [owner, planner, estimator, sales] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'workshop'), signInAs(app, 'estimator'), signInAs(app, 'sales')]);
  unhook = onJobEvent((e) => void heard.push(e));
});

afterAll(async () => {
  unhook();
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };
const binary = (req: request.Test) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

let made = 0;
/** A quote sent and accepted by the customer through the link, made a job. */
async function acceptedJob(): Promise<{ job: JobDetail; token: string; quoteId: number }> {
  made++;
  const tag = `${process.pid}-${made}`;
  const c = await post(sales, '/api/customers', { name: `Job end customer ${made}`, email: `job.end.${tag}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: `Rosewood grand ${made}` }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1]!;
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: `Job end customer ${made}`, acceptTerms: true }).expect(200);
  const job = await post(planner, '/api/jobs', { quoteId: q.body.id }).expect(201);
  return { job: job.body as JobDetail, token, quoteId: q.body.id as number };
}

const end = async (id: number): Promise<JobEndDto> => (await planner.agent.get(`/api/jobs/${id}/end`).expect(200)).body;

describe('collection, return and where the piece is', () => {
  it('keeps dates and arrangements, moves the piece by the table, and tells the customer in plain words', async () => {
    const { job, token } = await acceptedJob();
    expect((await end(job.id)).custody).toBe('awaiting-collection');
    const bad = await put(planner, `/api/jobs/${job.id}/logistics`, { collectionDate: '2027-03-10', returnDate: '2027-03-01' });
    expect(bad.status).toBe(400);
    expect(bad.body.field).toBe('returnDate');
    const feb30 = await put(planner, `/api/jobs/${job.id}/logistics`, { collectionDate: '2027-02-30' });
    expect(feb30.status).toBe(400);
    expect(feb30.body.field).toBe('collectionDate');
    const set = await put(planner, `/api/jobs/${job.id}/logistics`, {
      collectionDate: '2027-03-01',
      collectionArrangement: 'A piano removal firm collects, ground floor, two steps',
      returnDate: '2027-04-12',
      returnArrangement: 'The customer fetches it with a van',
    }).expect(200);
    expect(set.body.collectionArrangement).toMatch(/removal firm/);
    // The board and the job list carry the dates too.
    const listed = (await planner.agent.get('/api/jobs').expect(200)).body as JobDetail[];
    expect(listed.find((j) => j.id === job.id)).toMatchObject({ custody: 'awaiting-collection', collectionDate: '2027-03-01', returnDate: '2027-04-12' });

    // A refused move is a 409 naming where the piece is; nothing changes.
    const early = await post(planner, `/api/jobs/${job.id}/custody`, { event: 'ready' });
    expect(early.status).toBe(409);
    expect(early.body.code).toBe('state_move_refused');
    expect(early.body.detail).toMatch(/awaiting collection/);
    await post(planner, `/api/jobs/${job.id}/custody`, { event: 'arrive' }).expect(200);
    const ready = (await post(planner, `/api/jobs/${job.id}/custody`, { event: 'ready' }).expect(200)).body as JobEndDto;
    expect(ready.custody).toBe('ready');
    expect(ready.completedOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const pub = (await request(app).get(`/api/public/quotes/${token}/jobs`).expect(200)).body as PublicJobDto[];
    expect(pub).toHaveLength(1);
    expect(pub[0]).toMatchObject({ custody: 'ready', returnDate: '2027-04-12', returnArrangement: 'The customer fetches it with a van' });
    expect(pub[0]!.where).toMatch(/ready to go home/);
    await post(planner, `/api/jobs/${job.id}/custody`, { event: 'return' }).expect(200);
    expect((await post(planner, `/api/jobs/${job.id}/custody`, { event: 'return' })).status).toBe(409);
    expect((await post(planner, `/api/jobs/${job.id}/custody`, { event: 'fly' })).body.field).toBe('event');

    // Each step is a job event, heard by the listeners (customer messages) once committed.
    const kinds = (await JobEvent.findAll({ where: { jobId: job.id }, order: [['id', 'ASC']] })).map((e) => e.kind);
    expect(kinds).toEqual(['dates-changed', 'arrived', 'ready', 'returned']);
    await expect.poll(() => heard.filter((e) => e.jobId === job.id).map((e) => e.kind)).toEqual(kinds);
    // Only planners move the piece.
    expect((await post(sales, `/api/jobs/${job.id}/custody`, { event: 'reopen' })).status).toBe(403);
  });

  it('keeps staff notes with their author and time, never on the customer page', async () => {
    const { job, token } = await acceptedJob();
    expect((await post(planner, `/api/jobs/${job.id}/notes`, { body: '  ' })).body.field).toBe('body');
    await post(planner, `/api/jobs/${job.id}/notes`, { body: 'Lid hinge pin is loose: handle by the case only.' }).expect(201);
    await post(sales, `/api/jobs/${job.id}/notes`, { body: 'Customer asks for a call before return.' }).expect(201);
    const notes = (await end(job.id)).notes;
    expect(notes.map((n) => n.body)).toEqual(['Customer asks for a call before return.', 'Lid hinge pin is loose: handle by the case only.']);
    expect(notes.every((n) => n.author && n.author.name.length > 0 && !Number.isNaN(Date.parse(n.createdAt)))).toBe(true);
    const pub = await request(app).get(`/api/public/quotes/${token}/jobs`).expect(200);
    expect(pub.text).not.toMatch(/hinge pin/);
  });
});

describe('progress photos', () => {
  it('are checked like every photo, and reach the customer only when shared, only through their link', async () => {
    const { job, token } = await acceptedJob();
    const other = await acceptedJob();
    const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#8a5a2b' } }).png().toBuffer();
    const notImage = await planner.agent.post(`/api/jobs/${job.id}/progress-photos`).set('x-csrf-token', planner.csrf).field('phase', 'before').attach('photos', Buffer.from('not an image'), 'x.png');
    expect(notImage.status).toBe(400);
    const noPhase = await planner.agent.post(`/api/jobs/${job.id}/progress-photos`).set('x-csrf-token', planner.csrf).field('phase', 'whenever').attach('photos', png, 'a.png');
    expect(noPhase.body.field).toBe('phase');
    const added = await planner.agent
      .post(`/api/jobs/${job.id}/progress-photos`)
      .set('x-csrf-token', planner.csrf)
      .field('phase', 'before')
      .field('captions', 'The lid as it came in')
      .attach('photos', png, 'before.png')
      .expect(201);
    const photo = added.body[0] as { id: number; phase: string; shared: boolean };
    expect(photo).toMatchObject({ phase: 'before', shared: false });
    await planner.agent.get(`/api/photos/${photo.id}/thumb`).expect(200);

    const url = `/api/public/quotes/${token}/photos/${photo.id}/file`;
    expect((await request(app).get(`/api/public/quotes/${token}/jobs`).expect(200)).body[0].photos).toEqual([]);
    await request(app).get(url).expect(404);
    await put(planner, `/api/jobs/${job.id}/progress-photos/${photo.id}/shared`, { shared: true }).expect(200);
    const shown = (await request(app).get(`/api/public/quotes/${token}/jobs`).expect(200)).body[0].photos;
    expect(shown).toEqual([expect.objectContaining({ id: photo.id, phase: 'before', caption: 'The lid as it came in', url })]);
    const file = await binary(request(app).get(url)).expect(200);
    expect((await sharp(file.body as Buffer).metadata()).format).toBe('jpeg');
    // Another customer's link, a tampered link, or no link at all: nothing.
    await request(app).get(`/api/public/quotes/${other.token}/photos/${photo.id}/file`).expect(404);
    await request(app).get(`/api/public/quotes/${token.slice(0, -2)}xx/photos/${photo.id}/file`).expect(404);
    await request(app).get(`/api/photos/${photo.id}/file`).expect(401);
    await put(planner, `/api/jobs/${job.id}/progress-photos/${photo.id}/shared`, { shared: false }).expect(200);
    await request(app).get(url).expect(404);
  });
});

describe('the hand kept on the bodying', () => {
  it('books every bodying session to the kept polisher, and the planner can override it', async () => {
    const kept = await post(planner, '/api/polishers', { name: `Keeper ${process.pid}`, hoursPerDay: 7, daysOff: [] }).expect(201);
    const { job } = await acceptedJob();
    expect((await put(planner, `/api/jobs/${job.id}/keep`, { polisherId: 999999, scope: 'bodying' })).body.field).toBe('polisherId');
    const keep = (await put(planner, `/api/jobs/${job.id}/keep`, { polisherId: kept.body.id, scope: 'bodying' }).expect(200)).body as JobEndDto;
    expect(keep.keep).toEqual({ polisher: { id: kept.body.id, name: kept.body.name }, scope: 'bodying' });
    const booked = (await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'earliest', notBefore: '2030-03-04' }).expect(200)).body as JobDetail;
    const bodying = booked.sessions.filter((s) => ['body', 'stiffen', 'spirit-off'].includes(s.stageKind));
    expect(bodying.length).toBeGreaterThan(0);
    expect(bodying.every((s) => s.polisher?.id === kept.body.id)).toBe(true);
    expect(booked.keptPolisherId).toBe(kept.body.id);
    // Overridden: booked again with whoever is free, and the audit says the keep was overridden.
    await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'earliest', notBefore: '2030-03-04', overrideKeep: true }).expect(200);
    const last = await AuditEntry.findOne({ where: { entityType: 'job', entityId: String(job.id), action: 'job.move' }, order: [['id', 'DESC']] });
    expect((last!.after as { keptOverridden: boolean }).keptOverridden).toBe(true);
    // Let go.
    expect((await put(planner, `/api/jobs/${job.id}/keep`, { polisherId: null }).expect(200)).body.keep).toBeNull();
  });
});

describe('variations', () => {
  it('priced by hand, approved through the signed link: sessions, agreed total, balance and invoice follow', async () => {
    const { job, token, quoteId } = await acceptedJob();
    const before = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'earliest', notBefore: '2030-06-03' }).expect(200);
    expect((await post(sales, `/api/jobs/${job.id}/variations`, { title: 'Re-lay veneer' })).body.field).toBe('hand');
    expect((await post(sales, `/api/jobs/${job.id}/variations`, { title: 'Re-lay veneer', hand: { price: '-5', hours: 1 } })).body.field).toBe('hand.price');
    expect((await post(planner, `/api/jobs/${job.id}/variations`, { title: 'Re-lay veneer', hand: { price: '95', hours: 1 } })).status).toBe(403);
    const v = (await post(sales, `/api/jobs/${job.id}/variations`, {
      title: 'Re-lay loose veneer on the lid edge',
      description: 'About 30 cm of cross-banding has lifted; glued and pressed, then filled and coloured in.',
      hand: { price: '180.00', hours: 5 },
    }).expect(201)).body as VariationDto;
    expect(v.state).toBe('draft');
    const sent = (await post(sales, `/api/jobs/${job.id}/variations/${v.id}/send`, {}).expect(200)).body as VariationDto;
    const vtoken = sent.link!.split('/v/')[1]!;
    await expect.poll(() => heard.find((e) => e.kind === 'variation-sent' && e.detail.variationId === v.id)?.detail.link).toBe(sent.link);
    expect(JSON.stringify((await JobEvent.findOne({ where: { jobId: job.id, kind: 'variation-sent' } }))!.detail)).not.toContain(vtoken);

    const seen = await request(app).get(`/api/public/variations/${vtoken}`).expect(200);
    const read = seen.body as PublicVariationDto;
    expect(read).toMatchObject({ title: 'Re-lay loose veneer on the lid edge', price: '180.00', state: 'sent', jobNumber: job.number });
    expect(read.cautions.join(' ')).toMatch(/flammable/);
    expect(read.cautions.join(' ')).toMatch(/self|by themselves/);
    expect(read.cautions.join(' ')).toMatch(/methanol/);
    expect(seen.text).not.toMatch(/hours|labour|rate|margin|overhead/i);
    await request(app).get(`/api/public/variations/${vtoken.slice(0, -3)}abc`).expect(404);

    const sessionsBefore = job.sessions.length;
    const approved = await request(app).post(`/api/public/variations/${vtoken}/approve`).send({ note: 'Yes please' }).expect(200);
    expect(approved.body.state).toBe('approved');
    const again = await request(app).post(`/api/public/variations/${vtoken}/decline`).send({});
    expect(again.status).toBe(409);
    expect(again.body.code).toBe('state_move_refused');

    // Five hours: two sessions of 2.5 h, laid on the board with the rest of the job.
    const after = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    const added = after.sessions.filter((s) => s.stageName.startsWith('Variation:'));
    expect(added.map((s) => s.handsOnHours)).toEqual([2.5, 2.5]);
    expect(after.sessions).toHaveLength(sessionsBefore + 2);
    expect(after.sessions.every((s) => s.start !== null)).toBe(true);
    expect(after.sessions.map((s) => s.index)).toEqual(after.sessions.map((_, i) => i));

    const acc = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    expect(acc.figures.agreedTotal).toBe(new Decimal(before.figures.agreedTotal).plus('180.00').toFixed(2));
    expect(acc.figures.balance).toBe(new Decimal(before.figures.balance).plus('180.00').toFixed(2));
    // The job page's agreed figures follow the account: the total with the variation, the deposit unchanged.
    expect(after.agreed!.total).toBe(acc.figures.agreedTotal);
    expect(after.agreed!.balance).toBe(new Decimal(acc.figures.agreedTotal).minus(after.agreed!.deposit).toFixed(2));
    const pub = (await request(app).get(`/api/public/quotes/${token}/jobs`).expect(200)).body as PublicJobDto[];
    expect(pub[0]!.variations).toEqual([{ title: 'Re-lay loose veneer on the lid edge', description: expect.any(String), price: '180.00', currency: expect.any(String), state: 'approved' }]);

    // The invoice carries the variation as its own line and the total with it.
    const keptStage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage as string;
    await put(owner, '/api/accounts/settings', { invoiceStage: 'accepted' }).expect(200);
    try {
      const inv = await post(sales, `/api/accounts/quotes/${quoteId}/invoice`, {});
      expect(inv.status, inv.text).toBe(201);
      const doc = (inv.body as AccountDto).documents.find((d) => d.kind === 'invoice')!;
      const pdf = await binary(sales.agent.get(`/api/accounts/documents/${doc.id}/pdf`)).expect(200);
      const file = path.join(os.tmpdir(), `job-end-${process.pid}-${doc.id}.pdf`);
      fs.writeFileSync(file, pdf.body as Buffer);
      const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
      fs.rmSync(file, { force: true });
      expect(text).toMatch(/Variation: Re-lay loose veneer on the lid edge/);
      expect(text).toMatch(/180\.00/);
      // Once invoiced, no more variations go out.
      const late = (await post(sales, `/api/jobs/${job.id}/variations`, { title: 'Replace a castor cup', hand: { price: '40', hours: 0.5 } }).expect(201)).body as VariationDto;
      expect((await post(sales, `/api/jobs/${job.id}/variations/${late.id}/send`, {})).body.code).toBe('invoice_issued');
    } finally {
      await put(owner, '/api/accounts/settings', { invoiceStage: keptStage }).expect(200);
    }
  });

  it('priced by the engine from a part and a system; declined, it changes nothing; withdrawn links stop working', async () => {
    const { job, quoteId } = await acceptedJob();
    const before = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    const badPart = await post(estimator, `/api/jobs/${job.id}/variations`, { title: 'Moulding', engine: { part: { name: 'Moulding', shape: { kind: 'rectangle', length: 'long', width: '40 mm' } }, system: 'full-repolish' } });
    expect(badPart.status).toBe(400);
    expect(String(badPart.body.field)).toMatch(/^engine/);
    const v = (await post(estimator, `/api/jobs/${job.id}/variations`, {
      title: 'Replace a missing moulding',
      engine: { part: { name: 'Lid moulding', shape: { kind: 'rectangle', length: '1200 mm', width: '40 mm' }, species: 'rosewood' }, system: 'full-repolish' },
    }).expect(201)).body as VariationDto;
    expect(v.pricedBy).toBe('engine');
    expect(Number(v.price)).toBeGreaterThan(0);
    expect(v.working?.labourHours).toBeGreaterThan(0);
    const link = (await post(sales, `/api/jobs/${job.id}/variations/${v.id}/send`, {}).expect(200)).body.link as string;
    const vtoken = link.split('/v/')[1]!;
    await request(app).post(`/api/public/variations/${vtoken}/decline`).send({ note: 'Not now' }).expect(200);
    const acc = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    expect(acc.figures.agreedTotal).toBe(before.figures.agreedTotal);

    const w = (await post(sales, `/api/jobs/${job.id}/variations`, { title: 'Ease a sticking fall', hand: { price: '35', hours: 1 } }).expect(201)).body as VariationDto;
    const wlink = (await post(sales, `/api/jobs/${job.id}/variations/${w.id}/send`, {}).expect(200)).body.link as string;
    await post(sales, `/api/jobs/${job.id}/variations/${w.id}/withdraw`, {}).expect(200);
    await request(app).post(`/api/public/variations/${wlink.split('/v/')[1]}/approve`).send({}).expect(404);
  });

  it('approved twice at the same moment counts once', async () => {
    const { job, quoteId } = await acceptedJob();
    const before = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    const v = (await post(sales, `/api/jobs/${job.id}/variations`, { title: 'Glue a split in the leg', hand: { price: '60.50', hours: 2 } }).expect(201)).body as VariationDto;
    const vtoken = ((await post(sales, `/api/jobs/${job.id}/variations/${v.id}/send`, {}).expect(200)).body.link as string).split('/v/')[1]!;
    const answers = await Promise.all(Array.from({ length: 6 }, () => request(app).post(`/api/public/variations/${vtoken}/approve`).send({})));
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409, 409, 409, 409, 409]);
    const acc = (await sales.agent.get(`/api/accounts/quotes/${quoteId}`).expect(200)).body as AccountDto;
    expect(acc.figures.agreedTotal).toBe(new Decimal(before.figures.agreedTotal).plus('60.50').toFixed(2));
    const detail = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    expect(detail.sessions.filter((s) => s.stageName.startsWith('Variation:'))).toHaveLength(1);
  });
});
