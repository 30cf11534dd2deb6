/**
 * The owner's price list: materials, their packs and each pack's price over time. A new price never overwrites
 * an old one: it is a new pack_prices row with its own effective date, so the catalog on any past date can be
 * rebuilt. Every write runs in one transaction with its audit entry.
 */
import Decimal from 'decimal.js';
import { Op, QueryTypes, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { Page } from '@shared/schemas/auth';
import { keyFromName } from '@shared/schemas/finishing-admin';
import type {
  CatalogVersionChange,
  CreateMaterialSchema,
  CreatePackSchema,
  MaterialDto,
  MaterialHistory,
  MaterialKind,
  MaterialListQuery,
  NewPriceSchema,
  PackDto,
  PriceHistoryEntry,
  UpdateMaterialInput,
  UpdatePackInput,
} from '@shared/schemas/price-list';
import type { z } from 'zod';
import { today } from '@shared/time';
import { problems } from '../http/problem';
import { FinishingSystem, Material, MaterialPack, PackPrice } from '../models';
import { audit } from './audit';
import { withCatalogVersionChange } from './catalog-version';
import { loadSettings } from './catalog';

/** Today as the price list reads it: the workshop's day (shared/time.ts), as loadCatalog does. */
export { today };

/** A NUMERIC price as shown: at least two decimals, no trailing zeros beyond them ("11.4000" → "11.40"). */
export function showPrice(value: string | number | Decimal): string {
  const d = new Decimal(value);
  return d.toFixed(Math.max(2, d.decimalPlaces()));
}

/** A NUMERIC size without trailing zeros ("250.000" → "250"). */
export function showSize(value: string | number): string {
  return new Decimal(value).toString();
}

/** Change from one price to another in percent, one decimal; null when there is no earlier non-zero price. */
export function changePct(from: string | null | undefined, to: string): string | null {
  if (from == null) return null;
  const old = new Decimal(from);
  if (old.isZero()) return null;
  return new Decimal(to).minus(old).dividedBy(old).times(100).toFixed(1);
}

interface PriceRowLite {
  id: number;
  packId: number;
  price: string;
  effectiveFrom: string;
}

/** Price rows of some packs, oldest first (same date: the later entry wins). */
async function pricesOf(packIds: number[], transaction?: Transaction): Promise<Map<number, PriceRowLite[]>> {
  const out = new Map<number, PriceRowLite[]>();
  if (packIds.length === 0) return out;
  const rows = await PackPrice.findAll({
    where: { packId: { [Op.in]: packIds } },
    order: [['effectiveFrom', 'ASC'], ['id', 'ASC']],
    transaction,
  });
  for (const r of rows) {
    const list = out.get(r.packId) ?? [];
    list.push({ id: r.id, packId: r.packId, price: String(r.price), effectiveFrom: r.effectiveFrom });
    out.set(r.packId, list);
  }
  return out;
}

/** The price in force on a date from a pack's rows (oldest first). */
export function priceOn(rows: readonly PriceRowLite[], date: string): PriceRowLite | undefined {
  let found: PriceRowLite | undefined;
  for (const r of rows) if (r.effectiveFrom <= date) found = r;
  return found;
}

function packDto(pack: MaterialPack, rows: readonly PriceRowLite[], onDate = today()): PackDto {
  const current = priceOn(rows, onDate);
  const idx = current ? rows.indexOf(current) : -1;
  const previous = idx > 0 ? rows[idx - 1] : undefined;
  const next = rows.find((r) => r.effectiveFrom > onDate);
  return {
    id: pack.id,
    size: showSize(pack.size),
    label: pack.label,
    supplier: pack.supplier,
    supplierCode: pack.supplierCode,
    archived: pack.archived,
    price: current ? showPrice(current.price) : null,
    priceFrom: current?.effectiveFrom ?? null,
    previousPrice: previous ? showPrice(previous.price) : null,
    changePct: current && previous ? changePct(previous.price, current.price) : null,
    nextPrice: next ? showPrice(next.price) : null,
    nextFrom: next?.effectiveFrom ?? null,
  };
}

async function materialDtos(materials: Material[], transaction?: Transaction): Promise<MaterialDto[]> {
  const packs = await MaterialPack.findAll({
    where: { materialId: { [Op.in]: materials.map((m) => m.id) } },
    order: [['size', 'ASC'], ['id', 'ASC']],
    transaction,
  });
  const prices = await pricesOf(packs.map((p) => p.id), transaction);
  return materials.map((m) => ({
    id: m.id,
    key: m.key,
    name: m.name,
    kind: m.kind as MaterialKind,
    unit: m.unit,
    notes: m.notes,
    archived: m.archived,
    updatedAt: m.updatedAt.toISOString(),
    packs: packs.filter((p) => p.materialId === m.id).map((p) => packDto(p, prices.get(p.id) ?? [])),
  }));
}

const SORT: Record<MaterialListQuery['sort'], string> = { name: 'name', kind: 'kind', unit: 'unit', updatedAt: 'updatedAt' };

const escapeLike = (s: string) => `%${s.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listMaterials(sequelize: Sequelize, query: MaterialListQuery): Promise<Page<MaterialDto>> {
  const where: WhereOptions<Material> = {};
  if (query.archived !== 'all') Object.assign(where, { archived: query.archived === 'archived' });
  if (query.kind) Object.assign(where, { kind: query.kind });
  if (query.q) {
    const like = escapeLike(query.q);
    Object.assign(where, {
      [Op.or]: [
        { name: { [Op.iLike]: like } },
        { key: { [Op.iLike]: like } },
        { notes: { [Op.iLike]: like } },
        sequelize.literal(
          `EXISTS (SELECT 1 FROM material_packs mp WHERE mp.material_id = "Material"."id" AND (mp.supplier ILIKE ${sequelize.escape(like)} OR mp.supplier_code ILIKE ${sequelize.escape(like)}))`,
        ),
      ],
    });
  }
  const { rows, count } = await Material.findAndCountAll({
    where,
    order: [
      [SORT[query.sort], query.dir.toUpperCase()],
      ['id', 'ASC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { rows: await materialDtos(rows), total: count, page: query.page, pageSize: query.pageSize };
}

export async function getMaterial(id: number, transaction?: Transaction): Promise<MaterialDto> {
  const material = await Material.findByPk(id, { transaction });
  if (!material) throw problems.notFound('Material');
  return (await materialDtos([material], transaction))[0]!;
}

/** A key not yet taken: "shellac-flakes", else "shellac-flakes-2", … */
export async function freeMaterialKey(base: string, transaction?: Transaction, reserved: ReadonlySet<string> = new Set()): Promise<string> {
  const taken = new Set((await Material.findAll({ attributes: ['key'], where: { key: { [Op.like]: `${base}%` } }, transaction })).map((m) => m.key));
  let key = base;
  for (let n = 2; taken.has(key) || reserved.has(key); n++) key = `${base.slice(0, 60)}-${n}`;
  return key;
}

const packLabel = (size: string | number, unit: string) => `${showSize(size)} ${unit}`;

export async function createMaterial(sequelize: Sequelize, actorId: number, input: z.output<typeof CreateMaterialSchema>): Promise<MaterialDto> {
  return sequelize.transaction(async (transaction) => {
    if (input.key && (await Material.findOne({ where: { key: input.key }, transaction }))) {
      throw problems.badRequest('key_taken', `key "${input.key}" is already used by another material`, 'key');
    }
    const key = input.key ?? (await freeMaterialKey(keyFromName(input.name), transaction));
    const material = await Material.create({ key, name: input.name, kind: input.kind, unit: input.unit, notes: input.notes }, { transaction });
    const pack = await MaterialPack.create(
      { materialId: material.id, size: input.pack.size, label: input.pack.label, supplier: input.pack.supplier, supplierCode: input.pack.supplierCode || null },
      { transaction },
    );
    await PackPrice.create({ packId: pack.id, price: input.pack.price, effectiveFrom: input.pack.effectiveFrom, userId: actorId, source: 'manual' }, { transaction });
    await audit(
      {
        userId: actorId,
        action: 'material.create',
        entityType: 'material',
        entityId: material.id,
        after: { key, name: input.name, kind: input.kind, unit: input.unit, pack: packLabel(input.pack.size, input.unit), price: input.pack.price, effectiveFrom: input.pack.effectiveFrom },
      },
      transaction,
    );
    return getMaterial(material.id, transaction);
  });
}

/**
 * Refuses to take a material out of the estimator's catalog while the estimator needs it: the shellac settings
 * name it, or an active finishing system uses it.
 */
async function assertNotNeeded(material: Material, what: string, transaction: Transaction): Promise<void> {
  const { settings } = await loadSettings(transaction);
  if (settings.shellac.flakesMaterial === material.key || settings.shellac.spiritMaterial === material.key) {
    throw problems.conflict('material_in_use', `${what}: the workshop settings use ${material.name} for the shellac and spirit figures. Choose another material there first.`);
  }
  const systems = await FinishingSystem.findAll({ where: { archived: false }, transaction });
  const users = systems.filter((s) => s.stages.some((st) => st.materials.some((u) => u.material === material.key)));
  if (users.length > 0) {
    throw problems.conflict('material_in_use', `${what}: ${material.name} is used by ${users.map((s) => s.name).join(', ')}. Take it out of those stages first.`);
  }
}

export async function updateMaterial(sequelize: Sequelize, actorId: number, id: number, input: UpdateMaterialInput): Promise<MaterialDto> {
  return sequelize.transaction(async (transaction) => {
    const material = await Material.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!material) throw problems.notFound('Material');
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const field of ['name', 'kind', 'notes', 'archived'] as const) {
      const value = input[field];
      if (value === undefined || value === material[field]) continue;
      before[field] = material[field];
      after[field] = value;
    }
    if (Object.keys(after).length === 0) return getMaterial(id, transaction);
    if (input.archived === true) await assertNotNeeded(material, 'Cannot archive', transaction);
    const nameBefore = material.name;
    material.set(after);
    await material.save({ transaction });
    // Archiving a material takes its packs off the estimator's list too; restoring brings them back.
    if (input.archived !== undefined && 'archived' in after) {
      await MaterialPack.update({ archived: input.archived }, { where: { materialId: id }, transaction });
    }
    const action = 'archived' in after ? (input.archived ? 'material.archive' : 'material.restore') : 'material.update';
    await audit({ userId: actorId, action, entityType: 'material', entityId: id, before: { name: nameBefore, ...before }, after: { name: material.name, ...after } }, transaction);
    return getMaterial(id, transaction);
  });
}

export async function addPack(sequelize: Sequelize, actorId: number, materialId: number, input: z.output<typeof CreatePackSchema>): Promise<MaterialDto> {
  return sequelize.transaction(async (transaction) => {
    const material = await Material.findByPk(materialId, { transaction });
    if (!material) throw problems.notFound('Material');
    const same = await MaterialPack.findOne({ where: { materialId, size: String(input.size), archived: false }, transaction });
    if (same) throw problems.badRequest('pack_exists', `${material.name} already has a ${packLabel(input.size, material.unit)} pack: give it a new price instead`, 'size');
    const pack = await MaterialPack.create(
      { materialId, size: input.size, label: input.label, supplier: input.supplier, supplierCode: input.supplierCode || null },
      { transaction },
    );
    await PackPrice.create({ packId: pack.id, price: input.price, effectiveFrom: input.effectiveFrom, userId: actorId, source: 'manual' }, { transaction });
    await audit(
      {
        userId: actorId,
        action: 'pack.create',
        entityType: 'pack',
        entityId: pack.id,
        after: { material: material.name, pack: packLabel(input.size, material.unit), supplier: input.supplier, supplierCode: input.supplierCode || null, price: input.price, effectiveFrom: input.effectiveFrom },
      },
      transaction,
    );
    return getMaterial(materialId, transaction);
  });
}

export async function updatePack(sequelize: Sequelize, actorId: number, packId: number, input: UpdatePackInput): Promise<MaterialDto> {
  return sequelize.transaction(async (transaction) => {
    const pack = await MaterialPack.findByPk(packId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!pack) throw problems.notFound('Pack');
    const material = (await Material.findByPk(pack.materialId, { transaction }))!;
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    const next = { ...input, ...(input.supplierCode !== undefined ? { supplierCode: input.supplierCode || null } : {}) };
    for (const field of ['label', 'supplier', 'supplierCode', 'archived'] as const) {
      const value = next[field];
      if (value === undefined || value === pack[field]) continue;
      before[field] = pack[field];
      after[field] = value;
    }
    if (Object.keys(after).length === 0) return getMaterial(material.id, transaction);
    if (input.archived === true) {
      const others = await MaterialPack.count({ where: { materialId: material.id, archived: false, id: { [Op.ne]: packId } }, transaction });
      if (others === 0) await assertNotNeeded(material, 'Cannot archive its last pack', transaction);
    }
    pack.set(after);
    await pack.save({ transaction });
    const label = packLabel(pack.size, material.unit);
    const action = 'archived' in after ? (input.archived ? 'pack.archive' : 'pack.restore') : 'pack.update';
    await audit({ userId: actorId, action, entityType: 'pack', entityId: packId, before: { material: material.name, pack: label, ...before }, after: { material: material.name, pack: label, ...after } }, transaction);
    return getMaterial(material.id, transaction);
  });
}

/** Records a new price from its date; the earlier prices stay as they were. */
export async function setPackPrice(
  sequelize: Sequelize,
  actorId: number,
  packId: number,
  input: z.output<typeof NewPriceSchema>,
): Promise<{ material: MaterialDto; catalogVersion: CatalogVersionChange }> {
  const { result: material, catalogVersion } = await withCatalogVersionChange(sequelize, () =>
    sequelize.transaction(async (transaction) => {
      const pack = await MaterialPack.findByPk(packId, { transaction, lock: transaction.LOCK.UPDATE });
      if (!pack) throw problems.notFound('Pack');
      const material = (await Material.findByPk(pack.materialId, { transaction }))!;
      const rows = (await pricesOf([packId], transaction)).get(packId) ?? [];
      const old = priceOn(rows, input.effectiveFrom);
      await PackPrice.create({ packId, price: input.price, effectiveFrom: input.effectiveFrom, userId: actorId, source: 'manual' }, { transaction });
      await audit(
        {
          userId: actorId,
          action: 'pack-price.create',
          entityType: 'pack-price',
          entityId: packId,
          before: old ? { material: material.name, pack: packLabel(pack.size, material.unit), price: showPrice(old.price), effectiveFrom: old.effectiveFrom } : null,
          after: {
            material: material.name,
            pack: packLabel(pack.size, material.unit),
            price: showPrice(input.price),
            effectiveFrom: input.effectiveFrom,
            changePct: old ? changePct(old.price, input.price) : null,
          },
        },
        transaction,
      );
      return getMaterial(material.id, transaction);
    }),
  );
  return { material, catalogVersion };
}

interface HistoryRow {
  id: number;
  pack_id: number;
  price: string;
  effective_from: string;
  source: string;
  user_name: string | null;
  created_at: Date;
}

export async function materialHistory(sequelize: Sequelize, materialId: number): Promise<MaterialHistory> {
  const material = await getMaterial(materialId);
  const { settings } = await loadSettings();
  const rows = await sequelize.query<HistoryRow>(
    `SELECT pp.id, pp.pack_id, pp.price::text AS price, to_char(pp.effective_from, 'YYYY-MM-DD') AS effective_from, pp.source,
            u.name AS user_name, pp.created_at
       FROM pack_prices pp
       JOIN material_packs mp ON mp.id = pp.pack_id
       LEFT JOIN users u ON u.id = pp.user_id
      WHERE mp.material_id = :materialId
      ORDER BY pp.effective_from ASC, pp.id ASC`,
    { replacements: { materialId }, type: QueryTypes.SELECT },
  );
  return {
    material,
    currency: settings.pricing.currency,
    packs: material.packs.map((pack) => {
      let previous: string | null = null;
      const history: PriceHistoryEntry[] = rows
        .filter((r) => r.pack_id === pack.id)
        .map((r) => {
          const entry: PriceHistoryEntry = {
            id: r.id,
            price: showPrice(r.price),
            effectiveFrom: r.effective_from,
            source: r.source,
            userName: r.user_name,
            createdAt: new Date(r.created_at).toISOString(),
            changePct: changePct(previous, r.price),
          };
          previous = r.price;
          return entry;
        });
      return { pack, history };
    }),
  };
}
