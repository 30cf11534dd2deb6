/**
 * A demo workshop's planning (`DEMO_PLANNING` for the first, `DEMO_PLANNING_2`, smaller, for the second). The first's: three polishers, two finished jobs with their actual hours (for the actuals
 * report), a job in progress with sessions done (one of them late, so the rest of it moved), a job booked at the
 * earliest start, and an accepted quote waiting to be booked. Dates are laid relative to the day the demo is
 * loaded, so the board is never empty on first start. All invented. Idempotent: keyed on the customers' e-mail
 * addresses (and polishers are added only when there are none).
 */
import type { Sequelize } from 'sequelize';
import { fromMinutes, toMinutes } from '@shared/calc';
import type { EstimateInput } from '@shared/schemas/calc';
import type { JobStageKind } from '@shared/schemas/planning';
import type { Role } from '@shared/schemas/auth';
import type { PieceKind } from '@shared/schemas/customers';
import { CreateQuoteSchema } from '@shared/schemas/quotes';
import { Customer, Estimate, Material, MaterialStock, Piece, Polisher, Quote, QuoteLine, User } from '../models';
import { createEstimate, setEstimateState } from '../services/estimates';
import { bookJob, createJob, getJob, markSessionDone } from '../services/planning';
import { addDays, localNow } from '../services/planning-context';
import { createQuote } from '../services/quotes';
import { demoEmailOf } from './demo-work';

/** What the demo shelf holds, in each material's own unit. */
const STOCK: Record<string, number> = { 'shellac-flakes': 500, spirit: 4000, wadding: 1000, 'polishing-cloth': 20, 'abrasive-sheet': 10, wax: 400 };

const POLISHERS = [
  // A full day's opening hours (08:00 to 16:30), so that a session that fits in one day finds someone to do it.
  { name: 'Hester Quarrington', hoursPerDay: 8.5, daysOff: [] as string[] },
  { name: 'Jory Penhallow', hoursPerDay: 8.5, daysOff: [] as string[] },
  { name: 'Marigold Tennant', hoursPerDay: 6, daysOff: [] as string[] },
];

type Plan = { kind: 'finished'; startDaysAgo: number } | { kind: 'in-progress'; startDaysAgo: number } | { kind: 'booked' } | { kind: 'accepted' };

export interface DemoPlanned {
  customer: { name: string; email: string; phone: string; address: string };
  piece: { kind: PieceKind; description: string; maker: string; year: number; dimensions: Record<string, string>; conditionNotes: string };
  input: EstimateInput;
  plan: Plan;
}

const JOBS: DemoPlanned[] = [
  {
    customer: { name: 'Philippa Ravensworth', email: 'philippa.ravensworth@example.com', phone: '01632 960 301', address: '9 Weaver\u2019s Row\nCalderbrook CB3 4CK' },
    piece: { kind: 'grand', description: 'Boudoir grand in figured rosewood', maker: 'Ashdown & Crale', year: 1911, dimensions: { length: '5 ft 8 in', width: '145 cm', rimHeight: '32 cm' }, conditionNotes: 'Finish perished on the lid; old repairs on the rim.' },
    input: { piece: { template: 'grand', dimensions: { length: '5 ft 8 in', width: '145 cm', rimHeight: '32 cm' }, species: 'rosewood', veneered: true }, system: 'full-repolish' },
    plan: { kind: 'finished', startDaysAgo: 84 },
  },
  {
    customer: { name: 'Tobias Fairweather-Lund', email: 'tobias.fairweatherlund@example.com', phone: '01632 960 662', address: 'Glebe Cottage\nOsterleigh OS7 2MV' },
    piece: { kind: 'square', description: 'Mahogany square piano with satinwood banding', maker: 'Pellworth of Candle Lane', year: 1815, dimensions: { length: '165 cm', width: '60 cm', height: '85 cm' }, conditionNotes: 'Dull, ring-marked top; sound veneer.' },
    input: { piece: { template: 'square', dimensions: { length: '165 cm', width: '60 cm', height: '85 cm' }, species: 'mahogany', veneered: true }, system: 'full-repolish' },
    plan: { kind: 'finished', startDaysAgo: 63 },
  },
  {
    customer: { name: 'Imogen Blackthorn', email: 'imogen.blackthorn@example.com', phone: '01632 960 774', address: '22 Chandlery Walk\nHarrowgate Quay HQ1 8KO' },
    piece: { kind: 'grand', description: 'Burr walnut baby grand', maker: 'Vossberg & Lyle', year: 1927, dimensions: { length: '5 ft 2 in', width: '142 cm', rimHeight: '31 cm' }, conditionNotes: 'Crazed lacquer over the original shellac; to come back to a full gloss.' },
    input: { piece: { template: 'grand', dimensions: { length: '5 ft 2 in', width: '142 cm', rimHeight: '31 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish' },
    plan: { kind: 'in-progress', startDaysAgo: 4 },
  },
  {
    customer: { name: 'Rufus Amberley', email: 'rufus.amberley@example.com', phone: '01632 960 519', address: 'The Granary, Mill End\nWhitlow WH4 6VI' },
    piece: { kind: 'furniture', description: 'Mahogany bow-front cabinet', maker: 'Unknown', year: 1800, dimensions: { height: '92 cm', width: '110 cm', depth: '48 cm' }, conditionNotes: 'Blackened old polish; some lifting cross-banding, already glued.' },
    input: { piece: { template: 'cabinet', dimensions: { height: '92 cm', width: '110 cm', depth: '48 cm' }, species: 'mahogany', veneered: true }, system: 'full-repolish' },
    plan: { kind: 'booked' },
  },
  {
    customer: { name: 'Clemency Hartigan', email: 'clemency.hartigan@example.com', phone: '01632 960 147', address: '5 Lantern Yard\nBrisley BR2 5OC' },
    piece: { kind: 'upright', description: 'Rosewood cottage upright', maker: 'Dunmore Brothers', year: 1898, dimensions: { height: '122 cm', width: '140 cm', depth: '60 cm' }, conditionNotes: 'Finish worn through on the top and cheeks.' },
    input: { piece: { template: 'upright', dimensions: { height: '122 cm', width: '140 cm', depth: '60 cm' }, species: 'rosewood', veneered: true }, system: 're-body' },
    plan: { kind: 'accepted' },
  },
];

/** How the demo's actual hours ran against the estimate, by stage kind (bodying ran long, cutting back longer). */
const ACTUAL_FACTOR: Partial<Record<JobStageKind, number>> = { strip: 0.9, prepare: 1.05, 'grain-fill': 1.1, body: 1.18, stiffen: 1.1, 'cut-back': 1.25, burnish: 1.05 };

/** A small, repeatable wobble so the demo's hours do not all look alike. */
function wobble(i: number): number {
  return 1 + (((i * 37) % 11) - 5) / 100;
}

const CLIMATE = [
  { temperatureC: 19.5, humidityPct: 52 },
  { temperatureC: 20.5, humidityPct: 48 },
  { temperatureC: 18.5, humidityPct: 61 },
  { temperatureC: 21, humidityPct: 45 },
];

const NOTES: Partial<Record<JobStageKind, string>> = {
  strip: 'Old finish came away cleanly; a little stubborn in the mouldings.',
  prepare: 'Sanded through the grits; dust off with a tack rag.',
  'grain-fill': 'Pores well filled; oil kept light.',
  fad: 'Sealing coats even; no drag.',
  body: 'Rubber charged light; good build, no ridges.',
  stiffen: 'Oil taken off well.',
  'spirit-off': 'Spirited off to a clear gloss.',
  'cut-back': 'Cut back flat; a few pinholes filled first.',
  burnish: 'Burnished to a deep shine.',
  wax: 'Waxed and buffed.',
};

async function accepted(sequelize: Sequelize, job: DemoPlanned, users: { estimator: User; sales: User }): Promise<number> {
  const customer = await Customer.create({ ...job.customer, notes: null });
  const piece = await Piece.create({ customerId: customer.id, ...job.piece, serial: null });
  const estimate = await createEstimate(sequelize, users.estimator.id, { customerId: customer.id, pieceId: piece.id, input: job.input, note: 'Measured in the workshop' });
  await setEstimateState(sequelize, users.estimator.id, estimate.id, 'priced');
  const quote = await createQuote(sequelize, { id: users.sales.id, role: 'sales' }, estimate.id, CreateQuoteSchema.parse({ message: 'Thank you for trusting us with it.' }));
  // The customer's acceptance through the signed link is set directly here: the demo sends no mail.
  await Quote.update(
    { state: 'accepted', acceptedAt: new Date(), acceptedName: job.customer.name, acceptedIp: '127.0.0.1', acceptedExtras: [], acceptedTotal: quote.total, acceptedDeposit: quote.deposit, sentAt: new Date() },
    { where: { id: quote.id } },
  );
  await QuoteLine.update({ chosen: true, agreed: true }, { where: { quoteId: quote.id } });
  await Estimate.update({ state: 'accepted' }, { where: { id: estimate.id } });
  return quote.id;
}

/** Marks sessions done in order, as planned, with the demo's actual hours; `slipAt` finishes that one late. */
async function progress(sequelize: Sequelize, userId: number, jobId: number, opts: { until: string | null; slipAt?: number }): Promise<number> {
  let done = 0;
  for (;;) {
    const job = await getJob(jobId);
    const next = job.sessions.find((s) => !s.done);
    if (!next || !next.end || (opts.until !== null && next.end > opts.until)) return done;
    const late = opts.slipAt === next.index;
    const end = late ? fromMinutes(toMinutes(next.end) + 90) : next.end;
    await markSessionDone(sequelize, userId, jobId, next.id, {
      actualEnd: end,
      actualHours: Math.round(next.handsOnHours * (ACTUAL_FACTOR[next.stageKind] ?? 1) * wobble(next.index) * 4) / 4,
      ...CLIMATE[next.index % CLIMATE.length]!,
      notes: late ? 'Took longer: the room was cold in the morning and the rubber dragged.' : (NOTES[next.stageKind] ?? 'As planned.'),
    });
    done++;
  }
}

/** What a demo workshop plans: its polishers and the jobs of its customers. */
export interface DemoPlanning {
  polishers: readonly { name: string; hoursPerDay: number; daysOff: string[] }[];
  jobs: readonly DemoPlanned[];
}

export const DEMO_PLANNING: DemoPlanning = { polishers: POLISHERS, jobs: JOBS };

/** The second demo workshop: two polishers, one finished job, one booked, one accepted quote. */
export const DEMO_PLANNING_2: DemoPlanning = {
  polishers: [
    { name: 'Griselda Fenwick-Oddie', hoursPerDay: 8.5, daysOff: [] },
    { name: 'Ptolemy Arkwright', hoursPerDay: 7, daysOff: [] },
  ],
  jobs: [
    {
      customer: { name: 'Honoria Pendlebrook', email: 'honoria.pendlebrook@example.net', phone: '01632 961 602', address: 'Lark Rise, Mill Hill\nQuernstone Parva QP3 1MC' },
      piece: { kind: 'grand', description: 'Rosewood drawing-room grand', maker: 'Castellane & Webb', year: 1902, dimensions: { length: '6 ft 1 in', width: '4 ft 10 in', rimHeight: '13 in' }, conditionNotes: 'Lid and fall ring-marked; rim polish perished.' },
      input: { piece: { template: 'grand', dimensions: { length: '6 ft 1 in', width: '4 ft 10 in', rimHeight: '13 in' }, species: 'rosewood', veneered: true }, system: 'full-repolish' },
      plan: { kind: 'finished', startDaysAgo: 70 },
    },
    {
      customer: { name: 'Ambrose Kettleworth', email: 'ambrose.kettleworth@example.net', phone: '01632 961 738', address: '4 Tanners\u2019 Steps\nSallowfield SF2 9KO' },
      piece: { kind: 'furniture', description: 'Oak bureau with fall front', maker: 'Unknown', year: 1760, dimensions: { height: '3 ft 4 in', width: '3 ft', depth: '20 in' }, conditionNotes: 'Old polish dark and sticky; fall front sound.' },
      input: { piece: { template: 'cabinet', dimensions: { height: '3 ft 4 in', width: '3 ft', depth: '20 in' }, species: 'oak', veneered: false }, system: 'full-repolish' },
      plan: { kind: 'booked' },
    },
    {
      customer: { name: 'Seraphina Dunnock', email: 'seraphina.dunnock@example.net', phone: '01632 961 115', address: 'Holly Lodge\nQuernstone Parva QP4 6VC' },
      piece: { kind: 'square', description: 'Mahogany square piano on turned legs', maker: 'Brightmoor of Haymarket Row', year: 1832, dimensions: { length: '5 ft 6 in', width: '2 ft', height: '34 in' }, conditionNotes: 'Finish worn on the lid edges; cross-banding sound.' },
      input: { piece: { template: 'square', dimensions: { length: '5 ft 6 in', width: '2 ft', height: '34 in' }, species: 'mahogany', veneered: true }, system: 're-body' },
      plan: { kind: 'accepted' },
    },
  ],
};

/** Loads `planning` under the current workshop, done by its people (users of `users`, found by role). */
export async function loadDemoPlanning(
  sequelize: Sequelize,
  demo: { users: readonly { email: string; role: Role }[]; planning: DemoPlanning },
  log: (m: string) => void = () => {},
): Promise<void> {
  const userOf = (role: Role) => User.findOne({ where: { email: demoEmailOf(demo.users, role) } });
  const [estimator, sales, planner] = await Promise.all([userOf('estimator'), userOf('sales'), userOf('workshop')]);
  if (!estimator || !sales || !planner) return;
  if ((await Polisher.count()) === 0) {
    for (const p of demo.planning.polishers) await Polisher.create({ ...p, active: true });
    log(`${demo.planning.polishers.length} polishers added`);
  }
  if ((await MaterialStock.count()) === 0) {
    for (const m of await Material.findAll({ where: { key: Object.keys(STOCK) } })) {
      await MaterialStock.create({ materialId: m.id, quantity: STOCK[m.key]!.toFixed(3), updatedBy: null });
    }
  }
  const now = localNow();
  const today = now.slice(0, 10);
  for (const job of demo.planning.jobs) {
    if (await Customer.findOne({ where: { email: job.customer.email } })) continue;
    const quoteId = await accepted(sequelize, job, { estimator, sales });
    if (job.plan.kind === 'accepted') {
      log(`${job.customer.name}: quote accepted, waiting to be booked`);
      continue;
    }
    const made = await createJob(sequelize, planner.id, { quoteId });
    if (job.plan.kind === 'booked') {
      const booked = await bookJob(sequelize, planner.id, made.id, { mode: 'earliest', confirm: false });
      log(`${made.number} booked from ${booked.roomStart}`);
      continue;
    }
    const start = addDays(today, -job.plan.startDaysAgo);
    await bookJob(sequelize, planner.id, made.id, { mode: 'date', start, confirm: true }, { now: `${start}T00:00`, allowPast: true });
    const count =
      job.plan.kind === 'finished'
        ? await progress(sequelize, estimator.id, made.id, { until: null })
        : await progress(sequelize, estimator.id, made.id, { until: now, slipAt: 1 });
    log(`${made.number}: ${count} sessions done`);
  }
}
