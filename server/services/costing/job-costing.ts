/**
 * What a job really cost, for the owner. All money is decimal and every figure is rounded to the cent once, where
 * it is made:
 *
 * - agreed price: what the customer accepted, tax included (the quote's accepted total with the extras taken when
 *   the job is the quote's one chosen piece, else its line's total); without tax: price × 100 / (100 + tax %).
 * - labour: actual hours of the sessions done × the hourly rate the job was estimated at.
 * - materials: the ledger's materials used for the job, at the price paid for their packs.
 * - overhead: the workshop's overhead percentage (as set when the job was estimated) of labour and materials.
 * - credit notes issued on the agreement lower the agreed price, when the job is the agreement's only piece.
 * - realised margin: (agreed price − credited) without tax − labour − materials − overhead, against the estimated margin worked
 *   out the same way from the quoted labour, materials at cost and overhead.
 */
import Decimal from 'decimal.js';
import { Op } from 'sequelize';
import type { EstimateAccuracy, EstimateAccuracyRow, JobCosting } from '@shared/schemas/stock';
import { problems } from '../../http/problem';
import { Estimate, EstimateRevision, FinishingSystem, Job, JobSession, Piece, Quote, QuoteLine, StockMovement } from '../../models';
import { figuresOf } from '../accounts';
import { jobUse } from '../stock/ledger';
import { sessionShare } from '@shared/calc';

const cents = (d: Decimal.Value) => new Decimal(d).toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
const pct = (part: Decimal, whole: Decimal) => (whole.isZero() ? null : part.div(whole).times(100).toDecimalPlaces(1, Decimal.ROUND_HALF_UP).toNumber());

/** The price without tax: price × 100 / (100 + tax %), to the cent. */
export function withoutTax(price: Decimal.Value, taxPct: number): Decimal {
  return cents(new Decimal(price).times(100).div(new Decimal(100).plus(taxPct)));
}

export async function jobCosting(jobId: number): Promise<JobCosting> {
  const job = await Job.findByPk(jobId);
  if (!job) throw problems.notFound('Job');
  const [quote, line, revision, sessions] = await Promise.all([
    Quote.findByPk(job.quoteId),
    job.quoteLineId ? QuoteLine.findByPk(job.quoteLineId) : Promise.resolve(null),
    EstimateRevision.findByPk(job.revisionId),
    JobSession.findAll({ where: { jobId }, order: [['idx', 'ASC']] }),
  ]);
  if (!quote || !revision) throw problems.notFound('The job\u2019s quote');
  const chosenLines = await QuoteLine.count({ where: { quoteId: quote.id, chosen: true } });
  const onlyPiece = chosenLines <= 1;
  const pricing = line?.pricing ?? quote.pricing;
  const taxPct = pricing.taxPct;
  const quoted = line?.total ?? quote.total;
  const agreed = onlyPiece ? cents(quote.acceptedTotal ?? quote.total) : cents(quoted);
  const variations = onlyPiece
    ? quote.extras.filter((x) => (quote.acceptedExtras ?? []).includes(x.id)).map((x) => ({ label: x.label, amount: cents(x.priceWithTax).toFixed(2) }))
    : [];
  // The account (docs/accounts.md): credit notes lower the price the job earns, when the job is the agreement's only
  // piece (a credit on an agreement of several pieces is not the job's alone); payments show what came in.
  const figures = quote.acceptedTotal !== null ? await figuresOf(quote) : null;
  const credited = onlyPiece && figures ? cents(figures.credited) : new Decimal(0);
  const agreedNet = withoutTax(agreed.minus(credited), taxPct);

  const perHour = new Decimal(revision.result.labour.perHour);
  const overheadPct = revision.catalog.pricing.overheadPct;
  const done = sessions.filter((s) => s.done);
  const hours = done.reduce((t, s) => t.plus(s.actualHours ?? 0), new Decimal(0));
  const labour = cents(hours.times(perHour));
  const used = await jobUse(jobId);
  const values = await StockMovement.findAll({ where: { jobId, kind: 'use' }, attributes: ['id', 'value'] });
  const valueOf = new Map(values.map((v) => [v.id, v.value]));
  const materialLines = used.map((u) => ({ material: u.material, unit: u.unit, quantity: -u.quantity, packs: u.packs, pack: u.pack, cost: cents(valueOf.get(u.id) ?? 0).toFixed(2) }));
  const materials = materialLines.reduce((t, l) => t.plus(l.cost), new Decimal(0));
  const overhead = cents(labour.plus(materials).times(overheadPct).div(100));
  const cost = labour.plus(materials).plus(overhead);
  const margin = agreedNet.minus(cost);

  const amount = (code: string) => pricing.lines.filter((l) => l.code === code).reduce((t, l) => t.plus(l.amount), new Decimal(0));
  const estNet = withoutTax(quoted, taxPct);
  const estLabour = cents(amount('labour'));
  const estMaterials = cents(revision.result.price.internal.materialsCost);
  const estOverhead = cents(amount('overhead'));
  const estMargin = estNet.minus(estLabour).minus(estMaterials).minus(estOverhead);
  const estHours = sessions.reduce((t, s) => t.plus(s.estimatedHours), new Decimal(0));

  return {
    job: { id: job.id, number: job.number, title: job.title, state: job.state },
    currency: quote.currency,
    taxPct,
    agreedPrice: agreed.toFixed(2),
    agreedNet: agreedNet.toFixed(2),
    credited: credited.toFixed(2),
    account: figures
      ? { received: new Decimal(figures.paid).minus(figures.refunded).toFixed(2), credited: figures.credited, balance: figures.balance, wholeAgreement: !onlyPiece }
      : null,
    variations,
    labour: { hours: hours.toNumber(), perHour: perHour.toFixed(2), cost: labour.toFixed(2) },
    materials: { lines: materialLines, cost: materials.toFixed(2) },
    overhead: { pct: overheadPct, cost: overhead.toFixed(2) },
    cost: cost.toFixed(2),
    realisedMargin: margin.toFixed(2),
    realisedMarginPct: pct(margin, agreedNet),
    estimated: {
      net: estNet.toFixed(2),
      labour: estLabour.toFixed(2),
      materials: estMaterials.toFixed(2),
      overhead: estOverhead.toFixed(2),
      margin: estMargin.toFixed(2),
      marginPct: pct(estMargin, estNet),
      hours: estHours.toDecimalPlaces(2).toNumber(),
    },
    sessionsDone: done.length,
    sessionsTotal: sessions.length,
  };
}

/**
 * Estimated against actual hours and materials of the sessions done in a period, by month, finishing system and piece
 * kind: how far the estimates fall from the bench. Extra work the customer took is left out, as in the calibration.
 *
 * Materials are compared in money, on the sessions whose materials were recorded when they were marked done: the
 * estimate's share of each material for the session (as the form prefills it) at the cost per unit the estimate
 * used, against what was recorded at the price paid. A session marked done without its materials says nothing
 * about them and is left out of the materials columns only.
 */
export async function estimateAccuracy(q: { from: string; to: string }): Promise<EstimateAccuracy> {
  const sessions = await JobSession.findAll({
    where: { done: true, actualHours: { [Op.ne]: null }, stageKind: { [Op.ne]: 'extra' }, actualEnd: { [Op.gte]: q.from, [Op.lt]: `${q.to}T99` } },
    attributes: ['id', 'jobId', 'stage', 'session', 'estimatedHours', 'actualHours', 'actualEnd'],
  });
  const jobs = sessions.length ? await Job.findAll({ where: { id: [...new Set(sessions.map((s) => s.jobId))] }, attributes: ['id', 'estimateId', 'revisionId', 'stages'] }) : [];
  const revisions = jobs.length ? await EstimateRevision.findAll({ where: { id: jobs.map((j) => j.revisionId) }, attributes: ['id', 'result'] }) : [];
  const estimates = jobs.length ? await Estimate.findAll({ where: { id: jobs.map((j) => j.estimateId) }, attributes: ['id', 'pieceId'] }) : [];
  const pieces = estimates.length ? await Piece.findAll({ where: { id: estimates.map((e) => e.pieceId) }, attributes: ['id', 'kind'] }) : [];
  const uses = sessions.length ? await StockMovement.findAll({ where: { sessionId: sessions.map((s) => s.id), kind: 'use' }, attributes: ['sessionId', 'value'] }) : [];
  const usedValue = new Map<number, Decimal>();
  for (const u of uses) usedValue.set(u.sessionId!, (usedValue.get(u.sessionId!) ?? new Decimal(0)).plus(u.value ?? 0));
  const systems = new Map((await FinishingSystem.findAll({ attributes: ['key', 'name'] })).map((s) => [s.key, s.name]));
  const revisionOf = new Map(revisions.map((r) => [r.id, r]));
  const pieceOf = new Map(estimates.map((e) => [e.id, pieces.find((p) => p.id === e.pieceId)?.kind ?? 'other']));
  const jobOf = new Map(
    jobs.map((j) => {
      const result = revisionOf.get(j.revisionId)?.result;
      // The estimate's cost of one unit of each material: what it costs of the packs for what the job needs.
      const unitCost = new Map((result?.materials ?? []).filter((m) => m.need > 0).map((m) => [m.key, new Decimal(m.usedCost).div(m.need)]));
      return [j.id, { system: result?.system ?? 'unknown', kind: pieceOf.get(j.estimateId) ?? 'other', stages: new Map(j.stages.map((st) => [st.key, st])), unitCost }];
    }),
  );
  type Group = { row: Pick<EstimateAccuracyRow, 'month' | 'system' | 'systemName' | 'pieceKind' | 'sessions'>; est: Decimal; act: Decimal; matEst: Decimal; matAct: Decimal; matSessions: number; jobs: Set<number> };
  const groups = new Map<string, Group>();
  for (const s of sessions) {
    const j = jobOf.get(s.jobId)!;
    const month = s.actualEnd!.slice(0, 7);
    const key = `${month}|${j.system}|${j.kind}`;
    const g: Group = groups.get(key) ?? {
      row: { month, system: j.system, systemName: systems.get(j.system) ?? j.system, pieceKind: j.kind, sessions: 0 },
      est: new Decimal(0),
      act: new Decimal(0),
      matEst: new Decimal(0),
      matAct: new Decimal(0),
      matSessions: 0,
      jobs: new Set<number>(),
    };
    g.est = g.est.plus(s.estimatedHours);
    g.act = g.act.plus(s.actualHours!);
    g.row.sessions++;
    g.jobs.add(s.jobId);
    const used = usedValue.get(s.id);
    const stage = j.stages.get(s.stage);
    if (used && stage) {
      for (const m of stage.materials) {
        const per = j.unitCost.get(m.material);
        if (!per) continue;
        g.matEst = g.matEst.plus(per.times(sessionShare(m.quantity, m.unit, stage.sessions, Math.min(s.session, stage.sessions))));
      }
      g.matAct = g.matAct.plus(used);
      g.matSessions++;
    }
    groups.set(key, g);
  }
  const rows = [...groups.values()]
    .map((g) => ({
      ...g.row,
      estimatedHours: g.est.toDecimalPlaces(2).toNumber(),
      actualHours: g.act.toDecimalPlaces(2).toNumber(),
      ratio: g.est.isZero() ? null : g.act.div(g.est).toDecimalPlaces(3).toNumber(),
      estimatedMaterials: cents(g.matEst).toFixed(2),
      actualMaterials: cents(g.matAct).toFixed(2),
      materialsRatio: g.matSessions === 0 || cents(g.matEst).isZero() ? null : cents(g.matAct).div(cents(g.matEst)).toDecimalPlaces(3).toNumber(),
      materialSessions: g.matSessions,
      jobs: g.jobs.size,
    }))
    .sort((a, b) => a.month.localeCompare(b.month) || a.systemName.localeCompare(b.systemName) || a.pieceKind.localeCompare(b.pieceKind));
  return { from: q.from, to: q.to, rows };
}
