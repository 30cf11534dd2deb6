/**
 * Stock on hand per material, counted in each of its packs, with the low-stock warning from the forecast: what the
 * booked jobs' sessions will use before the next delivery of an order sent for the material (or, with none due,
 * before the end of the chosen window). Sessions overdue and not done count as due now.
 */
import Decimal from 'decimal.js';
import { Op } from 'sequelize';
import { sessionShare } from '@shared/calc';
import type { StockLevel, StockOverview } from '@shared/schemas/stock';
import { Job, JobSession, Material, MaterialPack, MaterialStock, PurchaseOrder, PurchaseOrderLine } from '../../models';
import { addDays, localNow } from '../planning-context';

const q3 = (n: Decimal.Value) => new Decimal(n).toDecimalPlaces(3, Decimal.ROUND_HALF_UP).toNumber();

/** Each not-done session's share of its stage's materials, with the day it is planned for. */
export async function plannedUse(): Promise<{ material: string; day: string; quantity: number }[]> {
  const jobs = await Job.findAll({ where: { state: { [Op.in]: ['booked', 'in-progress'] } } });
  if (jobs.length === 0) return [];
  const sessions = await JobSession.findAll({ where: { jobId: jobs.map((j) => j.id), done: false } });
  const byId = new Map(jobs.map((j) => [j.id, j]));
  const out: { material: string; day: string; quantity: number }[] = [];
  for (const s of sessions) {
    const stage = byId.get(s.jobId)?.stages.find((x) => x.key === s.stage);
    if (!stage || !s.plannedStart) continue;
    for (const m of stage.materials) {
      out.push({ material: m.material, day: s.plannedStart.slice(0, 10), quantity: sessionShare(m.quantity, m.unit, stage.sessions, Math.min(s.session, stage.sessions)) });
    }
  }
  return out;
}

/** Open orders (sent, not received) per material: the packs' quantity coming and the earliest delivery. */
async function onOrder(): Promise<Map<number, { quantity: Decimal; next: string | null }>> {
  const orders = await PurchaseOrder.findAll({ where: { state: 'sent' }, include: [{ model: PurchaseOrderLine, as: 'lines' }] });
  const out = new Map<number, { quantity: Decimal; next: string | null }>();
  for (const o of orders) {
    for (const l of o.lines ?? []) {
      const row = out.get(l.materialId) ?? { quantity: new Decimal(0), next: null };
      row.quantity = row.quantity.plus(new Decimal(l.packSize).times(l.packs));
      if (o.expectedOn && (row.next === null || o.expectedOn < row.next)) row.next = o.expectedOn;
      out.set(l.materialId, row);
    }
  }
  return out;
}

export async function stockOverview(q: { weeks: number }): Promise<StockOverview> {
  const today = localNow().slice(0, 10);
  const until = addDays(today, q.weeks * 7);
  const materials = await Material.findAll({ where: { archived: false }, order: [['name', 'ASC'], ['id', 'ASC']] });
  const stock = new Map((await MaterialStock.findAll()).map((s) => [s.materialId, s]));
  const packs = await MaterialPack.findAll({ where: { archived: false }, order: [['size', 'ASC'], ['id', 'ASC']] });
  const use = await plannedUse();
  const coming = await onOrder();
  const rows: StockLevel[] = materials.map((m) => {
    const onHand = new Decimal(stock.get(m.id)?.quantity ?? 0);
    const order = coming.get(m.id);
    const by = order?.next ?? until;
    const need = use.filter((u) => u.material === m.key && u.day < by).reduce((t, u) => t.plus(u.quantity), new Decimal(0));
    const short = Decimal.max(0, need.minus(onHand));
    return {
      materialId: m.id,
      key: m.key,
      name: m.name,
      kind: m.kind,
      unit: m.unit,
      quantity: q3(onHand),
      packs: packs.filter((p) => p.materialId === m.id).map((p) => ({ packId: p.id, size: Number(p.size), label: p.label || `${Number(p.size)} ${m.unit}`, supplier: p.supplier, onHandPacks: q3(onHand.div(p.size)) })),
      needBeforeDelivery: q3(need),
      nextDelivery: order?.next ?? null,
      onOrder: q3(order?.quantity ?? 0),
      short: q3(short),
      // Below zero the ledger has more out than in: the shelf wants counting.
      low: short.gt(0) || onHand.lt(0),
      updatedAt: stock.get(m.id)?.updatedAt.toISOString() ?? null,
    };
  });
  return { today, weeks: q.weeks, until, rows };
}
