/**
 * Messages to the customer: the owner's templates (unknown placeholders refused on the field, the preview), each
 * event's message (acceptance, deposit receipt, booking, change of dates, ready, balance due, the two quote
 * reminders), the customer's list of messages, and the durable queue: a message scheduled before a restart is sent
 * once after it, and two workers on one database send each message once.
 */
import { addDays, today } from '@shared/time';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CustomerMessagesPage, MessageTemplateDto } from '../../shared/schemas/messages';
import { Job, OutboxMessage, Quote } from '../../server/models';
import { createMessageQueue, currentWorkshopId, MESSAGE_SAFETY_NOTE, queueCustomerMessage, runReminder, type MessageQueue } from '../../server/services/messages';
import { closeTestApp, getTestApp, signInAs, startServices, testDatabaseUrl, type Session } from '../helpers/app';

const { app, config, sequelize, queue: appQueue } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let sales: Session;
let estimator: Session;
let planner: Session;
const extraQueues: MessageQueue[] = [];
let server: http.Server;

beforeAll(async () => {
  // The payment stand-in posts its webhooks to the app: it listens on a free port.
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  [owner, sales, estimator, planner] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'sales'), signInAs(app, 'estimator'), signInAs(app, 'workshop')]);
  await appQueue!.start();
});

afterAll(async () => {
  for (const q of extraQueues) await q.stop();
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
/** Waits for a condition, polling; the bound is generous (a busy shared machine), never a fixed sleep. */
const until = <T>(fn: () => Promise<T> | T) => expect.poll(fn, { timeout: 60_000, interval: 200 });

let made = 0;
/** A sent quote for a customer of its own; `accept` accepts it through the customer's link. */
async function sentQuote(): Promise<{ id: number; number: string; token: string; customerId: number; email: string }> {
  made++;
  const tag = `${process.pid}-${made}`;
  const email = `messages.${tag}@example.com`;
  const c = await post(sales, '/api/customers', { name: `Message Customer ${made}`, email }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: `Satinwood upright ${tag}` }).expect(201);
  const e = await post(estimator, '/api/estimates', {
    customerId: c.body.id,
    pieceId: p.body.id,
    title: `Satinwood upright ${tag}`,
    input: { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish', discountPct: 0 },
  }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  return { id: q.body.id, number: q.body.number, token: String(sent.body.link).split('/q/')[1]!, customerId: c.body.id, email };
}

const accept = (token: string) => request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Ottoline Brack', acceptTerms: true, extras: [] }).expect(200);

async function payDeposit(token: string): Promise<void> {
  const res = await request(app).post(`/api/public/quotes/${token}/deposit`).send({}).expect(200);
  await services.payments!.pay(String(res.body.url).split('/checkout/')[1]!);
}

const mailTo = (email: string) => services.mail!.messages.filter((m) => m.to.includes(email));
/** The mail the catcher received for an outbox message, by the Message-ID the mail server gave it. */
const received = async (outboxId: number) => {
  const messageId = (await OutboxMessage.findByPk(outboxId))!.messageId!;
  return services.mail!.messages.filter((m) => m.raw.includes(messageId));
};
const outboxOf = (customerId: number, kind: string) => OutboxMessage.findAll({ where: { customerId, kind }, order: [['id', 'ASC']] });

describe('the owner\u2019s templates', () => {
  it('lists every kind, refuses an unknown placeholder on the field, previews with invented values and the safety note', async () => {
    const list = (await sales.agent.get('/api/messages/templates').expect(200)).body as MessageTemplateDto[];
    expect(list.map((t) => t.kind)).toEqual(['acceptance', 'deposit-receipt', 'booking', 'dates-changed', 'ready', 'balance-due', 'quote-unanswered', 'quote-expiring']);

    const bad = await put(owner, '/api/messages/templates/ready', { subject: 'Ready', body: 'Dear {customer}, your {piano} is ready.' });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatchObject({ field: 'body' });
    expect(bad.body.detail).toContain('{piano}');
    expect((await put(sales, '/api/messages/templates/ready', { subject: 'x', body: 'y' })).status).toBe(403);
    expect((await put(owner, '/api/messages/templates/nonsense', { subject: 'x', body: 'y' })).status).toBe(400);

    const preview = (await post(owner, '/api/messages/templates/ready/preview', { subject: '{piece} is ready', body: 'The {piece} waits for you at {workshop}.' }).expect(200)).body;
    expect(preview.subject).toBe('Walnut writing bureau is ready');
    expect(preview.text).toContain('Dear Mrs Ada Fenwick,');
    expect(preview.text).toContain('The Walnut writing bureau waits for you at');
    expect(preview.text).toContain(MESSAGE_SAFETY_NOTE);
    expect((await post(owner, '/api/messages/templates/ready/preview', { subject: 'x', body: '{nope}' })).status).toBe(400);

    const settings = await put(owner, '/api/messages/settings', { unansweredAfterDays: 0, expiringBeforeDays: 3 });
    expect(settings.status).toBe(400);
    expect(settings.body.field).toBe('unansweredAfterDays');
  });
});

describe('each event\u2019s message', () => {
  it('acceptance: the confirmation goes at once with the customer\u2019s link and the safety note; the customer\u2019s list shows it', async () => {
    const q = await sentQuote();
    await accept(q.token);
    const [m] = await outboxOf(q.customerId, 'acceptance');
    expect(m).toBeDefined();
    expect(m!.status).toBe('sent');
    expect(m!.textBody).toContain(q.number);
    expect(m!.textBody).toContain(q.token);
    expect(m!.textBody).toContain(MESSAGE_SAFETY_NOTE);
    expect(await received(m!.id)).toHaveLength(1);
    expect(mailTo(q.email).length).toBeGreaterThanOrEqual(2);

    const page = (await sales.agent.get(`/api/messages/customers/${q.customerId}?sort=createdAt&dir=asc&pageSize=1`).expect(200)).body as CustomerMessagesPage;
    expect(page.total).toBe(2);
    expect(page.rows).toHaveLength(1);
    expect(page.rows[0]!.subject).toMatch(/^Quote /);
    const second = (await sales.agent.get(`/api/messages/customers/${q.customerId}?sort=createdAt&dir=asc&pageSize=1&page=2`).expect(200)).body as CustomerMessagesPage;
    expect(second.rows[0]).toMatchObject({ kind: 'acceptance', label: 'Acceptance confirmation', status: 'sent' });
    expect((await sales.agent.get(`/api/messages/customers/${q.customerId}?sort=nonsense`)).status).toBe(400);
  });

  it('deposit: the receipt e-mail carries the deposit message; booking, a move, ready and the balance due each send theirs', async () => {
    const q = await sentQuote();
    await accept(q.token);
    await payDeposit(q.token);
    const [receipt] = await outboxOf(q.customerId, 'deposit-receipt');
    expect(receipt!.status).toBe('sent');
    expect(receipt!.attachmentName).toMatch(/^RC-\d{5}\.pdf$/);
    expect(receipt!.textBody).toContain('Thank you for your deposit of');

    const job = (await post(planner, '/api/jobs', { quoteId: q.id }).expect(201)).body as { id: number };
    const booked = (await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'earliest' }).expect(200)).body as { roomStart: string };
    await until(async () => (await outboxOf(q.customerId, 'booking')).map((m) => m.status)).toEqual(['sent']);
    const [booking] = await outboxOf(q.customerId, 'booking');
    expect(booking!.jobId).toBe(job.id);
    expect(booking!.textBody).toContain('is booked');

    const later = addDays(booked.roomStart.slice(0, 10) > today() ? booked.roomStart.slice(0, 10) : today(), 40);
    await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'date', start: later, confirm: true }).expect(200);
    await until(async () => (await outboxOf(q.customerId, 'dates-changed')).map((m) => m.status)).toEqual(['sent']);

    const ready = await post(planner, `/api/messages/jobs/${job.id}/ready`, {}).expect(201);
    expect(ready.body.status).toBe('sent');
    const again = await post(planner, `/api/messages/jobs/${job.id}/ready`, {});
    expect(again.status).toBe(409);
    expect((await post(estimator, `/api/messages/jobs/${job.id}/ready`, {})).status).toBe(403);

    await Job.update({ state: 'finished', finishedAt: new Date() }, { where: { id: job.id } });
    await post(sales, `/api/accounts/quotes/${q.id}/invoice`, {}).expect(201);
    const [due] = await outboxOf(q.customerId, 'balance-due');
    expect(due!.status).toBe('sent');
    expect(due!.attachmentName).toMatch(/^INV-\d{5}\.pdf$/);
    expect(due!.textBody).toContain('The balance still to pay is');

    const all = (await sales.agent.get(`/api/messages/customers/${q.customerId}?pageSize=50`).expect(200)).body as CustomerMessagesPage;
    expect(all.rows.map((r) => r.kind).filter(Boolean).sort()).toEqual(['acceptance', 'balance-due', 'booking', 'dates-changed', 'deposit-receipt', 'ready']);
    for (const r of all.rows) expect(r.status).toBe('sent');
  });

  it('quote reminders: scheduled on the queue when the quote is sent (with the workshop), sent once when due, never after an answer', async () => {
    const q = await sentQuote();
    const jobs = await sequelize.query<{ data: { workshopId: number; quoteId: number; kind: string }; start_after: Date }>(
      `SELECT data, start_after FROM pgboss.job WHERE name = 'quote-reminder' AND (data->>'quoteId')::int = :id ORDER BY start_after`,
      { type: QueryTypes.SELECT, replacements: { id: q.id } },
    );
    const workshopId = await currentWorkshopId();
    expect(jobs.map((j) => j.data.kind).sort()).toEqual(['quote-expiring', 'quote-unanswered']);
    for (const j of jobs) expect(j.data.workshopId).toBe(workshopId);
    const sentAt = (await Quote.findByPk(q.id))!.sentAt!;
    const unanswered = jobs.find((j) => j.data.kind === 'quote-unanswered')!;
    expect(unanswered.start_after.getTime()).toBeGreaterThan(sentAt.getTime() + 5 * 86_400_000);

    // The day comes (run as the queue's job would): sent through the queue, once however often the job runs.
    const first = await runReminder(sequelize, { workshopId, quoteId: q.id, kind: 'quote-unanswered' });
    expect(first).not.toBeNull();
    expect(await runReminder(sequelize, { workshopId, quoteId: q.id, kind: 'quote-unanswered' })).toBeNull();
    await until(async () => (await outboxOf(q.customerId, 'quote-unanswered')).map((m) => m.status)).toEqual(['sent']);
    const [m] = await outboxOf(q.customerId, 'quote-unanswered');
    expect(m!.textBody).toContain(q.number);
    expect(m!.textBody).toContain(MESSAGE_SAFETY_NOTE);

    await accept(q.token);
    expect(await runReminder(sequelize, { workshopId, quoteId: q.id, kind: 'quote-expiring' })).toBeNull();
    expect(await outboxOf(q.customerId, 'quote-expiring')).toHaveLength(0);
  });
});

describe('the durable queue', () => {
  const newQueue = () => {
    const q = createMessageQueue({ config, sequelize, databaseUrl: testDatabaseUrl(), pollSeconds: 0.5 });
    extraQueues.push(q);
    return q;
  };
  const statusOf = async (id: number) => (await OutboxMessage.findByPk(id))!.status;
  const jobsFor = async (id: number) =>
    sequelize.query<{ state: string }>(`SELECT state FROM pgboss.job WHERE name = 'customer-message' AND (data->>'outboxId')::int = :id`, { type: QueryTypes.SELECT, replacements: { id } });

  async function message(customerId: number, tag: string, sendAfter: Date | null): Promise<number> {
    const workshopId = await currentWorkshopId();
    const id = await sequelize.transaction((transaction) =>
      queueCustomerMessage(sequelize, { workshopId, kind: 'ready', customerId, quoteId: null, values: { piece: `queue test ${tag}` }, dedupeKey: `queue-test:${process.pid}:${tag}`, sendAfter, actorId: null }, transaction),
    );
    return id!;
  }

  it('a message scheduled before a restart is sent exactly once after it', async () => {
    const q = await sentQuote();
    await appQueue!.stop();
    const before = newQueue();
    await before.start();
    const id = await message(q.customerId, 'restart', new Date(Date.now() + 3_000));
    await until(async () => (await jobsFor(id)).length).toBe(1);
    await before.stop();
    expect(await statusOf(id)).toBe('queued');

    const after = newQueue();
    await after.start();
    await until(() => statusOf(id)).toBe('sent');
    await until(async () => (await jobsFor(id)).map((j) => j.state)).toEqual(['completed']);
    expect(await received(id)).toHaveLength(1);
    await after.stop();
  });

  it('two workers on one database send each message once, even with a job put on twice', async () => {
    const q = await sentQuote();
    const a = newQueue();
    const b = newQueue();
    await Promise.all([a.start(), b.start()]);
    const ids: number[] = [];
    for (let i = 0; i < 8; i++) ids.push(await message(q.customerId, `pair-${i}`, null));
    const workshopId = await currentWorkshopId();
    // A second job for each message, not caught by the singleton key: the outbox row's claim still sends it once.
    for (const id of ids) await b.boss.send('customer-message', { workshopId, outboxId: id }, { singletonKey: `again-${id}` });
    await until(async () => (await Promise.all(ids.map(statusOf))).every((s) => s === 'sent')).toBe(true);
    await until(async () => (await Promise.all(ids.map(async (id) => (await jobsFor(id)).every((j) => j.state === 'completed')))).every(Boolean)).toBe(true);
    for (const id of ids) expect(await received(id)).toHaveLength(1);
    for (const id of ids) expect((await OutboxMessage.findByPk(id))!.attempts).toBe(1);
  });
});
