/**
 * Stock, purchase orders and job costing through the API. Each test makes its own customer, job, material and
 * supplier (names carry this run's mark), books the job on a date of its own and reads only its own rows.
 *
 * The costing fixture is worked by hand (in the comments beside it): a job with known actual hours, a known rate,
 * materials at known prices and a known agreed price gives its realised margin to the penny.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobDetail } from '../../shared/schemas/planning';
import type { EstimateAccuracy, JobCosting, PurchaseOrderDto, SessionMaterialLine, StockMovementPage, StockOverview } from '../../shared/schemas/stock';
import { EstimateRevision, Job, LabourRate, Material, MaterialPack, OutboxMessage, PackPrice, Quote } from '../../server/models';
import { currentWorkshop } from '../../server/services/workshops';
import { closeTestApp, getTestApp, signInAs, startServices, type Session } from '../helpers/app';

const built = getTestApp();
const { app } = built;
let services: Awaited<ReturnType<typeof startServices>>;
let owner: Session;
let planner: Session;
let estimator: Session;
let sales: Session;
const RUN = `${process.pid}-${Date.now().toString(36)}`;

afterAll(async () => {
  await services?.stop();
  await closeTestApp();
});

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const grand = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };

/** Local dates, as the server reads them. */
function localDate(d: Date): string {
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}
function addDays(date: string, n: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}
function mondayOf(date: string): string {
  const wd = (new Date(`${date}T12:00:00Z`).getUTCDay() + 6) % 7;
  return addDays(date, -wd);
}
const today = localDate(new Date());
const yesterday = addDays(today, -1);

let made = 0;
async function acceptedQuote(): Promise<number> {
  made++;
  const c = await post(sales, '/api/customers', { name: `Costing customer ${RUN} ${made}`, email: `costing.${made}.${process.pid}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: `Rosewood grand ${made}` }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: grand }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  const token = String(sent.body.link).split('/q/')[1];
  await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: `Costing customer ${made}`, acceptTerms: true }).expect(200);
  return q.body.id as number;
}

/** A material of this test's own, with one pack from its own supplier at a known price. */
async function ownMaterial(label: string, size: number, price: string): Promise<{ material: Material; pack: MaterialPack; supplier: string }> {
  const supplier = `${label} Supplies ${RUN}`;
  const material = await Material.create({ key: `test-${label.toLowerCase().replace(/\W+/g, '-')}-${RUN}`.slice(0, 64), name: `${label} wax ${RUN}`, kind: 'wax', unit: 'g' });
  const pack = await MaterialPack.create({ materialId: material.id, size: String(size), label: `${size} g tin`, supplier, supplierCode: `TW-${made}` });
  await PackPrice.create({ packId: pack.id, price, effectiveFrom: addDays(today, -30), userId: null, source: 'test' });
  await built.caches.settle();
  return { material, pack, supplier };
}

/**
 * Runs `make` with the polishing rate, overhead and tax set to known values, so that the estimate made meanwhile
 * carries them; the workshop's own values are put back after.
 */
async function withPricing<T>(p: { perHour: string; overheadPct: number; taxPct: number }, make: () => Promise<T>): Promise<T> {
  const workshop = (await currentWorkshop())!;
  const saved = structuredClone(workshop.settings);
  const rate = (await LabourRate.findOne({ where: { key: saved.pricing.polisherRate } }))!;
  const savedRate = rate.perHour;
  await rate.update({ perHour: p.perHour });
  await workshop.update({ settings: { ...saved, pricing: { ...saved.pricing, overheadPct: p.overheadPct, taxPct: p.taxPct } } });
  await built.caches.settle();
  try {
    return await make();
  } finally {
    await rate.update({ perHour: savedRate });
    await workshop.update({ settings: saved });
    await built.caches.settle();
  }
}

/** A job from a new accepted quote, its first stage also using `materialKey`, booked on a Monday of its own. */
async function bookedJob(weeksAhead: number, materialKey?: string, grams = 1500): Promise<JobDetail> {
  const quoteId = await acceptedQuote();
  const created = await post(planner, '/api/jobs', { quoteId }).expect(201);
  const job = created.body as JobDetail;
  if (materialKey) {
    const row = (await Job.findByPk(job.id))!;
    const stages = structuredClone(row.stages);
    stages[0]!.materials.push({ material: materialKey, quantity: grams, unit: 'g' });
    await row.update({ stages });
  }
  const start = addDays(mondayOf(today), weeksAhead * 7);
  const booked = await post(planner, `/api/jobs/${job.id}/booking`, { mode: 'date', start, confirm: true });
  expect(booked.status, JSON.stringify(booked.body)).toBe(200);
  return booked.body as JobDetail;
}

async function markNextDone(job: JobDetail, body: Record<string, unknown>): Promise<JobDetail> {
  const detail = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
  const next = detail.sessions.find((s) => !s.done)!;
  const res = await post(planner, `/api/jobs/${job.id}/sessions/${next.id}/done`, {
    actualEnd: `${yesterday}T16:00`,
    temperatureC: 20,
    humidityPct: 50,
    notes: 'Went as planned',
    ...body,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.job as JobDetail;
}

beforeAll(async () => {
  services = await startServices();
  [owner, planner, estimator, sales] = await Promise.all([signInAs(app, 'owner'), signInAs(app, 'workshop'), signInAs(app, 'estimator'), signInAs(app, 'sales')]);
});

describe('job costing', () => {
  it('gives the hand-worked margin to the penny', async () => {
    const { material, pack } = await ownMaterial('Costing', 500, '12.40');
    // The fixture: estimated at 40.00 an hour with 15 % overhead and 20 % tax; agreed at 1,234.56.
    const job = await withPricing({ perHour: '40.00', overheadPct: 15, taxPct: 20 }, () => bookedJob(30));
    const row = (await Job.findByPk(job.id))!;
    const quote = (await Quote.findByPk(row.quoteId))!;
    // The deposit follows the agreed total (a rule of the quotes table): 1234.56 × 30 % = 370.37 (370.368 rounded).
    await quote.update({ acceptedTotal: '1234.56', acceptedDeposit: '370.37', depositPct: 30, acceptedExtras: [] });
    const revision = (await EstimateRevision.findByPk(row.revisionId))!;
    expect(revision.result.labour.perHour).toBe('40.00');
    expect(revision.catalog.pricing.overheadPct).toBe(15);

    await markNextDone(job, { actualHours: 3.25, materials: [{ materialId: material.id, packId: pack.id, packs: 2 }] });
    await markNextDone(job, { actualHours: 2.5, materials: [{ materialId: material.id, packId: pack.id, packs: 0.5 }] });

    const res = await owner.agent.get(`/api/jobs/${job.id}/costing`).expect(200);
    const c = res.body as JobCosting;
    // Hours 3.25 + 2.5 = 5.75; labour 5.75 × 40.00 = 230.00.
    expect(c.labour).toEqual({ hours: 5.75, perHour: '40.00', cost: '230.00' });
    // Materials: 2 × 12.40 = 24.80 and 0.5 × 12.40 = 6.20, together 31.00.
    expect(c.materials.lines.map((l) => l.cost)).toEqual(['24.80', '6.20']);
    expect(c.materials.cost).toBe('31.00');
    // Overhead 15 % of (230.00 + 31.00) = 261.00 × 0.15 = 39.15.
    expect(c.overhead).toEqual({ pct: 15, cost: '39.15' });
    expect(c.cost).toBe('300.15');
    // Without tax: 1234.56 × 100 / 120 = 1028.80. Margin 1028.80 − 300.15 = 728.65, 728.65 / 1028.80 = 70.8 %.
    expect(c.agreedPrice).toBe('1234.56');
    expect(c.agreedNet).toBe('1028.80');
    expect(c.realisedMargin).toBe('728.65');
    expect(c.realisedMarginPct).toBe(70.8);
    expect(c.sessionsDone).toBe(2);
    // The estimated side is there to compare with, in money strings.
    expect(c.estimated.margin).toMatch(/^-?\d+\.\d{2}$/);
    expect(c.account).toEqual({ received: '0.00', credited: '0.00', balance: '1234.56', wholeAgreement: false });

    // Payments: the deposit of 370.37 by bank transfer (it marks the deposit paid) and 500.00 in cash; then the tax
    // invoice and a credit note of 34.56 for a touch-up not done. Invoices are issued once accepted for this part.
    const stage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage as string;
    await owner.agent.put('/api/accounts/settings').set('x-csrf-token', owner.csrf).send({ invoiceStage: 'accepted' }).expect(200);
    try {
      const paid = await post(sales, `/api/accounts/quotes/${quote.id}/payments`, { method: 'bank-transfer', amount: '370.37', receivedOn: yesterday, reference: 'Deposit transfer' }).expect(201);
      expect(paid.body.quote.state).toBe('deposit-paid');
      await post(sales, `/api/accounts/quotes/${quote.id}/payments`, { method: 'cash', amount: '500.00', receivedOn: yesterday }).expect(201);
      const invoiced = await post(sales, `/api/accounts/quotes/${quote.id}/invoice`, {}).expect(201);
      const invoice = (invoiced.body.documents as { id: number; kind: string }[]).find((x) => x.kind === 'invoice')!;
      await post(sales, `/api/accounts/documents/${invoice.id}/credit-notes`, { amount: '34.56', reason: 'Touch-up on the lid not done' }).expect(201);
    } finally {
      await owner.agent.put('/api/accounts/settings').set('x-csrf-token', owner.csrf).send({ invoiceStage: stage }).expect(200);
    }
    const paidUp = (await owner.agent.get(`/api/jobs/${job.id}/costing`).expect(200)).body as JobCosting;
    // Received 370.37 + 500.00 = 870.37; owed 1234.56 − 34.56 − 870.37 = 329.63.
    expect(paidUp.account).toEqual({ received: '870.37', credited: '34.56', balance: '329.63', wholeAgreement: false });
    // The credit lowers the price: (1234.56 − 34.56) × 100 / 120 = 1000.00; margin 1000.00 − 300.15 = 699.85,
    // 699.85 / 1000.00 = 69.985 % → 70.0 %. The costs are unchanged.
    expect(paidUp.credited).toBe('34.56');
    expect(paidUp.agreedNet).toBe('1000.00');
    expect(paidUp.cost).toBe('300.15');
    expect(paidUp.realisedMargin).toBe('699.85');
    expect(paidUp.realisedMarginPct).toBe(70);

    // The two sessions' materials feed the estimates-against-the-bench report for their month, in money.
    const accuracy = (await owner.agent.get(`/api/reports/estimate-accuracy?from=${yesterday}&to=${yesterday}`).expect(200)).body as EstimateAccuracy;
    const group = accuracy.rows.find((r) => r.system === 'full-repolish' && r.pieceKind === 'grand' && r.month === yesterday.slice(0, 7))!;
    expect(group.materialSessions).toBeGreaterThanOrEqual(2);
    expect(Number(group.actualMaterials)).toBeGreaterThanOrEqual(31);
    expect(group.materialsRatio).toBeCloseTo(Number(group.actualMaterials) / Number(group.estimatedMaterials), 2);

    // Staff only: the owner reads costing, no other role.
    for (const s of [planner, estimator, sales]) expect((await s.agent.get(`/api/jobs/${job.id}/costing`)).status).toBe(403);
    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });

  it('refuses materials that are not the pack\u2019s, naming the field, and keeps the session open', async () => {
    const { material } = await ownMaterial('Refused', 250, '5.00');
    const other = await ownMaterial('Other', 100, '3.00');
    const job = await bookedJob(31);
    const detail = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    const next = detail.sessions[0]!;
    const res = await post(planner, `/api/jobs/${job.id}/sessions/${next.id}/done`, {
      actualEnd: `${yesterday}T16:00`, actualHours: 2, temperatureC: 20, humidityPct: 50, notes: 'ok',
      materials: [{ materialId: material.id, packId: other.pack.id, packs: 1 }],
    });
    expect(res.status).toBe(400);
    expect(res.body.field).toBe('materials.0.packId');
    const after = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    expect(after.sessions[0]!.done).toBe(false);
    const negative = await post(planner, `/api/jobs/${job.id}/sessions/${next.id}/done`, {
      actualEnd: `${yesterday}T16:00`, actualHours: 2, temperatureC: 20, humidityPct: 50, notes: 'ok',
      materials: [{ materialId: material.id, packId: other.pack.id, packs: -1 }],
    });
    expect(negative.status).toBe(400);
    expect(negative.body.field).toBe('materials.0.packs');
    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });
});

describe('the stock round trip: forecast → order → receive → use → count', () => {
  it('orders the shortfall once per supplier, receives at the price paid, uses and counts', async () => {
    const { material, pack, supplier } = await ownMaterial('Round trip', 500, '12.40');
    // 1500 g over the first stage; the forecast's window reaches the job.
    const job = await bookedJob(20, material.key, 1500);

    const before = (await planner.agent.get('/api/stock?weeks=26').expect(200)).body as StockOverview;
    const mine = before.rows.find((r) => r.materialId === material.id)!;
    expect(mine.quantity).toBe(0);
    expect(mine.needBeforeDelivery).toBeGreaterThan(0);
    expect(mine.low).toBe(true);

    // Two planners turn the forecast into orders at once: the shortfall is ordered once.
    const [a, b] = await Promise.all([post(planner, '/api/purchase-orders/from-forecast', { weeks: 26 }), post(owner, '/api/purchase-orders/from-forecast', { weeks: 26 })]);
    expect(a.status).toBe(201);
    expect(b.status).toBe(201);
    const orders = [...(a.body as PurchaseOrderDto[]), ...(b.body as PurchaseOrderDto[])].filter((o) => o.supplier === supplier);
    expect(orders).toHaveLength(1);
    const order = orders[0]!;
    const line = order.lines.find((l) => l.materialId === material.id)!;
    expect(line.packs * line.packSize).toBeGreaterThanOrEqual(mine.needBeforeDelivery);
    expect(line.packPrice).toBe('12.40');
    expect(order.state).toBe('draft');

    const pdf = await planner.agent.get(`/api/purchase-orders/${order.id}/pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');

    const expectedOn = addDays(today, 7);
    const bad = await post(planner, `/api/purchase-orders/${order.id}/send`, { to: 'not an address', expectedOn });
    expect(bad.status).toBe(400);
    expect(bad.body.field).toBe('to');
    const sent = await post(planner, `/api/purchase-orders/${order.id}/send`, { to: `orders.${process.pid}@example.com`, expectedOn, message: 'Dear team,\n\nPlease send these.\n\nKind regards,\nSam' });
    expect(sent.status, JSON.stringify(sent.body)).toBe(200);
    expect(sent.body.state).toBe('sent');
    expect(sent.body.delivery.delivered).toBe(true);
    const message = (await OutboxMessage.findByPk(sent.body.delivery.outboxId as number))!;
    expect(message.attachmentName).toBe(`${order.number}.pdf`);
    expect(message.textBody).toContain(order.number);
    expect(services.mail!.messages.some((m) => m.to.includes(`orders.${process.pid}@example.com`))).toBe(true);

    // On order now: the next delivery bounds the need, and nothing more is ordered for it.
    const waiting = ((await planner.agent.get('/api/stock?weeks=26').expect(200)).body as StockOverview).rows.find((r) => r.materialId === material.id)!;
    expect(waiting.nextDelivery).toBe(expectedOn);
    expect(waiting.onOrder).toBe(line.packs * line.packSize);
    const again = (await post(planner, '/api/purchase-orders/from-forecast', { weeks: 26 }).expect(201)).body as PurchaseOrderDto[];
    expect(again.some((o) => o.supplier === supplier)).toBe(false);

    // Received at a different price, recorded as the pack's new price from the day.
    const receive = await post(planner, `/api/purchase-orders/${order.id}/receive`, {
      receivedOn: today,
      recordPrices: true,
      lines: order.lines.map((l) => ({ lineId: l.id, packs: l.packs, ...(l.id === line.id ? { paidPrice: '11.90' } : {}) })),
    });
    expect(receive.status, JSON.stringify(receive.body)).toBe(200);
    expect(receive.body.state).toBe('received');
    const newPrice = await PackPrice.findOne({ where: { packId: pack.id, effectiveFrom: today } });
    expect(newPrice?.price).toBe('11.9000');
    expect(newPrice?.source).toBe(`purchase order ${order.number}`);
    const received = line.packs * 500;
    let level = ((await planner.agent.get('/api/stock?weeks=26').expect(200)).body as StockOverview).rows.find((r) => r.materialId === material.id)!;
    expect(level.quantity).toBe(received);
    expect(level.onOrder).toBe(0);
    // Received twice is refused.
    expect((await post(planner, `/api/purchase-orders/${order.id}/receive`, { receivedOn: today, lines: [{ lineId: line.id, packs: 1 }] })).status).toBe(409);

    // Use: the first session's share prefilled in packs, taken as it is.
    const detail = (await planner.agent.get(`/api/jobs/${job.id}`).expect(200)).body as JobDetail;
    const first = detail.sessions[0]!;
    const prefill = (await planner.agent.get(`/api/jobs/${job.id}/sessions/${first.id}/materials`).expect(200)).body as SessionMaterialLine[];
    const use = prefill.find((m) => m.materialId === material.id)!;
    expect(use.packId).toBe(pack.id);
    expect(use.packs).toBeCloseTo(use.estimated / 500, 3);
    await markNextDone(job, { actualHours: 2, materials: prefill.map((m) => ({ materialId: m.materialId, packId: m.packId, packs: m.packs })) });
    level = ((await planner.agent.get('/api/stock?weeks=26').expect(200)).body as StockOverview).rows.find((r) => r.materialId === material.id)!;
    const afterUse = Math.round((received - use.packs * 500) * 1000) / 1000;
    expect(level.quantity).toBeCloseTo(afterUse, 3);

    // Count: the shelf holds one tin more than the ledger says; the difference is recorded with the reason.
    const counted = Math.round((afterUse / 500 + 1) * 1000) / 1000;
    const noReason = await post(planner, '/api/stock/counts', { materialId: material.id, packId: pack.id, counted, reason: '' });
    expect(noReason.status).toBe(400);
    expect(noReason.body.field).toBe('reason');
    const count = await post(planner, '/api/stock/counts', { materialId: material.id, packId: pack.id, counted, reason: '=HYPERLINK("http://example.com","spilt")' });
    expect(count.status, JSON.stringify(count.body)).toBe(201);
    expect(count.body.kind).toBe('count');
    expect(count.body.quantity).toBeCloseTo(500, 3);

    const ledger = (await planner.agent.get(`/api/stock/movements?materialId=${material.id}`).expect(200)).body as StockMovementPage;
    expect(ledger.items.map((m) => m.kind)).toEqual(['count', 'use', 'receive']);
    const [c, u, r] = ledger.items;
    expect(r!.value).toBe((line.packs * 11.9).toFixed(2));
    expect(r!.order?.number).toBe(order.number);
    // Used at the price paid (11.90 a tin), not the old list price.
    expect(u!.value).toBe((Math.round(use.packs * 1000) / 1000 * 11.9).toFixed(2));
    expect(u!.job?.number).toBe(job.number);
    expect(c!.balanceAfter).toBeCloseTo(counted * 500, 3);

    // The ledger's CSV keeps the count's reason as text, not a formula.
    const csv = await owner.agent.get(`/api/stock/movements.csv?materialId=${material.id}`).expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text).toContain(`"'=HYPERLINK(""http://example.com"",""spilt"")"`);
    expect((await planner.agent.get(`/api/stock/movements.csv?materialId=${material.id}`)).status).toBe(403);

    await post(planner, `/api/jobs/${job.id}/cancel`, {}).expect(200);
  });
});
