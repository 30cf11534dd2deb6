/**
 * A quote for the whole household: several pieces in one quote, options for a piece the customer chooses between.
 * The choice sets the accepted total, deposit, jobs (one a chosen piece, each with its own sessions) and checkout; the
 * one-agreement rule holds per piece, across quotes, under parallel acceptances; the lighter-option report counts
 * what customers chose.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { UniqueConstraintError } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { choiceFigures, type QuoteDetail } from '../../shared/schemas/quotes';
import { Estimate, Job, JobSession, OutboxMessage, Quote, QuoteLine } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const { app, config } = getTestApp();
let services: Awaited<ReturnType<typeof startServices>>;
let estimator: Session;
let sales: Session;
let workshop: Session;
let server: http.Server;

afterAll(async () => {
  await services?.stop();
  server?.closeAllConnections();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  await closeTestApp();
});

beforeAll(async () => {
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  config.publicUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  services = await startServices();
  estimator = await signInAs(app, 'estimator');
  sales = await signInAs(app, 'sales');
  workshop = await signInAs(app, 'workshop');
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const problem = (res: request.Response) => JSON.parse(res.text) as { status: number; code: string; detail: string; field?: string };
const tokenOf = (link: string) => link.split('/q/')[1]!;
const pub = (token: string, rest = '') => `/api/public/quotes/${token}${rest}`;
const cents = (s: string) => Math.round(Number(s) * 100);

const UPRIGHT = { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true };
const TABLE = { template: 'table', dimensions: { length: '160 cm', width: '90 cm', height: '75 cm' }, species: 'mahogany', veneered: false };

let serial = 0;
async function household() {
  serial++;
  const c = await post(sales, '/api/customers', { name: `Household ${serial}`, email: `household.${serial}.${process.pid}@example.com` }).expect(201);
  const piece = async (kind: string, description: string) => (await post(estimator, '/api/pieces', { customerId: c.body.id, kind, description }).expect(201)).body.id as number;
  const estimate = async (pieceId: number, input: object) => {
    const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId, input }).expect(201);
    await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
    return e.body.id as number;
  };
  const upright = await piece('upright', `Walnut upright ${serial}`);
  const table = await piece('furniture', `Dining table ${serial}`);
  return {
    customerId: c.body.id as number,
    upright,
    table,
    full: await estimate(upright, { piece: UPRIGHT, system: 'full-repolish' }),
    light: await estimate(upright, { piece: UPRIGHT, system: 'revive' }),
    tableEstimate: await estimate(table, { piece: TABLE, system: 'full-repolish' }),
    estimate,
  };
}

/** Upright with two options (full repolish recommended, or the lighter revive), and the dining table. */
function twoPieces(h: Awaited<ReturnType<typeof household>>, extra: object = {}) {
  return {
    message: 'For the upright and the dining table.',
    extras: [{ label: 'New castor cups', description: '', hours: 2, price: '80.00' }],
    lines: [
      { estimateId: h.full, group: 1, label: 'Full repolish', recommended: true },
      { estimateId: h.light, group: 1, label: 'Re-body and refresh' },
      { estimateId: h.tableEstimate, group: 2, label: 'Full repolish' },
    ],
    ...extra,
  };
}

async function sent(estimateId: number, body: object): Promise<{ quote: QuoteDetail; token: string }> {
  const q = await post(sales, `/api/estimates/${estimateId}/quotes`, body).expect(201);
  const s = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  return { quote: s.body as QuoteDetail, token: tokenOf(s.body.link) };
}

describe('a quote of two pieces with an option group', () => {
  it('is priced at the recommended choice, and summarised by option in the e-mail', async () => {
    const h = await household();
    const { quote } = await sent(h.full, twoPieces(h));
    expect(quote.lines).toHaveLength(3);
    expect(quote.lines.map((l) => [l.group, l.recommended])).toEqual([[1, true], [1, false], [2, true]]);
    const [full, light, table] = quote.lines;
    // The lighter option costs less: that is what makes it lighter.
    expect(cents(light!.total)).toBeLessThan(cents(full!.total));
    expect(cents(quote.total)).toBe(cents(full!.total) + cents(table!.total));
    expect(quote.deposit).toBe(choiceFigures({ lines: quote.lines, depositPct: quote.depositPct, extras: [] }, [full!.id, table!.id], []).deposit);
    // The combined price lines still add up to the total.
    expect(quote.pricing.lines.reduce((t, l) => t + cents(l.amount), 0)).toBe(cents(quote.total));
    const mail = (await OutboxMessage.findOne({ where: { quoteId: quote.id }, order: [['id', 'DESC']] }))!;
    expect(mail.textBody.replace(/\s+/g, ' ')).toMatch(/choose Full repolish \(.*recommended\) or Re-body and refresh/);
    expect(mail.textBody).toContain(`Dining table ${serial}`);
  });

  it.each([
    ['the recommended full repolish', 0],
    ['the lighter re-body and refresh', 1],
  ])('accepted with %s: the right totals, deposit, checkout and one job a chosen piece', async (_name, option) => {
    const h = await household();
    const { quote, token } = await sent(h.full, twoPieces(h));
    const chosenUpright = quote.lines[option]!;
    const table = quote.lines[2]!;
    const chosen = [chosenUpright.id, table.id];
    const expected = choiceFigures({ lines: quote.lines, depositPct: quote.depositPct, extras: quote.extras }, chosen, ['x1']);
    // The customer's page knows each line by its place in the quote, never by a database id.
    const chosenPlaces = [chosenUpright.position, table.position];
    const extraWithTax = cents(quote.extras[0]!.priceWithTax);
    expect(cents(expected.total)).toBe(cents(chosenUpright.total) + cents(table.total) + extraWithTax);
    expect(cents(expected.deposit)).toBe(Math.round((cents(expected.total) * quote.depositPct) / 100));

    // The customer's page offers the options; a choice of two for one piece, or none for it, is refused.
    const page = await request(app).get(pub(token)).expect(200);
    expect(page.body.lines).toHaveLength(3);
    expect(page.body.recommended).toEqual([quote.lines[0]!.position, table.position]);
    expect(page.body.lines.map((l: { id: number }) => l.id)).toEqual([1, 2, 3]);
    expect(JSON.stringify(page.body)).not.toMatch(/per hour|Margin|overhead/i);
    const both = await request(app).post(pub(token, '/accept')).send({ name: 'Ida Household', acceptTerms: true, lines: [quote.lines[0]!.position, quote.lines[1]!.position, table.position] });
    expect(both.status).toBe(400);
    expect(problem(both)).toMatchObject({ code: 'invalid_choice', field: 'lines' });
    const none = await request(app).post(pub(token, '/accept')).send({ name: 'Ida Household', acceptTerms: true, lines: [table.position] });
    expect(problem(none)).toMatchObject({ status: 400, field: 'lines' });
    const silent = await request(app).post(pub(token, '/accept')).send({ name: 'Ida Household', acceptTerms: true });
    expect(problem(silent)).toMatchObject({ status: 400, code: 'choice_required', field: 'lines' });

    const accepted = await request(app).post(pub(token, '/accept')).send({ name: 'Ida Household', acceptTerms: true, lines: chosenPlaces, extras: ['x1'] }).expect(200);
    expect(accepted.body.agreed).toMatchObject({ total: expected.total, deposit: expected.deposit, balance: expected.balance });
    expect(accepted.body.lines.map((l: { chosen: boolean }) => l.chosen)).toEqual(quote.lines.map((l) => chosen.includes(l.id)));
    const staff = (await sales.agent.get(`/api/quotes/${quote.id}`).expect(200)).body as QuoteDetail;
    expect(staff).toMatchObject({ state: 'accepted', acceptedTotal: expected.total, acceptedDeposit: expected.deposit });
    // The price shown from now on is the chosen lines', on staff screens and the customer's page alike.
    const chosenTotal = ((cents(chosenUpright.total) + cents(table.total)) / 100).toFixed(2);
    expect(staff.pricing.total).toBe(chosenTotal);
    expect(accepted.body.pricing.total).toBe(chosenTotal);
    expect(accepted.body.pricing.lines.reduce((t: number, l: { amount: string }) => t + cents(l.amount), 0)).toBe(cents(chosenTotal));
    // The chosen estimates are accepted; the option not taken is not.
    const other = quote.lines[1 - option]!;
    expect((await Estimate.findByPk(chosenUpright.estimate.id))!.state).toBe('accepted');
    expect((await Estimate.findByPk(other.estimate.id))!.state).not.toBe('accepted');
    const est = (await sales.agent.get(`/api/estimates/${chosenUpright.estimate.id}`).expect(200)).body;
    expect(est.agreed).toMatchObject({ total: expected.total, deposit: expected.deposit });

    // The checkout asks exactly the deposit on the chosen total.
    const checkout = await request(app).post(pub(token, '/deposit')).send({}).expect(200);
    const sessionId = String(checkout.body.url).split('/checkout/')[1]!;
    expect(Number(services.payments!.sessions.get(sessionId)!.amount_total)).toBe(cents(expected.deposit));
    await services.payments!.pay(sessionId);
    expect((await Quote.findByPk(quote.id))!.state).toBe('deposit-paid');

    // One job a chosen piece, each with its own sessions; the extra goes with the first piece; no third job.
    const ready = (await workshop.agent.get('/api/planning/ready').expect(200)).body;
    const rows = ready.quotes.filter((r: { quoteId: number }) => r.quoteId === quote.id);
    expect(rows.map((r: { quoteLineId: number }) => r.quoteLineId)).toEqual(chosen);
    const first = await post(workshop, '/api/jobs', { quoteId: quote.id }).expect(201);
    const second = await post(workshop, '/api/jobs', { quoteId: quote.id, quoteLineId: table.id }).expect(201);
    const third = await post(workshop, '/api/jobs', { quoteId: quote.id });
    expect(third.status).toBe(409);
    expect(problem(third).code).toBe('job_exists');
    const notChosen = await post(workshop, '/api/jobs', { quoteId: quote.id, quoteLineId: other.id });
    expect(problem(notChosen)).toMatchObject({ status: 400, field: 'quoteLineId' });
    const jobs = await Job.findAll({ where: { quoteId: quote.id }, order: [['id', 'ASC']] });
    expect(jobs.map((j) => j.estimateId)).toEqual([chosenUpright.estimate.id, table.estimate.id]);
    expect(first.body.id).toBe(jobs[0]!.id);
    expect(second.body.id).toBe(jobs[1]!.id);
    for (const job of jobs) {
      const line = await QuoteLine.findByPk(job.quoteLineId);
      const revision = (await sales.agent.get(`/api/estimates/${line!.estimateId}`).expect(200)).body;
      const sessions = await JobSession.findAll({ where: { jobId: job.id } });
      const extraSessions = sessions.filter((s) => s.stageKind === 'extra').length;
      expect(sessions.length - extraSessions).toBe(revision.current.result.calendar.sessions.length);
      expect(extraSessions).toBe(job.id === jobs[0]!.id ? 1 : 0);
    }

    // The acceptance record names the chosen work piece by piece.
    const record = await sales.agent.get(`/api/quotes/${quote.id}/acceptance.pdf`).expect(200);
    expect(record.headers['content-type']).toBe('application/pdf');
  });

  it('an optional group may be left out; sales is held to one recommended option and one piece a group', async () => {
    const h = await household();
    const twice = await post(sales, `/api/estimates/${h.full}/quotes`, {
      lines: [{ estimateId: h.full, group: 1, recommended: true }, { estimateId: h.light, group: 1, recommended: true }],
    });
    expect(problem(twice)).toMatchObject({ status: 400, code: 'recommended_twice', field: 'lines' });
    const mixed = await post(sales, `/api/estimates/${h.full}/quotes`, { lines: [{ estimateId: h.full, group: 1 }, { estimateId: h.tableEstimate, group: 1 }] });
    expect(problem(mixed)).toMatchObject({ status: 400, code: 'options_of_several_pieces' });
    const apart = await post(sales, `/api/estimates/${h.full}/quotes`, { lines: [{ estimateId: h.full }, { estimateId: h.light }] });
    expect(problem(apart)).toMatchObject({ status: 400, code: 'piece_twice' });
    const without = await post(sales, `/api/estimates/${h.full}/quotes`, { lines: [{ estimateId: h.tableEstimate }] });
    expect(problem(without)).toMatchObject({ status: 400, field: 'lines' });

    const { quote, token } = await sent(h.full, {
      lines: [
        { estimateId: h.full, group: 1, label: 'Full repolish' },
        { estimateId: h.tableEstimate, group: 2, label: 'Full repolish', optional: true },
      ],
    });
    const [upright, table] = quote.lines;
    expect(table!.groupOptional).toBe(true);
    const r = await request(app).post(pub(token, '/accept')).send({ name: 'Ida Household', acceptTerms: true, lines: [upright!.position] }).expect(200);
    expect(r.body.agreed.total).toBe(upright!.total);
    expect((await QuoteLine.findByPk(table!.id))!.agreed).toBe(false);
    // The dining table is still free to be agreed in another quote.
    const later = await sent(h.tableEstimate, {});
    await request(app).post(pub(later.token, '/accept')).send({ name: 'Ida Household', acceptTerms: true }).expect(200);
  });
});

describe('one agreement per piece', () => {
  it('parallel acceptances of two quotes naming the same piece end with one accepted', async () => {
    const h = await household();
    // Quote A: the upright (full) and the table; quote B: the upright (the lighter estimate) alone.
    const a = await sent(h.full, { lines: [{ estimateId: h.full }, { estimateId: h.tableEstimate }] });
    const b = await sent(h.light, {});
    const answers = await Promise.all(
      Array.from({ length: 12 }, (_, i) => request(app).post(pub(i % 2 ? b.token : a.token, '/accept')).send({ name: `Customer ${i}`, acceptTerms: true })),
    );
    const ok = answers.filter((r) => r.status === 200);
    expect(ok).toHaveLength(1);
    for (const r of answers.filter((x) => x.status !== 200)) {
      expect(r.status).toBe(409);
      expect(['quote_accepted', 'quote_withdrawn', 'piece_already_agreed', 'estimate_already_agreed']).toContain(problem(r).code);
    }
    const states = [(await Quote.findByPk(a.quote.id))!.state, (await Quote.findByPk(b.quote.id))!.state].sort();
    expect(states).toEqual(['accepted', 'withdrawn']);
    expect(await QuoteLine.count({ where: { pieceId: h.upright, agreed: true } })).toBe(1);
    // No new quote for the piece can be made, whichever estimate of it names it.
    const again = await post(sales, `/api/estimates/${h.light}/quotes`, {});
    expect(again.status).toBe(409);
    expect(['piece_already_agreed', 'estimate_already_agreed']).toContain(problem(again).code);
  });

  it('the database refuses a second agreement on a piece whatever the code does', async () => {
    const h = await household();
    const a = await sent(h.full, {});
    await request(app).post(pub(a.token, '/accept')).send({ name: 'Ida Household', acceptTerms: true }).expect(200);
    const line = (await QuoteLine.findOne({ where: { quoteId: a.quote.id } }))!;
    await expect(
      QuoteLine.create({ quoteId: a.quote.id, position: 9, optionGroup: 9, groupOptional: false, label: '', recommended: true, estimateId: h.light, pieceId: h.upright, revisionId: line.revisionId, pricing: line.pricing, total: line.total, chosen: true, agreed: true }),
    ).rejects.toBeInstanceOf(UniqueConstraintError);
  });
});

describe('which option customers take', () => {
  it('counts how often the lighter option wins', async () => {
    const before = (await sales.agent.get('/api/quotes/options-report').expect(200)).body;
    const h1 = await household();
    const q1 = await sent(h1.full, twoPieces(h1));
    await request(app).post(pub(q1.token, '/accept')).send({ name: 'Ada Lighter', acceptTerms: true, lines: [q1.quote.lines[1]!.position, q1.quote.lines[2]!.position] }).expect(200);
    const h2 = await household();
    const q2 = await sent(h2.full, twoPieces(h2));
    await request(app).post(pub(q2.token, '/accept')).send({ name: 'Bea Fuller', acceptTerms: true, lines: [q2.quote.lines[0]!.position, q2.quote.lines[2]!.position] }).expect(200);
    const after = (await sales.agent.get('/api/quotes/options-report').expect(200)).body;
    expect(after.groups - before.groups).toBe(2);
    expect(after.lighterChosen - before.lighterChosen).toBe(1);
    expect(after.heavierChosen - before.heavierChosen).toBe(1);
    expect(after.recommendedChosen - before.recommendedChosen).toBe(1);
    await workshop.agent.get('/api/quotes/options-report').expect(403);
  });
});
