/**
 * Purchase orders: the forecast's shopping list becomes one draft order per supplier (what is already on an open
 * order is not ordered twice), an order goes to the supplier as a PDF through the outbox, and receiving it adds to
 * stock, optionally recording each price paid as the pack's new price from the day it came in.
 */
import Decimal from 'decimal.js';
import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { choosePacks } from '@shared/calc';
import type { PurchaseOrderDto, PurchaseOrderPage, ReceiveOrderInput, SendOrderInput } from '@shared/schemas/stock';
import type { Config } from '../../config';
import { HttpProblem, problems } from '../../http/problem';
import { Material, MaterialPack, OutboxMessage, PackPrice, PurchaseOrder, PurchaseOrderLine } from '../../models';
import { renderPurchaseOrderPdf, type PurchaseOrderDocument } from '../../pdf/purchase-order-pdf';
import { audit } from '../audit';
import { loadSettings } from '../catalog';
import { composeMail } from '../mail-compose';
import { deliver } from '../mail';
import { offset } from '../paging';
import { materialForecast } from '../planning-reports';
import { localNow } from '../planning-context';
import { move } from './ledger';
import { nextRecordNumber } from '../numbering';

const cents = (d: Decimal) => d.toDecimalPlaces(2, Decimal.ROUND_HALF_UP);
const NO_SUPPLIER = 'Supplier not named';

async function orderDtos(orders: PurchaseOrder[], transaction?: Transaction): Promise<PurchaseOrderDto[]> {
  const lines = orders.length ? await PurchaseOrderLine.findAll({ where: { orderId: orders.map((o) => o.id) }, order: [['id', 'ASC']], transaction }) : [];
  const materials = new Map((await Material.findAll({ where: { id: [...new Set(lines.map((l) => l.materialId))] }, transaction })).map((m) => [m.id, m]));
  const packs = new Map((await MaterialPack.findAll({ where: { id: [...new Set(lines.map((l) => l.packId))] }, transaction })).map((p) => [p.id, p]));
  return orders.map((o) => ({
    id: o.id,
    number: o.number,
    supplier: o.supplier,
    state: o.state,
    currency: o.currency,
    total: o.total,
    expectedOn: o.expectedOn,
    note: o.note,
    sentTo: o.sentTo,
    sentAt: o.sentAt?.toISOString() ?? null,
    receivedAt: o.receivedAt?.toISOString() ?? null,
    createdAt: o.createdAt.toISOString(),
    lines: lines
      .filter((l) => l.orderId === o.id)
      .map((l) => {
        const m = materials.get(l.materialId);
        const p = packs.get(l.packId);
        return {
          id: l.id,
          materialId: l.materialId,
          material: m?.name ?? `material ${l.materialId}`,
          unit: m?.unit ?? '',
          packId: l.packId,
          packLabel: p?.label || `${Number(l.packSize)} ${m?.unit ?? ''}`.trim(),
          packSize: Number(l.packSize),
          packs: l.packs,
          packPrice: cents(new Decimal(l.packPrice)).toFixed(2),
          amount: cents(new Decimal(l.packPrice).times(l.packs)).toFixed(2),
          receivedPacks: l.receivedPacks,
          paidPrice: l.paidPrice === null ? null : new Decimal(l.paidPrice).toFixed(2),
        };
      }),
  }));
}

export async function getOrder(id: number, transaction?: Transaction): Promise<PurchaseOrderDto> {
  const o = await PurchaseOrder.findByPk(id, { transaction });
  if (!o) throw problems.notFound('Purchase order');
  return (await orderDtos([o], transaction))[0]!;
}

export async function listOrders(q: { state: string; page: number; pageSize: number }): Promise<PurchaseOrderPage> {
  const where = q.state === 'all' ? {} : q.state === 'open' ? { state: { [Op.in]: ['draft', 'sent'] } } : { state: q.state };
  const { rows, count } = await PurchaseOrder.findAndCountAll({ where, order: [['id', 'DESC']], limit: q.pageSize, offset: offset(q.page, q.pageSize) });
  return { items: await orderDtos(rows), page: q.page, pageSize: q.pageSize, total: count };
}

/**
 * Drafts one order per supplier for what the booked jobs need over the next `weeks` and the shelf and open orders
 * do not cover, in the cheapest packs of today's prices. Nothing short: no orders, an empty list.
 */
export async function ordersFromForecast(sequelize: Sequelize, actorId: number, q: { weeks: number }): Promise<PurchaseOrderDto[]> {
  const forecast = await materialForecast(sequelize, q);
  const today = localNow().slice(0, 10);
  const ids = await sequelize.transaction(async (transaction) => {
    // One forecast turned into orders at a time: two clicks never order the same shortfall twice.
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('shellwright.purchase-orders'))", { transaction });
    const open = await PurchaseOrderLine.findAll({
      include: [{ model: PurchaseOrder, as: 'order', attributes: [], where: { state: { [Op.in]: ['draft', 'sent'] } } }],
      transaction,
    });
    const ordered = new Map<number, Decimal>();
    for (const l of open) ordered.set(l.materialId, (ordered.get(l.materialId) ?? new Decimal(0)).plus(new Decimal(l.packSize).times(l.packs)));
    const bySupplier = new Map<string, { material: Material; pack: MaterialPack; packs: number; price: string }[]>();
    for (const row of forecast.rows) {
      if (row.materialId === null || row.short <= 0) continue;
      const short = new Decimal(row.short).minus(ordered.get(row.materialId) ?? 0);
      if (short.lte(0)) continue;
      const material = await Material.findByPk(row.materialId, { transaction });
      const packs = await MaterialPack.findAll({ where: { materialId: row.materialId, archived: false }, transaction });
      const priced: { pack: MaterialPack; price: string }[] = [];
      for (const pack of packs) {
        const [p] = await sequelize.query<{ price: string }>(
          'SELECT price::text AS price FROM pack_prices WHERE pack_id = :id AND effective_from <= :today ORDER BY effective_from DESC, id DESC LIMIT 1',
          { replacements: { id: pack.id, today }, type: QueryTypes.SELECT, transaction },
        );
        if (p) priced.push({ pack, price: p.price });
      }
      if (!material || priced.length === 0) continue;
      const choice = choosePacks(short.toNumber(), priced.map((p) => ({ size: Number(p.pack.size), price: new Decimal(p.price).toFixed(2), label: String(p.pack.id) })));
      for (const c of choice.packs) {
        const chosen = priced.find((p) => String(p.pack.id) === c.label)!;
        const supplier = chosen.pack.supplier.trim() || NO_SUPPLIER;
        bySupplier.set(supplier, [...(bySupplier.get(supplier) ?? []), { material, pack: chosen.pack, packs: c.count, price: chosen.price }]);
      }
    }
    const { settings } = await loadSettings(transaction);
    const made: number[] = [];
    for (const [supplier, lines] of [...bySupplier.entries()].sort((a, b) => a[0].localeCompare(b[0]))) {
      const total = lines.reduce((t, l) => t.plus(cents(new Decimal(l.price).times(l.packs))), new Decimal(0));
      const order = await PurchaseOrder.create(
        { number: await nextRecordNumber(sequelize, 'purchase-order', transaction), supplier, currency: settings.pricing.currency, total: total.toFixed(2), expectedOn: null, sentTo: null, sentAt: null, outboxId: null, receivedAt: null, cancelledAt: null, createdBy: actorId },
        { transaction },
      );
      for (const l of lines) {
        await PurchaseOrderLine.create({ orderId: order.id, materialId: l.material.id, packId: l.pack.id, packs: l.packs, packSize: String(l.pack.size), packPrice: l.price, receivedPacks: null, paidPrice: null }, { transaction });
      }
      await audit({ userId: actorId, action: 'purchase-order.create', entityType: 'purchase-order', entityId: order.id, after: { number: order.number, supplier, total: order.total, lines: lines.length, weeks: q.weeks } }, transaction);
      made.push(order.id);
    }
    return made;
  });
  if (ids.length === 0) return [];
  return orderDtos(await PurchaseOrder.findAll({ where: { id: ids }, order: [['id', 'ASC']] }));
}

async function documentOf(id: number, transaction?: Transaction): Promise<PurchaseOrderDocument> {
  const order = await getOrder(id, transaction);
  const { workshop, settings } = await loadSettings(transaction);
  const packs = new Map((await MaterialPack.findAll({ where: { id: order.lines.map((l) => l.packId) }, transaction })).map((p) => [p.id, p]));
  return {
    paperSize: settings.paperSize,
    workshop: { name: workshop.name, address: workshop.address, email: workshop.email, phone: workshop.phone },
    number: order.number,
    supplier: order.supplier,
    date: order.createdAt.slice(0, 10),
    expectedOn: order.expectedOn,
    currency: order.currency,
    lines: order.lines.map((l) => ({ material: l.material, pack: l.packLabel, code: packs.get(l.packId)?.supplierCode ?? null, packs: l.packs, packPrice: l.packPrice, amount: l.amount })),
    total: order.total,
    note: order.note,
  };
}

export async function orderPdf(id: number): Promise<{ number: string; pdf: Buffer }> {
  const doc = await documentOf(id);
  return { number: doc.number, pdf: await renderPurchaseOrderPdf(doc) };
}

/** Sends a draft (or re-sends a sent) order to the supplier through the outbox, with the PDF attached. */
export async function sendOrder(config: Config, sequelize: Sequelize, actorId: number, id: number, input: SendOrderInput): Promise<PurchaseOrderDto> {
  const outboxId = await sequelize.transaction(async (transaction) => {
    const order = await PurchaseOrder.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw problems.notFound('Purchase order');
    if (order.state !== 'draft' && order.state !== 'sent') throw problems.conflict('order_closed', `Purchase order ${order.number} is ${order.state}: it is not sent again.`);
    await order.update({ expectedOn: input.expectedOn }, { transaction });
    const doc = await documentOf(id, transaction);
    const pdf = await renderPurchaseOrderPdf(doc);
    const { workshop } = await loadSettings(transaction);
    const { text, html } = composeMail({
      name: order.supplier,
      message: input.message,
      paragraphs: [
        { text: `Please find our purchase order ${order.number} attached: ${doc.lines.length} item${doc.lines.length === 1 ? '' : 's'}, wanted by ${input.expectedOn}.` },
        { text: 'Please confirm the delivery date, and tell us before sending if any price differs from our list.' },
      ],
      signOff: { from: null, workshop: workshop.name, phone: workshop.phone, email: workshop.email },
    });
    const message = await OutboxMessage.create(
      { quoteId: null, toAddress: input.to, subject: `Purchase order ${order.number} from ${workshop.name}`, textBody: text, htmlBody: html, attachmentName: `${order.number}.pdf`, attachment: pdf, lastError: null, messageId: null, createdBy: actorId, sentAt: null },
      { transaction },
    );
    await order.update({ state: 'sent', sentTo: input.to, sentAt: new Date(), outboxId: message.id }, { transaction });
    await audit({ userId: actorId, action: 'purchase-order.send', entityType: 'purchase-order', entityId: id, after: { number: order.number, to: input.to, expectedOn: input.expectedOn, outbox: message.id } }, transaction);
    return message.id;
  });
  const message = await deliver(config, outboxId);
  return { ...(await getOrder(id)), delivery: { delivered: message.status === 'sent', outboxId, error: message.status === 'sent' ? null : message.lastError } };
}

/**
 * Receives an order (all of it at once; a line may come in short, at zero packs): stock goes up by what came, each
 * movement valued at the price paid, and with `recordPrices` the price paid becomes the pack's price from the day.
 */
export async function receiveOrder(sequelize: Sequelize, actorId: number, id: number, input: ReceiveOrderInput): Promise<PurchaseOrderDto> {
  await sequelize.transaction(async (transaction) => {
    const order = await PurchaseOrder.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw problems.notFound('Purchase order');
    if (order.state !== 'sent' && order.state !== 'draft') throw problems.conflict('order_closed', `Purchase order ${order.number} is ${order.state}: it cannot be received.`);
    const lines = await PurchaseOrderLine.findAll({ where: { orderId: id }, transaction });
    const seen = new Set<number>();
    input.lines.forEach((l, i) => {
      if (!lines.some((x) => x.id === l.lineId)) throw problems.badRequest('unknown_line', `lines.${i}.lineId: ${l.lineId} is not a line of ${order.number}`, `lines.${i}.lineId`);
      if (seen.has(l.lineId)) throw problems.badRequest('line_twice', `lines.${i}.lineId: line ${l.lineId} is listed twice`, `lines.${i}.lineId`);
      seen.add(l.lineId);
    });
    const missing = lines.findIndex((l) => !seen.has(l.id));
    if (missing >= 0) throw new HttpProblem(400, 'line_missing', 'Bad request', `Say how many packs came of every line: line ${lines[missing]!.id} is missing.`, { field: 'lines' });
    let paidTotal = new Decimal(0);
    for (const l of lines) {
      const got = input.lines.find((x) => x.lineId === l.id)!;
      const paid = got.paidPrice ?? l.packPrice;
      await l.update({ receivedPacks: got.packs, paidPrice: paid }, { transaction });
      paidTotal = paidTotal.plus(cents(new Decimal(paid).times(got.packs)));
      if (got.packs > 0) {
        await move(
          { materialId: l.materialId, packId: l.packId, kind: 'receive', quantity: new Decimal(l.packSize).times(got.packs), packs: new Decimal(got.packs), packPrice: paid, value: new Decimal(paid).times(got.packs), orderId: id, actorId },
          transaction,
        );
      }
      if (input.recordPrices && got.paidPrice !== undefined) {
        const current = await PackPrice.findOne({ where: { packId: l.packId, effectiveFrom: { [Op.lte]: input.receivedOn } }, order: [['effectiveFrom', 'DESC'], ['id', 'DESC']], transaction });
        if (!current || !new Decimal(current.price).eq(got.paidPrice)) {
          await PackPrice.create({ packId: l.packId, price: got.paidPrice, effectiveFrom: input.receivedOn, userId: actorId, source: `purchase order ${order.number}` }, { transaction });
        }
      }
    }
    await order.update({ state: 'received', receivedAt: new Date() }, { transaction });
    await audit({ userId: actorId, action: 'purchase-order.receive', entityType: 'purchase-order', entityId: id, after: { number: order.number, receivedOn: input.receivedOn, paid: paidTotal.toFixed(2), pricesRecorded: input.recordPrices } }, transaction);
  });
  return getOrder(id);
}

export async function cancelOrder(sequelize: Sequelize, actorId: number, id: number): Promise<PurchaseOrderDto> {
  await sequelize.transaction(async (transaction) => {
    const order = await PurchaseOrder.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw problems.notFound('Purchase order');
    if (order.state !== 'draft' && order.state !== 'sent') throw problems.conflict('order_closed', `Purchase order ${order.number} is ${order.state}.`);
    await order.update({ state: 'cancelled', cancelledAt: new Date() }, { transaction });
    await audit({ userId: actorId, action: 'purchase-order.cancel', entityType: 'purchase-order', entityId: id, after: { number: order.number } }, transaction);
  });
  return getOrder(id);
}
