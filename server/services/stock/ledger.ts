/**
 * The stock ledger: every change to stock on hand goes through `move`, which locks the material's stock row, writes
 * the new quantity and a movement with the balance after it, in the caller's transaction. Materials used in a
 * session are valued at the price paid for their pack (the last order received for it, else the price list on the
 * day); a stock count records the difference from the ledger as an adjustment with its reason.
 */
import Decimal from 'decimal.js';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { sessionShare } from '@shared/calc';
import type { MaterialUseInput, MovementKind, SessionMaterialLine, StockCountInput, StockMovementDto, StockMovementPage } from '@shared/schemas/stock';
import { problems } from '../../http/problem';
import { Job, JobSession, Material, MaterialPack, MaterialStock, PurchaseOrder, StockMovement, User } from '../../models';
import { audit } from '../audit';
import { offset } from '../paging';
import { localNow } from '../planning-context';

const q3 = (d: Decimal) => d.toDecimalPlaces(3, Decimal.ROUND_HALF_UP);
const cents = (d: Decimal) => d.toDecimalPlaces(2, Decimal.ROUND_HALF_UP);

export interface MoveInput {
  materialId: number;
  packId?: number | null;
  kind: MovementKind;
  /** Signed change, in the material's unit. */
  quantity: Decimal;
  packs?: Decimal | null;
  packPrice?: string | null;
  value?: Decimal | null;
  reason?: string | null;
  jobId?: number | null;
  sessionId?: number | null;
  orderId?: number | null;
  actorId: number | null;
}

/** The stock row of a material, locked for this transaction (made at zero when there is none yet). */
async function lockedStock(materialId: number, transaction: Transaction): Promise<MaterialStock> {
  await MaterialStock.sequelize!.query(
    `INSERT INTO material_stock (material_id, quantity, updated_at) VALUES (:materialId, 0, now()) ON CONFLICT (material_id) DO NOTHING`,
    { replacements: { materialId }, transaction },
  );
  return (await MaterialStock.findByPk(materialId, { transaction, lock: transaction.LOCK.UPDATE }))!;
}

/** Applies one movement to stock on hand and records it. Returns the balance after it. */
export async function move(m: MoveInput, transaction: Transaction): Promise<Decimal> {
  const row = await lockedStock(m.materialId, transaction);
  const after = q3(new Decimal(row.quantity).plus(m.quantity));
  await row.update({ quantity: after.toFixed(3), updatedBy: m.actorId }, { transaction });
  await StockMovement.create(
    {
      materialId: m.materialId,
      packId: m.packId ?? null,
      kind: m.kind,
      quantity: q3(m.quantity).toFixed(3),
      packs: m.packs ? m.packs.toDecimalPlaces(3).toFixed(3) : null,
      balanceAfter: after.toFixed(3),
      packPrice: m.packPrice ?? null,
      value: m.value ? cents(m.value).toFixed(2) : null,
      reason: m.reason ?? null,
      jobId: m.jobId ?? null,
      sessionId: m.sessionId ?? null,
      orderId: m.orderId ?? null,
      createdBy: m.actorId,
    },
    { transaction },
  );
  return after;
}

/**
 * The price of one pack as the workshop last paid it: the last order received for that pack, else the price list's
 * price in force on the day. Null when the pack has never had a price.
 */
export async function paidPackPrice(packId: number, day: string, transaction?: Transaction): Promise<string | null> {
  const [row] = await StockMovement.sequelize!.query<{ price: string }>(
    `SELECT price FROM (
       (SELECT pack_price AS price, 0 AS rank, created_at AS at FROM stock_movements
         WHERE pack_id = :packId AND kind = 'receive' AND pack_price IS NOT NULL ORDER BY id DESC LIMIT 1)
       UNION ALL
       (SELECT price, 1 AS rank, created_at AS at FROM pack_prices
         WHERE pack_id = :packId AND effective_from <= :day ORDER BY effective_from DESC, id DESC LIMIT 1)
     ) p ORDER BY rank LIMIT 1`,
    { replacements: { packId, day }, type: QueryTypes.SELECT, transaction },
  );
  return row?.price ?? null;
}

async function packOf(materialId: number, packId: number, field: string, transaction?: Transaction): Promise<{ material: Material; pack: MaterialPack }> {
  const material = await Material.findByPk(materialId, { transaction });
  if (!material) throw problems.badRequest('unknown_material', `${field}: there is no material ${materialId}`, field.replace(/packId$/, 'materialId'));
  const pack = await MaterialPack.findOne({ where: { id: packId, materialId }, transaction });
  if (!pack) throw problems.badRequest('unknown_pack', `${field}: pack ${packId} is not one of the packs of ${material.name}`, field);
  return { material, pack };
}

/**
 * Records the materials used in a session (already marked done in `transaction`): stock on hand goes down by each
 * quantity, valued at the price paid for its pack. A material listed twice counts twice; zero packs are skipped.
 */
export async function recordSessionUse(
  transaction: Transaction,
  actorId: number,
  job: Pick<Job, 'id' | 'number'>,
  session: Pick<JobSession, 'id'>,
  materials: readonly MaterialUseInput[],
): Promise<void> {
  const day = localNow().slice(0, 10);
  for (const [i, use] of materials.entries()) {
    if (use.packs <= 0) continue;
    const { pack } = await packOf(use.materialId, use.packId, `materials.${i}.packId`, transaction);
    const packs = new Decimal(use.packs);
    const price = await paidPackPrice(pack.id, day, transaction);
    await move(
      {
        materialId: use.materialId,
        packId: pack.id,
        kind: 'use',
        quantity: packs.times(pack.size).negated(),
        packs,
        packPrice: price,
        value: price === null ? null : packs.times(price),
        jobId: job.id,
        sessionId: session.id,
        actorId,
      },
      transaction,
    );
  }
}

/** The packs a material can be counted in, smallest first. */
async function packsOf(materialIds: number[], transaction?: Transaction): Promise<Map<number, MaterialPack[]>> {
  const packs = materialIds.length ? await MaterialPack.findAll({ where: { materialId: materialIds, archived: false }, order: [['size', 'ASC'], ['id', 'ASC']], transaction }) : [];
  const out = new Map<number, MaterialPack[]>();
  for (const p of packs) out.set(p.materialId, [...(out.get(p.materialId) ?? []), p]);
  return out;
}

/**
 * What a session is expected to use: its stage's materials from the estimate, shared over the stage's sessions, in
 * packs of the smallest pack (the form lets the polisher change the pack and the number).
 */
export async function sessionMaterials(jobId: number, sessionId: number): Promise<SessionMaterialLine[]> {
  const job = await Job.findByPk(jobId);
  if (!job) throw problems.notFound('Job');
  const session = await JobSession.findOne({ where: { id: sessionId, jobId } });
  if (!session) throw problems.notFound('Session');
  const stage = job.stages.find((s) => s.key === session.stage);
  if (!stage) return [];
  const materials = new Map((await Material.findAll({ where: { key: stage.materials.map((m) => m.material) } })).map((m) => [m.key, m]));
  const packs = await packsOf([...materials.values()].map((m) => m.id));
  const out: SessionMaterialLine[] = [];
  for (const m of stage.materials) {
    const material = materials.get(m.material);
    const options = material ? (packs.get(material.id) ?? []) : [];
    if (!material || options.length === 0) continue;
    const estimated = sessionShare(m.quantity, m.unit, stage.sessions, Math.min(session.session, stage.sessions));
    const first = options[0]!;
    out.push({
      materialId: material.id,
      key: material.key,
      name: material.name,
      unit: material.unit,
      estimated: q3(new Decimal(estimated)).toNumber(),
      packId: first.id,
      packs: q3(new Decimal(estimated).div(first.size)).toNumber(),
      options: options.map((p) => ({ packId: p.id, size: Number(p.size), label: p.label || `${Number(p.size)} ${material.unit}` })),
    });
  }
  return out;
}

/** A stock count: the shelf holds `counted` packs; the difference from the ledger is recorded as an adjustment. */
export async function recordCount(sequelize: Sequelize, actorId: number, input: StockCountInput): Promise<StockMovementDto> {
  const id = await sequelize.transaction(async (transaction) => {
    const { material, pack } = await packOf(input.materialId, input.packId, 'packId', transaction);
    const row = await lockedStock(material.id, transaction);
    const counted = new Decimal(input.counted).times(pack.size);
    const diff = counted.minus(row.quantity);
    const day = localNow().slice(0, 10);
    const price = await paidPackPrice(pack.id, day, transaction);
    await move(
      {
        materialId: material.id,
        packId: pack.id,
        kind: 'count',
        quantity: diff,
        packs: new Decimal(input.counted),
        packPrice: price,
        value: price === null ? null : diff.div(pack.size).times(price),
        reason: input.reason,
        actorId,
      },
      transaction,
    );
    await audit(
      { userId: actorId, action: 'stock.count', entityType: 'material', entityId: material.id, before: { name: material.name, quantity: Number(row.quantity), unit: material.unit }, after: { name: material.name, quantity: counted.toNumber(), unit: material.unit, difference: diff.toNumber(), reason: input.reason } },
      transaction,
    );
    return (await StockMovement.max<number, StockMovement>('id', { where: { materialId: material.id }, transaction }))!;
  });
  return (await movementDtos([await StockMovement.findByPk(id)].filter((m): m is StockMovement => m !== null)))[0]!;
}

async function movementDtos(rows: StockMovement[]): Promise<StockMovementDto[]> {
  const ids = (k: 'materialId' | 'packId' | 'jobId' | 'orderId' | 'createdBy') => [...new Set(rows.map((r) => r[k]).filter((v): v is number => v !== null))];
  const [materials, packs, jobs, orders, users] = await Promise.all([
    Material.findAll({ where: { id: ids('materialId') }, attributes: ['id', 'name', 'unit'] }),
    MaterialPack.findAll({ where: { id: ids('packId') }, attributes: ['id', 'size', 'label'] }),
    Job.findAll({ where: { id: ids('jobId') }, attributes: ['id', 'number'] }),
    PurchaseOrder.findAll({ where: { id: ids('orderId') }, attributes: ['id', 'number'] }),
    User.findAll({ where: { id: ids('createdBy') }, attributes: ['id', 'name'] }),
  ]);
  const m = new Map(materials.map((x) => [x.id, x]));
  const p = new Map(packs.map((x) => [x.id, x]));
  const j = new Map(jobs.map((x) => [x.id, x]));
  const o = new Map(orders.map((x) => [x.id, x]));
  const u = new Map(users.map((x) => [x.id, x.name]));
  return rows.map((r) => {
    const material = m.get(r.materialId);
    const pack = r.packId !== null ? p.get(r.packId) : undefined;
    return {
      id: r.id,
      materialId: r.materialId,
      material: material?.name ?? `material ${r.materialId}`,
      unit: material?.unit ?? '',
      kind: r.kind,
      quantity: Number(r.quantity),
      packs: r.packs === null ? null : Number(r.packs),
      pack: pack ? pack.label || `${Number(pack.size)} ${material?.unit ?? ''}`.trim() : null,
      balanceAfter: Number(r.balanceAfter),
      value: r.value,
      reason: r.reason,
      job: r.jobId !== null && j.has(r.jobId) ? { id: r.jobId, number: j.get(r.jobId)!.number } : null,
      order: r.orderId !== null && o.has(r.orderId) ? { id: r.orderId, number: o.get(r.orderId)!.number } : null,
      by: r.createdBy !== null ? (u.get(r.createdBy) ?? null) : null,
      at: r.createdAt.toISOString(),
    };
  });
}

/** The ledger, newest first, optionally for one material or one kind of movement. */
export async function listMovements(q: { materialId?: number; kind?: MovementKind; page: number; pageSize: number }): Promise<StockMovementPage> {
  const where = { ...(q.materialId ? { materialId: q.materialId } : {}), ...(q.kind ? { kind: q.kind } : {}) };
  const { rows, count } = await StockMovement.findAndCountAll({ where, order: [['id', 'DESC']], limit: q.pageSize, offset: offset(q.page, q.pageSize) });
  return { items: await movementDtos(rows), page: q.page, pageSize: q.pageSize, total: count };
}

/** Materials used by a job, as recorded in the ledger (negative quantities made positive). */
export async function jobUse(jobId: number): Promise<StockMovementDto[]> {
  return movementDtos(await StockMovement.findAll({ where: { jobId, kind: 'use', quantity: { [Op.lt]: 0 } }, order: [['id', 'ASC']] }));
}
