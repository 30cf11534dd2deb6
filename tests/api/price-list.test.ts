import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry, Material, MaterialPack, PackPrice } from '../../server/models';
import { loadCatalog } from '../../server/services/catalog';
import { changePct, showPrice } from '../../server/services/price-list';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
let estimator: Session;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
  estimator = await signInAs(app, 'estimator');
});

const write = (s: Session, method: 'post' | 'patch', path: string, body: object) => s.agent[method](path).set('x-csrf-token', s.csrf).send(body);

async function packOf(materialKey: string, size: number) {
  const material = await Material.findOne({ where: { key: materialKey } });
  const pack = await MaterialPack.findOne({ where: { materialId: material!.id, size: String(size) } });
  return { material: material!, pack: pack! };
}

describe('price list: reading', () => {
  it('lists materials with their packs and the price in force, sorted, paged and searched on the server', async () => {
    const res = await estimator.agent.get('/api/price-list/materials?sort=name&dir=desc&pageSize=3').expect(200);
    expect(res.body.rows).toHaveLength(3);
    expect(res.body.total).toBeGreaterThanOrEqual(12);
    const names = res.body.rows.map((r: { name: string }) => r.name);
    expect([...names].sort((a, b) => b.localeCompare(a))).toEqual(names);
    const found = await estimator.agent.get('/api/price-list/materials?q=SPIRIT-2500').expect(200);
    expect(found.body.rows.map((r: { key: string }) => r.key)).toEqual(['spirit']);
    const spirit = found.body.rows[0];
    const p2500 = spirit.packs.find((p: { size: string }) => p.size === '2500');
    expect(p2500).toMatchObject({ supplier: 'Marrowhaze Trade Spirits', supplierCode: 'SPIRIT-2500', price: '12.90', priceFrom: '2026-09-01' });
    // The demo history holds an older price 8 % lower.
    expect(p2500.previousPrice).toBe('11.87');
    expect(p2500.changePct).toBe('8.7');
    const kind = await estimator.agent.get('/api/price-list/materials?kind=wax').expect(200);
    expect(kind.body.rows.every((r: { kind: string }) => r.kind === 'wax')).toBe(true);
    const bad = await estimator.agent.get('/api/price-list/materials?sort=price');
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text).field).toBe('sort');
  });

  it('computes the change in percent exactly', () => {
    expect(changePct('11.40', '12.35')).toBe('8.3');
    expect(changePct('0', '5')).toBeNull();
    expect(changePct('20.00', '19.00')).toBe('-5.0');
    expect(showPrice('11.4000')).toBe('11.40');
    expect(showPrice('0.0450')).toBe('0.045');
  });
});

describe('price list: the owner changes it', () => {
  it('a new price keeps the old one: history, loadCatalog on an earlier date, audit entry', async () => {
    const { material, pack } = await packOf('pumice', 1000);
    const before = await loadCatalog(sequelize, { onDate: '2026-10-15' });
    const oldPrice = before.catalog.materials.find((m) => m.key === 'pumice')!.packs.find((p) => p.size === 1000)!.price;
    const res = await write(owner, 'post', `/api/price-list/packs/${pack.id}/prices`, { price: '16,25', effectiveFrom: '2026-11-20' }).expect(201);
    expect(res.body.material.packs.find((p: { id: number }) => p.id === pack.id)).toMatchObject({ price: '16.25', priceFrom: '2026-11-20', previousPrice: oldPrice });
    expect(res.body.catalogVersion.changed).toBe(true);
    expect(res.body.catalogVersion.from).not.toBe(res.body.catalogVersion.to);

    // The old row is still there.
    const rows = await PackPrice.findAll({ where: { packId: pack.id }, order: [['effectiveFrom', 'ASC'], ['id', 'ASC']] });
    expect(rows.map((r) => showPrice(r.price))).toEqual(expect.arrayContaining([oldPrice, '16.25']));
    // Earlier dates still price with the old figure, later ones with the new.
    const earlier = await loadCatalog(sequelize, { onDate: '2026-10-15' });
    expect(earlier.catalog.materials.find((m) => m.key === 'pumice')!.packs.find((p) => p.size === 1000)!.price).toBe(oldPrice);
    const later = await loadCatalog(sequelize, { onDate: '2026-11-21' });
    expect(later.catalog.materials.find((m) => m.key === 'pumice')!.packs.find((p) => p.size === 1000)!.price).toBe('16.25');

    const history = await estimator.agent.get(`/api/price-list/materials/${material.id}/history`).expect(200);
    const entries = history.body.packs.find((p: { pack: { id: number } }) => p.pack.id === pack.id).history;
    expect(entries.at(-1)).toMatchObject({ price: '16.25', effectiveFrom: '2026-11-20', userName: 'Ottilie Marchbank', source: 'manual' });
    expect(entries.at(-1).changePct).toBe(changePct(oldPrice, '16.25'));
    expect(history.body.currency).toBe('GBP');

    const entry = await AuditEntry.findOne({ where: { action: 'pack-price.create', entityId: String(pack.id) }, order: [['id', 'DESC']] });
    expect(entry?.before).toMatchObject({ price: oldPrice, effectiveFrom: '2026-09-01' });
    expect(entry?.after).toMatchObject({ price: '16.25', effectiveFrom: '2026-11-20', material: 'Pumice powder, fine', pack: '1000 g' });
  });

  it('refuses a bad price or date naming the field, and other roles with 403', async () => {
    const { pack } = await packOf('pumice', 250);
    const bad = await write(owner, 'post', `/api/price-list/packs/${pack.id}/prices`, { price: '12.5.0', effectiveFrom: '2026-11-20' });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.text)).toMatchObject({ field: 'price' });
    const negative = await write(owner, 'post', `/api/price-list/packs/${pack.id}/prices`, { price: '-3', effectiveFrom: '2026-11-20' });
    expect(JSON.parse(negative.text).field).toBe('price');
    const date = await write(owner, 'post', `/api/price-list/packs/${pack.id}/prices`, { price: '3.00', effectiveFrom: '2026-02-30' });
    expect(JSON.parse(date.text)).toMatchObject({ status: 400, field: 'effectiveFrom' });
    const before = await PackPrice.count({ where: { packId: pack.id } });
    await write(estimator, 'post', `/api/price-list/packs/${pack.id}/prices`, { price: '1.00', effectiveFrom: '2026-11-20' }).expect(403);
    expect(await PackPrice.count({ where: { packId: pack.id } })).toBe(before);
  });

  it('adds a material with its first pack, edits name and notes inline, adds a pack, archives and restores', async () => {
    const created = await write(owner, 'post', '/api/price-list/materials', {
      name: 'Garnet shellac test',
      kind: 'shellac',
      unit: 'g',
      notes: 'Darker, for old mahogany',
      pack: { size: 250, supplier: 'Quillby Finishing Supplies', supplierCode: 'QFS-GARNET-250', price: '13.10', effectiveFrom: '2026-12-01' },
    }).expect(201);
    expect(created.body).toMatchObject({ key: 'garnet-shellac-test', kind: 'shellac', unit: 'g' });
    expect(created.body.packs[0]).toMatchObject({ size: '250', price: '13.10', supplierCode: 'QFS-GARNET-250' });
    const id = created.body.id as number;

    const missing = await write(owner, 'post', '/api/price-list/materials', { name: '', kind: 'shellac', unit: 'g', pack: { size: 0, price: 'x', effectiveFrom: '2026-12-01' } });
    expect(missing.status).toBe(400);
    const fields = JSON.parse(missing.text).errors.map((e: { field: string }) => e.field);
    expect(fields).toEqual(expect.arrayContaining(['name', 'pack.size', 'pack.price']));

    const renamed = await write(owner, 'patch', `/api/price-list/materials/${id}`, { name: 'Garnet shellac flakes (test)', notes: 'For dark repairs' }).expect(200);
    expect(renamed.body).toMatchObject({ name: 'Garnet shellac flakes (test)', notes: 'For dark repairs' });
    const audited = await AuditEntry.findOne({ where: { action: 'material.update', entityId: String(id) } });
    expect(audited?.before).toMatchObject({ name: 'Garnet shellac test', notes: 'Darker, for old mahogany' });
    expect(audited?.after).toMatchObject({ name: 'Garnet shellac flakes (test)', notes: 'For dark repairs' });

    const withPack = await write(owner, 'post', `/api/price-list/materials/${id}/packs`, { size: 1000, supplier: 'Quillby Finishing Supplies', price: '39.00', effectiveFrom: '2026-12-01' }).expect(201);
    expect(withPack.body.packs.map((p: { size: string }) => p.size)).toEqual(['250', '1000']);
    const dup = await write(owner, 'post', `/api/price-list/materials/${id}/packs`, { size: 1000, price: '40.00', effectiveFrom: '2026-12-01' });
    expect(JSON.parse(dup.text)).toMatchObject({ status: 400, field: 'size' });

    const archived = await write(owner, 'patch', `/api/price-list/materials/${id}`, { archived: true }).expect(200);
    expect(archived.body.archived).toBe(true);
    expect(archived.body.packs.every((p: { archived: boolean }) => p.archived)).toBe(true);
    const active = await owner.agent.get('/api/price-list/materials?q=garnet').expect(200);
    expect(active.body.rows).toHaveLength(0);
    const listed = await owner.agent.get('/api/price-list/materials?q=garnet&archived=archived').expect(200);
    expect(listed.body.rows).toHaveLength(1);
    const catalog = await loadCatalog(sequelize);
    expect(catalog.catalog.materials.some((m) => m.key === 'garnet-shellac-test')).toBe(false);
    await write(owner, 'patch', `/api/price-list/materials/${id}`, { archived: false }).expect(200);
  });

  it('will not archive a material the estimator still needs', async () => {
    const { material } = await packOf('spirit', 1000);
    const res = await write(owner, 'patch', `/api/price-list/materials/${material.id}`, { archived: true });
    expect(res.status).toBe(409);
    expect(JSON.parse(res.text)).toMatchObject({ code: 'material_in_use' });
    expect((await Material.findByPk(material.id))!.archived).toBe(false);
  });

  it('edits a pack\u2019s supplier code and refuses unknown fields', async () => {
    const { pack } = await packOf('wax', 400);
    const res = await write(owner, 'patch', `/api/price-list/packs/${pack.id}`, { supplierCode: 'WAX-400-B' }).expect(200);
    expect(res.body.packs.find((p: { id: number }) => p.id === pack.id).supplierCode).toBe('WAX-400-B');
    await write(owner, 'patch', `/api/price-list/packs/${pack.id}`, { supplierCode: `WAX-400` }).expect(200);
    const extra = await write(owner, 'patch', `/api/price-list/packs/${pack.id}`, { price: '1.00' });
    expect(extra.status).toBe(400);
    await write(owner, 'patch', '/api/price-list/packs/999999', { label: 'x' }).expect(404);
  });
});
