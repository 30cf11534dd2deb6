/**
 * Around the board: the polishers, actual hours against estimates (with a suggested correction to each finishing
 * system's stage labour minutes, worked from the finished jobs estimated with that system, applied only when the
 * owner confirms), stock on hand, and the material forecast of the booked
 * jobs with a shopping list in packs.
 */
import Decimal from 'decimal.js';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import { choosePacks, sessionShare, toMinutes } from '@shared/calc';
import { sumMoney } from '@shared/money';
import type { StageKind } from '@shared/schemas/catalog';
import type {
  ActualsKindRow,
  ActualsReport,
  ActualsSuggestion,
  ApplyActualsData,
  ApplyActualsResult,
  ForecastRow,
  MaterialForecast,
  PolisherDto,
  PolisherInput,
  StockRow,
  UpdatePolisherInput,
} from '@shared/schemas/planning';
import { HttpProblem, problems } from '../http/problem';
import { AuditEntry, EstimateRevision, FinishingSystem, Job, JobSession, Material, MaterialStock, Polisher } from '../models';
import { audit } from './audit';
import { loadCatalog } from './catalog';
import { addDays, localNow } from './planning-context';
import { move } from './stock/ledger';

const round = (n: number, places = 2) => Math.round(n * 10 ** places) / 10 ** places;
/** Smallest relative change worth suggesting. */
const MIN_CHANGE = 0.02;

// ------------------------------------------------------------------------------------------- polishers

function polisherDto(p: Polisher): PolisherDto {
  return { id: p.id, name: p.name, hoursPerDay: Number(p.hoursPerDay), daysOff: [...p.daysOff].sort(), active: p.active };
}

export async function listPolishers(): Promise<PolisherDto[]> {
  return (await Polisher.findAll({ order: [['active', 'DESC'], ['name', 'ASC'], ['id', 'ASC']] })).map(polisherDto);
}

export async function createPolisher(sequelize: Sequelize, actorId: number, input: PolisherInput): Promise<PolisherDto> {
  return sequelize.transaction(async (transaction) => {
    const p = await Polisher.create({ name: input.name, hoursPerDay: input.hoursPerDay, daysOff: [...new Set(input.daysOff ?? [])], active: input.active ?? true }, { transaction });
    await audit({ userId: actorId, action: 'polisher.create', entityType: 'polisher', entityId: p.id, after: polisherDto(p) }, transaction);
    return polisherDto(p);
  });
}

/** Changing a polisher's hours or days off does not move booked sessions: the board flags any day they overbook. */
export async function updatePolisher(sequelize: Sequelize, actorId: number, id: number, input: UpdatePolisherInput): Promise<PolisherDto> {
  return sequelize.transaction(async (transaction) => {
    const p = await Polisher.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!p) throw problems.notFound('Polisher');
    const before = polisherDto(p);
    p.set({
      ...(input.name !== undefined ? { name: input.name } : {}),
      ...(input.hoursPerDay !== undefined ? { hoursPerDay: input.hoursPerDay } : {}),
      ...(input.daysOff !== undefined ? { daysOff: [...new Set(input.daysOff)] } : {}),
      ...(input.active !== undefined ? { active: input.active } : {}),
    });
    p.changed('daysOff', true);
    await p.save({ transaction });
    await audit({ userId: actorId, action: 'polisher.update', entityType: 'polisher', entityId: id, before, after: polisherDto(p) }, transaction);
    return polisherDto(p);
  });
}

// --------------------------------------------------------------------------------------------- actuals

async function computeActuals(transaction?: Transaction): Promise<ActualsReport> {
  const jobs = await Job.findAll({ where: { state: 'finished' }, order: [['id', 'DESC']], transaction });
  const sessions = jobs.length ? await JobSession.findAll({ where: { jobId: jobs.map((j) => j.id), done: true }, transaction }) : [];
  const byKind = new Map<StageKind, { est: number; act: number; jobs: Set<number>; sessions: number }>();
  for (const s of sessions) {
    // Extra work the customer took is not a finishing stage: it calibrates nothing.
    if (s.actualHours === null || s.stageKind === 'extra') continue;
    const row = byKind.get(s.stageKind) ?? { est: 0, act: 0, jobs: new Set<number>(), sessions: 0 };
    row.est += Number(s.estimatedHours);
    row.act += Number(s.actualHours);
    row.jobs.add(s.jobId);
    row.sessions++;
    byKind.set(s.stageKind, row);
  }
  const kinds: ActualsKindRow[] = [...byKind.entries()].map(([kind, r]) => ({
    kind,
    estimatedHours: round(r.est),
    actualHours: round(r.act),
    ratio: r.est > 0 ? round(r.act / r.est, 4) : null,
    jobs: r.jobs.size,
    sessions: r.sessions,
  }));
  // Jobs a stage was already corrected with count no more for it: applying a correction twice never compounds.
  const used = new Map<string, Set<number>>();
  for (const e of await AuditEntry.findAll({ where: { action: 'finishing-system.calibrate' }, attributes: ['entityId', 'after'], transaction })) {
    const after = e.after as { usedJobs?: Record<string, number[]> } | null;
    for (const [stageKey, ids] of Object.entries(after?.usedJobs ?? {})) {
      const k = `${e.entityId}:${stageKey}`;
      used.set(k, new Set([...(used.get(k) ?? []), ...ids]));
    }
  }
  const systems = await FinishingSystem.findAll({ where: { archived: false }, order: [['name', 'ASC'], ['id', 'ASC']], transaction });
  // Each finished job's finishing system, as it was estimated: a system is corrected from its own jobs only.
  const revisions = jobs.length ? await EstimateRevision.findAll({ where: { id: [...new Set(jobs.map((j) => j.revisionId))] }, attributes: ['id', 'result'], transaction }) : [];
  const systemOfRevision = new Map(revisions.map((r) => [r.id, r.result.system]));
  const systemOfJob = new Map(jobs.map((j) => [j.id, systemOfRevision.get(j.revisionId) ?? null]));
  const suggestions: ActualsSuggestion[] = [];
  for (const system of systems) {
    for (const stage of system.stages) {
      if (stage.labourMinPerM2PerCoat <= 0) continue;
      const skip = used.get(`${system.id}:${stage.key}`);
      let est = 0;
      let act = 0;
      const jobIds = new Set<number>();
      for (const s of sessions) {
        if (s.stageKind !== stage.kind || s.actualHours === null || skip?.has(s.jobId) || systemOfJob.get(s.jobId) !== system.key) continue;
        est += Number(s.estimatedHours);
        act += Number(s.actualHours);
        jobIds.add(s.jobId);
      }
      if (est <= 0) continue;
      const ratio = round(act / est, 4);
      const suggested = Math.min(600, round(stage.labourMinPerM2PerCoat * ratio, 1));
      // A change under 2 % is within what a day's weather does to a session: not worth a correction.
      if (Math.abs(suggested - stage.labourMinPerM2PerCoat) < stage.labourMinPerM2PerCoat * MIN_CHANGE) continue;
      suggestions.push({
        systemId: system.id,
        systemName: system.name,
        stageKey: stage.key,
        stageName: stage.name,
        kind: stage.kind,
        current: stage.labourMinPerM2PerCoat,
        suggested,
        ratio,
        estimatedHours: round(est),
        actualHours: round(act),
        jobs: jobIds.size,
        jobIds: [...jobIds].sort((a, b) => a - b),
      });
    }
  }
  const lastEnd = (jobId: number) => sessions.filter((s) => s.jobId === jobId && s.actualEnd).reduce<string | null>((t, s) => (t === null || s.actualEnd! > t ? s.actualEnd : t), null);
  const hoursOf = (jobId: number, field: 'estimatedHours' | 'actualHours') =>
    round(sessions.filter((s) => s.jobId === jobId).reduce((t, s) => t + Number(s[field] ?? 0), 0));
  return {
    finishedJobs: jobs.map((j) => ({ id: j.id, number: j.number, title: j.title, finishedOn: lastEnd(j.id), estimatedHours: hoursOf(j.id, 'estimatedHours'), actualHours: hoursOf(j.id, 'actualHours') })),
    kinds,
    suggestions,
  };
}

/** Estimated against actual hours per stage kind across finished jobs, and the corrections they suggest per finishing system. */
export function actualsReport(): Promise<ActualsReport> {
  return computeActuals();
}

/**
 * Writes the chosen corrections into the finishing systems' stages (labour minutes per m² per coat), recomputed
 * here from the finished jobs, in one transaction, each system's change audited with before and after.
 */
export async function applyActuals(sequelize: Sequelize, actorId: number, input: ApplyActualsData): Promise<ApplyActualsResult> {
  return sequelize.transaction(async (transaction) => {
    const report = await computeActuals(transaction);
    const applied: ApplyActualsResult['applied'] = [];
    const bySystem = new Map<number, string[]>();
    for (const item of input.items) bySystem.set(item.systemId, [...(bySystem.get(item.systemId) ?? []), item.stageKey]);
    for (const [systemId, keys] of bySystem) {
      const system = await FinishingSystem.findByPk(systemId, { transaction, lock: transaction.LOCK.UPDATE });
      if (!system) throw problems.badRequest('unknown_system', `items: no finishing system ${systemId}`, 'items');
      const stages = structuredClone(system.stages);
      const changes: { stageKey: string; before: number; after: number; ratio: number; jobIds: number[] }[] = [];
      for (const key of new Set(keys)) {
        const s = report.suggestions.find((x) => x.systemId === systemId && x.stageKey === key);
        const stage = stages.find((x) => x.key === key);
        if (!s || !stage) {
          throw new HttpProblem(409, 'no_suggestion', 'Nothing to apply', `Stage "${key}" of ${system.name} has no suggested correction now: reload the actuals.`, { field: 'items' });
        }
        changes.push({ stageKey: key, before: stage.labourMinPerM2PerCoat, after: s.suggested, ratio: s.ratio, jobIds: s.jobIds });
        stage.labourMinPerM2PerCoat = s.suggested;
        applied.push({ systemId, stageKey: key, before: s.current, after: s.suggested });
      }
      system.set({ stages });
      system.changed('stages', true);
      await system.save({ transaction });
      await audit(
        {
          userId: actorId,
          action: 'finishing-system.calibrate',
          entityType: 'finishing-system',
          entityId: systemId,
          before: { name: system.name, labourMinPerM2PerCoat: Object.fromEntries(changes.map((c) => [c.stageKey, c.before])) },
          after: {
            name: system.name,
            labourMinPerM2PerCoat: Object.fromEntries(changes.map((c) => [c.stageKey, c.after])),
            ratio: Object.fromEntries(changes.map((c) => [c.stageKey, c.ratio])),
            // The finished jobs each correction rests on; they do not count again for the same stage.
            usedJobs: Object.fromEntries(changes.map((c) => [c.stageKey, c.jobIds])),
          },
        },
        transaction,
      );
    }
    return { applied };
  });
}

// ----------------------------------------------------------------------------------------------- stock

export async function listStock(): Promise<StockRow[]> {
  const materials = await Material.findAll({ where: { archived: false }, order: [['name', 'ASC']] });
  const stock = new Map((await MaterialStock.findAll()).map((s) => [s.materialId, s]));
  return materials.map((m) => ({
    materialId: m.id,
    key: m.key,
    name: m.name,
    kind: m.kind,
    unit: m.unit,
    quantity: Number(stock.get(m.id)?.quantity ?? 0),
    updatedAt: stock.get(m.id)?.updatedAt.toISOString() ?? null,
  }));
}

export async function setStock(sequelize: Sequelize, actorId: number, materialId: number, quantity: number): Promise<StockRow> {
  await sequelize.transaction(async (transaction) => {
    const material = await Material.findByPk(materialId, { transaction });
    if (!material) throw problems.notFound('Material');
    const row = await MaterialStock.findByPk(materialId, { transaction, lock: transaction.LOCK.UPDATE });
    const before = row ? Number(row.quantity) : 0;
    // Through the ledger, so that the quantity set by hand is a movement like any other.
    await move({ materialId, kind: 'set', quantity: new Decimal(quantity.toFixed(3)).minus(row?.quantity ?? 0), reason: 'Quantity set by hand', actorId }, transaction);
    await audit({ userId: actorId, action: 'stock.update', entityType: 'material', entityId: materialId, before: { name: material.name, quantity: before, unit: material.unit }, after: { name: material.name, quantity, unit: material.unit } }, transaction);
  });
  return (await listStock()).find((r) => r.materialId === materialId)!;
}

// -------------------------------------------------------------------------------------------- forecast

/**
 * What the booked jobs will use from today over the next `weeks`: each stage's flakes, spirit and other materials
 * spread evenly over its sessions, each share on its session's planned day (sessions overdue and not done count in
 * the first week). Against stock on hand, the shortfall bought in the cheapest packs of today's price list.
 */
export async function materialForecast(sequelize: Sequelize, q: { weeks: number }): Promise<MaterialForecast> {
  const today = localNow().slice(0, 10);
  const end = addDays(today, q.weeks * 7);
  const jobs = await Job.findAll({ where: { state: { [Op.in]: ['booked', 'in-progress'] } }, order: [['roomStart', 'ASC'], ['id', 'ASC']] });
  const sessions = jobs.length ? await JobSession.findAll({ where: { jobId: jobs.map((j) => j.id), done: false }, order: [['jobId', 'ASC'], ['idx', 'ASC']] }) : [];
  const totals = new Map<string, { need: number; unit: string; byWeek: number[] }>();
  const perJob: MaterialForecast['jobs'] = [];
  const day0 = toMinutes(today) / 1440;
  for (const job of jobs) {
    const stages = new Map(job.stages.map((s) => [s.key, s]));
    const mine: Record<string, number> = {};
    let count = 0;
    for (const s of sessions) {
      if (s.jobId !== job.id || !s.plannedStart || s.plannedStart.slice(0, 10) >= end) continue;
      const stage = stages.get(s.stage);
      if (!stage) continue;
      count++;
      const week = Math.max(0, Math.floor((toMinutes(s.plannedStart.slice(0, 10)) / 1440 - day0) / 7));
      for (const m of stage.materials) {
        // Sheets, cloths and pads fall on their sessions in whole pieces.
        const share = sessionShare(m.quantity, m.unit, stage.sessions, Math.min(s.session, stage.sessions));
        mine[m.material] = (mine[m.material] ?? 0) + share;
        const t = totals.get(m.material) ?? { need: 0, unit: m.unit, byWeek: Array.from({ length: q.weeks }, () => 0) };
        t.need += share;
        t.byWeek[week] = (t.byWeek[week] ?? 0) + share;
        totals.set(m.material, t);
      }
    }
    if (count > 0) perJob.push({ id: job.id, number: job.number, title: job.title, sessions: count, materials: Object.fromEntries(Object.entries(mine).map(([k, v]) => [k, round(v, 3)])) });
  }
  const loaded = await loadCatalog(sequelize);
  const priced = new Map(loaded.catalog.materials.map((m) => [m.key, m]));
  const materials = new Map((await Material.findAll({ where: { key: [...totals.keys()] } })).map((m) => [m.key, m]));
  const stock = new Map((await MaterialStock.findAll()).map((s) => [s.materialId, Number(s.quantity)]));
  const rows: ForecastRow[] = [...totals.entries()].map(([key, t]) => {
    const material = materials.get(key);
    const catalogMaterial = priced.get(key);
    const need = round(t.need, 3);
    const onHand = material ? (stock.get(material.id) ?? 0) : 0;
    const short = round(Math.max(0, need - onHand), 3);
    const choice = catalogMaterial && short > 0 ? choosePacks(short, catalogMaterial.packs) : null;
    return {
      materialId: material?.id ?? null,
      key,
      name: catalogMaterial?.name ?? material?.name ?? key,
      unit: material?.unit ?? t.unit,
      need,
      stock: onHand,
      short,
      packs: choice?.packs ?? [],
      cost: choice?.cost ?? '0.00',
      byWeek: t.byWeek.map((v) => round(v, 3)),
      unpriced: !catalogMaterial,
    };
  });
  rows.sort((a, b) => a.name.localeCompare(b.name));
  return {
    from: today,
    to: addDays(end, -1),
    weeks: q.weeks,
    currency: loaded.catalog.pricing.currency,
    rows,
    jobs: perJob,
    total: sumMoney(rows.map((r) => r.cost)).toFixed(2),
  };
}
