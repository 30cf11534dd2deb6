/**
 * The price list as the estimator reads it: species, finishing systems, materials with their packs at the price in
 * force on a date, labour rates and the workshop's settings, assembled into the engine's Catalog.
 */
import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { CatalogSchema, type Catalog, type Material as CatalogMaterial } from '@shared/schemas/catalog';
import { WorkshopSettingsSchema, type WorkshopSettings } from '@shared/schemas/workshop';
import { DEFAULT_TIME_ZONE, setWorkshopTimeZone, today } from '@shared/time';
import { HttpProblem, problems } from '../http/problem';
import { FinishingSystem, LabourRate, Material, Species, type Workshop } from '../models';
import { currentWorkshop } from './workshops';
import type { SharedCaches } from './shared-caches';
import { allOf } from '../db/queries';
import { currentWorkshopId, noteWorkshopTimeZone } from '../db/workshop-context';

export interface LoadedCatalog {
  catalog: Catalog;
  settings: WorkshopSettings;
  /** Things the owner should fix before quoting (a material without a price, a rate of zero). */
  warnings: { code: string; text: string }[];
}

interface PriceRow {
  pack_id: number;
  material_id: number;
  size: string;
  label: string;
  supplier: string;
  price: string | null;
}

/** Trims a NUMERIC string's trailing zeros after the second decimal ("11.4000" → "11.40"). */
function money(value: string): string {
  const [whole, frac = ''] = value.split('.');
  const trimmed = frac.replace(/0+$/, '');
  return `${whole}.${trimmed.padEnd(2, '0')}`;
}

/** The workshop's settings, checked against the shared schema. */
export async function loadSettings(transaction?: Transaction): Promise<{ workshop: Workshop; settings: WorkshopSettings }> {
  const workshop = await currentWorkshop(transaction);
  if (!workshop) throw problems.notFound('The workshop');
  const parsed = WorkshopSettingsSchema.safeParse(workshop.settings);
  if (!parsed.success) {
    // Stored settings that no longer fit the schema are the server's fault, never the caller's.
    const issue = parsed.error.issues[0]!;
    throw new HttpProblem(500, 'settings_invalid', 'Workshop settings unreadable', `Stored setting ${issue.path.join('.')} is invalid: ${issue.message}`);
  }
  // Under a workshop's scope the clock takes this workshop's zone for the rest of the work (and remembers it for the
  // workshop); outside any scope (a script, a test's fixtures) it is the process's one zone.
  const zone = parsed.data.timeZone ?? DEFAULT_TIME_ZONE;
  if (!noteWorkshopTimeZone(zone)) setWorkshopTimeZone(zone);
  return { workshop, settings: parsed.data };
}

/**
 * A cheap fingerprint of everything the catalog is built from: any write to the price list, settings, systems or
 * species changes it. One small query instead of six larger ones on every preview.
 */
async function catalogStamp(sequelize: Sequelize, transaction?: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ stamp: string }>(
    `SELECT concat_ws('|',
       (SELECT max(updated_at) FROM workshops),
       (SELECT max(updated_at) FROM species), (SELECT count(*) FROM species),
       (SELECT max(updated_at) FROM finishing_systems), (SELECT count(*) FROM finishing_systems),
       (SELECT max(updated_at) FROM materials), (SELECT count(*) FROM materials),
       (SELECT max(updated_at) FROM material_packs), (SELECT count(*) FROM material_packs),
       (SELECT max(id) FROM pack_prices), (SELECT count(*) FROM pack_prices),
       (SELECT max(updated_at) FROM labour_rates), (SELECT count(*) FROM labour_rates)) AS stamp`,
    { type: QueryTypes.SELECT, transaction },
  );
  return row!.stamp;
}

/** Catalogs recently built, by date and stamp. Callers must not change what they get (the engine never does). */
const recent = new Map<string, LoadedCatalog>();

/**
 * Loads the catalog in force on `onDate` (YYYY-MM-DD; today when left out). With an app's `cache` and outside a
 * transaction, the catalog comes from memory without a query (the cache is dropped on every instance when the price
 * list changes); otherwise a fingerprint query says whether a recently built one still holds.
 */
export async function loadCatalog(sequelize: Sequelize, opts: { onDate?: string; transaction?: Transaction; cache?: SharedCaches } = {}): Promise<LoadedCatalog> {
  const onDate = opts.onDate ?? today();
  // Each workshop has its own catalog: the workshop is part of every key (row-level security decides what is built).
  const workshop = currentWorkshopId() ?? 'none';
  if (opts.cache && !opts.transaction) return opts.cache.catalog(`${workshop}|${onDate}`, () => loadCatalog(sequelize, { onDate }));
  const key = `${workshop}|${onDate}|${await catalogStamp(sequelize, opts.transaction)}`;
  const hit = recent.get(key);
  if (hit) return hit;
  const loaded = await buildCatalog(sequelize, onDate, opts.transaction);
  recent.set(key, loaded);
  if (recent.size > 8) recent.delete(recent.keys().next().value!);
  return loaded;
}

async function buildCatalog(sequelize: Sequelize, onDate: string, transaction?: Transaction): Promise<LoadedCatalog> {
  // One transaction is one connection: its queries run one after another. Without one, they run side by side.
  const tasks = [
    () => loadSettings(transaction),
    () => Species.findAll({ where: { archived: false }, order: [['name', 'ASC']], transaction }),
    () => FinishingSystem.findAll({ where: { archived: false }, order: [['id', 'ASC']], transaction }),
    () => Material.findAll({ order: [['id', 'ASC']], transaction }),
    () => LabourRate.findAll({ order: [['id', 'ASC']], transaction }),
    () =>
      sequelize.query<PriceRow>(
        `SELECT p.id AS pack_id, p.material_id, p.size::text AS size, p.label, p.supplier,
                (SELECT pp.price::text FROM pack_prices pp
                  WHERE pp.pack_id = p.id AND pp.effective_from <= :onDate
                  ORDER BY pp.effective_from DESC, pp.id DESC LIMIT 1) AS price
           FROM material_packs p
          WHERE NOT p.archived
          ORDER BY p.material_id, p.size`,
        { replacements: { onDate }, type: QueryTypes.SELECT, transaction },
      ),
  ] as const;
  const results = await allOf(transaction, tasks);
  const [{ settings }, species, systems, materials, rates, priceRows] = results as unknown as [
    Awaited<ReturnType<(typeof tasks)[0]>>,
    Awaited<ReturnType<(typeof tasks)[1]>>,
    Awaited<ReturnType<(typeof tasks)[2]>>,
    Awaited<ReturnType<(typeof tasks)[3]>>,
    Awaited<ReturnType<(typeof tasks)[4]>>,
    Awaited<ReturnType<(typeof tasks)[5]>>,
  ];

  const warnings: LoadedCatalog['warnings'] = [];
  const packsByMaterial = new Map<number, PriceRow[]>();
  for (const row of priceRows) {
    if (row.price === null) continue;
    const list = packsByMaterial.get(row.material_id) ?? [];
    list.push(row);
    packsByMaterial.set(row.material_id, list);
  }
  const catalogMaterials: CatalogMaterial[] = [];
  for (const m of materials) {
    const packs = packsByMaterial.get(m.id) ?? [];
    if (packs.length === 0) continue;
    if (packs.some((p) => Number(p.price) === 0)) {
      warnings.push({ code: 'unpriced-material', text: `${m.name} has a pack without a price: its cost counts as zero until the owner enters one.` });
    }
    catalogMaterials.push({
      key: m.key,
      name: m.name,
      kind: m.kind as CatalogMaterial['kind'],
      unit: m.unit,
      supplier: packs[0]!.supplier,
      packs: packs.map((p) => ({ size: Number(p.size), price: money(p.price!), ...(p.label ? { label: p.label } : {}) })),
    });
  }
  for (const r of rates) {
    if (Number(r.perHour) === 0) warnings.push({ code: 'unpriced-rate', text: `The ${r.name.toLowerCase()} rate is zero: labour counts as free until the owner sets it.` });
  }

  const body = {
    species: species.map((s) => ({ key: s.key, name: s.name, pores: s.pores, needsGrainFill: s.needsGrainFill, absorbency: Number(s.absorbency) })),
    systems: systems.map((s) => ({ key: s.key, name: s.name, description: s.description, stages: s.stages })),
    materials: catalogMaterials,
    labourRates: rates.map((r) => ({ key: r.key, name: r.name, perHour: money(String(r.perHour)) })),
    pricing: settings.pricing,
    factors: settings.factors,
    calendar: settings.calendar,
    shellac: settings.shellac,
    safety: settings.safety,
  };
  const version = `pl-${createHash('sha256').update(JSON.stringify(body)).digest('hex').slice(0, 12)}`;
  const parsed = CatalogSchema.safeParse({ version, ...body });
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw problems.conflict('catalog_incomplete', `The price list is incomplete: ${issue.path.join('.')}: ${issue.message}`);
  }
  return { catalog: parsed.data, settings, warnings };
}
