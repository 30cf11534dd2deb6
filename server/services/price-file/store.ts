/**
 * The price file kept and applied: the context read from the price list, previews stored for half an hour, and applying one in a transaction with its audit.
 */
import { createHash, randomUUID } from 'node:crypto';
import { Op, type Sequelize } from 'sequelize';
import type { PriceFileApplied, PriceFilePreview as PreviewDto } from '@shared/schemas/price-list';
import { HttpProblem, problems } from '../../http/problem';
import { Material, MaterialPack, PackPrice, PriceFilePreview } from '../../models';
import { audit } from '../audit';
import { withCatalogVersionChange } from '../catalog-version';
import { loadSettings } from '../catalog';
import { freeMaterialKey, priceOn, showPrice } from '../price-list';
import { PREVIEW_MINUTES, PRICE_FILE_MAX_BYTES, type ParseContext, codeKey, readPriceFile, sizeKey } from './reader';

async function loadContext(): Promise<ParseContext> {
  const [materials, packs] = await Promise.all([
    Material.findAll({ where: { archived: false } }),
    MaterialPack.findAll({ where: { archived: false } }),
  ]);
  const prices = await PackPrice.findAll({ where: { packId: { [Op.in]: packs.map((p) => p.id) } }, order: [['effectiveFrom', 'ASC'], ['id', 'ASC']] });
  const ctx: ParseContext = {
    packsByCode: new Map(),
    packsByMaterialSize: new Map(),
    materialsByKey: new Map(),
    materialsByName: new Map(),
    materialsById: new Map(),
    pricesByPack: new Map(),
  };
  for (const m of materials) {
    const lite = { id: m.id, key: m.key, name: m.name, unit: m.unit };
    ctx.materialsByKey.set(m.key, lite);
    ctx.materialsByName.set(m.name.trim().toLowerCase(), lite);
    ctx.materialsById.set(m.id, lite);
  }
  for (const p of packs) {
    if (!ctx.materialsById.has(p.materialId)) continue;
    const lite = { id: p.id, materialId: p.materialId, size: String(p.size), supplier: p.supplier, supplierCode: p.supplierCode };
    if (p.supplierCode) ctx.packsByCode.set(codeKey(p.supplier, p.supplierCode), lite);
    ctx.packsByMaterialSize.set(sizeKey(p.materialId, p.size), lite);
  }
  for (const r of prices) {
    const list = ctx.pricesByPack.get(r.packId) ?? [];
    list.push({ id: r.id, packId: r.packId, price: String(r.price), effectiveFrom: r.effectiveFrom });
    ctx.pricesByPack.set(r.packId, list);
  }
  return ctx;
}

function toDto(row: PriceFilePreview): PreviewDto {
  return { ...row.preview, id: row.id, expiresAt: row.expiresAt.toISOString(), appliedAt: row.appliedAt ? row.appliedAt.toISOString() : null };
}

/** Parses an uploaded file and stores its preview for the apply step. */
export async function previewPriceFile(actorId: number, fileName: string, buffer: Buffer): Promise<PreviewDto> {
  const [ctx, { settings }] = await Promise.all([loadContext(), loadSettings()]);
  const parsed = readPriceFile(buffer, ctx);
  const contentHash = createHash('sha256').update(buffer).digest('hex');
  const safeName = [...fileName].map((c) => (c.charCodeAt(0) < 32 || c === '/' || c === '\\' ? '_' : c)).join('').slice(0, 200) || 'price-file.csv';
  // Old previews are of no use to anyone: clear those expired a day ago.
  await PriceFilePreview.destroy({ where: { expiresAt: { [Op.lt]: new Date(Date.now() - 24 * 3600_000) } } });
  const row = await PriceFilePreview.create({
    id: randomUUID(),
    userId: actorId,
    fileName: safeName,
    contentHash,
    preview: { ...parsed, fileName: safeName, contentHash, currency: settings.pricing.currency },
    expiresAt: new Date(Date.now() + PREVIEW_MINUTES * 60_000),
    appliedAt: null,
  });
  return toDto(row);
}

export async function getPriceFilePreview(id: string): Promise<PreviewDto> {
  const row = await PriceFilePreview.findByPk(id);
  if (!row) throw problems.notFound('That price file preview');
  return toDto(row);
}

/**
 * Applies a stored preview in one transaction: every new price, pack and material, each with its audit entry,
 * or nothing at all.
 */
export async function applyPriceFile(sequelize: Sequelize, actorId: number, id: string, contentHash: string): Promise<PriceFileApplied> {
  const { result, catalogVersion } = await withCatalogVersionChange(sequelize, () => applyInTransaction(sequelize, actorId, id, contentHash));
  return { ...result, catalogVersion };
}

async function applyInTransaction(sequelize: Sequelize, actorId: number, id: string, contentHash: string): Promise<Omit<PriceFileApplied, 'catalogVersion'>> {
  return sequelize.transaction(async (transaction) => {
    const row = await PriceFilePreview.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw problems.notFound('That price file preview');
    if (row.appliedAt) throw problems.conflict('price_file_applied', `This file was applied on ${row.appliedAt.toISOString().slice(0, 16).replace('T', ' ')} UTC; upload it again to preview it anew.`);
    if (row.expiresAt.getTime() < Date.now()) throw problems.conflict('price_file_expired', 'This preview has expired: upload the file again.');
    if (row.contentHash !== contentHash) {
      throw problems.conflict('price_file_changed', 'The file confirmed is not the file previewed: upload it again and check the preview.');
    }
    const preview = row.preview;
    if (preview.errors.length > 0) {
      throw problems.conflict('price_file_has_errors', `The file has ${preview.errors.length} row${preview.errors.length > 1 ? 's' : ''} that cannot be read; fix ${preview.errors.length > 1 ? 'them' : 'it'} and upload it again. Nothing was changed.`);
    }
    if (preview.matched.length + preview.newItems.length === 0) throw problems.conflict('price_file_no_changes', 'The file changes no price.');
    const source = `file: ${row.fileName}`.slice(0, 120);

    const result = await (async () => {
      let pricesAdded = 0;
      let packsAdded = 0;
      let materialsAdded = 0;
      for (const m of preview.matched) {
        const pack = await MaterialPack.findByPk(m.packId, { transaction, lock: transaction.LOCK.UPDATE });
        if (!pack || pack.archived) throw problems.conflict('prices_moved', `Line ${m.line}: the ${m.packSize} ${m.unit} pack of ${m.materialName} was removed since the preview. Upload the file again.`);
        const rows = (await PackPrice.findAll({ where: { packId: m.packId }, order: [['effectiveFrom', 'ASC'], ['id', 'ASC']], transaction })).map((r) => ({
          id: r.id,
          packId: r.packId,
          price: String(r.price),
          effectiveFrom: r.effectiveFrom,
        }));
        const now = priceOn(rows, m.effectiveFrom);
        const nowShown = now ? showPrice(now.price) : null;
        if (nowShown !== m.oldPrice) {
          throw problems.conflict('prices_moved', `Line ${m.line}: the price of ${m.materialName}, ${m.packSize} ${m.unit} changed since the preview (${m.oldPrice ?? 'none'} → ${nowShown ?? 'none'}). Upload the file again.`);
        }
        await PackPrice.create({ packId: m.packId, price: m.newPrice, effectiveFrom: m.effectiveFrom, userId: actorId, source }, { transaction });
        if (!pack.supplierCode && m.supplierCode) await pack.update({ supplierCode: m.supplierCode }, { transaction });
        pricesAdded++;
        await audit(
          {
            userId: actorId,
            action: 'pack-price.create',
            entityType: 'pack-price',
            entityId: m.packId,
            before: m.oldPrice ? { material: m.materialName, pack: `${m.packSize} ${m.unit}`, price: m.oldPrice } : null,
            after: { material: m.materialName, pack: `${m.packSize} ${m.unit}`, price: m.newPrice, effectiveFrom: m.effectiveFrom, changePct: m.changePct, source },
          },
          transaction,
        );
      }
      const createdMaterials = new Map<string, number>();
      for (const item of preview.newItems) {
        let materialId = item.materialId ?? createdMaterials.get(item.materialKey);
        if (materialId === undefined || materialId === null) {
          if ((await freeMaterialKey(item.materialKey, transaction)) !== item.materialKey) {
            throw problems.conflict('prices_moved', `Line ${item.line}: a material with key ${item.materialKey} was added since the preview. Upload the file again.`);
          }
          const material = await Material.create({ key: item.materialKey, name: item.materialName, kind: item.materialKind, unit: item.unit, notes: `Added from ${row.fileName}` }, { transaction });
          materialId = material.id;
          createdMaterials.set(item.materialKey, material.id);
          materialsAdded++;
          await audit({ userId: actorId, action: 'material.create', entityType: 'material', entityId: material.id, after: { key: item.materialKey, name: item.materialName, kind: item.materialKind, unit: item.unit, source } }, transaction);
        } else if (!(await Material.findByPk(materialId, { transaction }))) {
          throw problems.conflict('prices_moved', `Line ${item.line}: ${item.materialName} was removed since the preview. Upload the file again.`);
        }
        const clash = await MaterialPack.findOne({ where: { materialId, size: item.packSize, archived: false }, transaction });
        if (clash) throw problems.conflict('prices_moved', `Line ${item.line}: a ${item.packSize} ${item.unit} pack of ${item.materialName} was added since the preview. Upload the file again.`);
        const pack = await MaterialPack.create({ materialId, size: item.packSize, label: '', supplier: item.supplier, supplierCode: item.supplierCode }, { transaction });
        await PackPrice.create({ packId: pack.id, price: item.newPrice, effectiveFrom: item.effectiveFrom, userId: actorId, source }, { transaction });
        packsAdded++;
        pricesAdded++;
        await audit(
          {
            userId: actorId,
            action: 'pack.create',
            entityType: 'pack',
            entityId: pack.id,
            after: { material: item.materialName, pack: `${item.packSize} ${item.unit}`, supplier: item.supplier, supplierCode: item.supplierCode, price: item.newPrice, effectiveFrom: item.effectiveFrom, source },
          },
          transaction,
        );
      }
      return { pricesAdded, packsAdded, materialsAdded };
    })();
    row.appliedAt = new Date();
    await row.save({ transaction });
    await audit(
      {
        userId: actorId,
        action: 'price-file.apply',
        entityType: 'price-file',
        entityId: row.id,
        after: { fileName: row.fileName, contentHash: row.contentHash, ...result },
      },
      transaction,
    );
    return result;
  });
}

/** Thrown by the route when multer refuses a file. */
export function uploadProblem(err: unknown): HttpProblem | undefined {
  const code = (err as { code?: string } | null)?.code;
  if (code === 'LIMIT_FILE_SIZE') return new HttpProblem(413, 'price_file_too_large', 'File too large', `A price file may be at most ${PRICE_FILE_MAX_BYTES / 1024} KB.`, { field: 'file', errors: [{ field: 'file', message: `must be at most ${PRICE_FILE_MAX_BYTES / 1024} KB` }] });
  if (code && code.startsWith('LIMIT_')) return problems.badRequest('price_file_upload', `The upload was refused: ${(err as Error).message}.`, 'file');
  return undefined;
}
