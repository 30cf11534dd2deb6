/**
 * Finishing systems and wood species as the owner keeps them. Stages are validated by the engine's StageSchema and
 * every material a stage uses must be in the price list, so the estimator's catalog stays whole.
 */
import { Op, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import { validationSentence } from '@shared/schemas/error-map';
import type { Page } from '@shared/schemas/auth';
import {
  keyFromName,
  type CopySystemInput,
  type FinishingSystemDto,
  type SpeciesDto,
  type SpeciesListQuery,
  type SystemUpdateSchema,
  type UpdateSpeciesSchema,
  type CreateSpeciesSchema,
} from '@shared/schemas/finishing-admin';
import type { z } from 'zod';
import { HttpProblem, problems } from '../http/problem';
import { FinishingSystem, Material, MaterialPack, Species } from '../models';
import { audit } from './audit';

function systemDto(s: FinishingSystem): FinishingSystemDto {
  return { id: s.id, key: s.key, name: s.name, description: s.description, stages: s.stages, preset: s.preset, archived: s.archived, updatedAt: s.updatedAt.toISOString() };
}

export async function listSystems(archived: 'active' | 'archived' | 'all'): Promise<FinishingSystemDto[]> {
  const where = archived === 'all' ? {} : { archived: archived === 'archived' };
  return (await FinishingSystem.findAll({ where, order: [['name', 'ASC'], ['id', 'ASC']] })).map(systemDto);
}

export async function getSystem(id: number): Promise<FinishingSystemDto> {
  const s = await FinishingSystem.findByPk(id);
  if (!s) throw problems.notFound('Finishing system');
  return systemDto(s);
}

async function freeKey<M extends typeof FinishingSystem | typeof Species>(model: M, base: string, transaction: Transaction): Promise<string> {
  const rows = (await (model as typeof FinishingSystem).findAll({ attributes: ['key'], where: { key: { [Op.like]: `${base}%` } }, transaction })) as { key: string }[];
  const taken = new Set(rows.map((r) => r.key));
  let key = base;
  for (let n = 2; taken.has(key); n++) key = `${base.slice(0, 60)}-${n}`;
  return key;
}

/** Every material a stage names must be an active material with an active pack. */
async function checkStageMaterials(stages: z.output<typeof SystemUpdateSchema>['stages'], transaction: Transaction): Promise<void> {
  const keys = [...new Set(stages.flatMap((s) => s.materials.map((m) => m.material)))];
  const materials = keys.length ? await Material.findAll({ where: { key: { [Op.in]: keys }, archived: false }, transaction }) : [];
  const withPacks = new Set<string>();
  for (const m of materials) if ((await MaterialPack.count({ where: { materialId: m.id, archived: false }, transaction })) > 0) withPacks.add(m.key);
  const errors: { field: string; message: string }[] = [];
  stages.forEach((stage, si) =>
    stage.materials.forEach((use, mi) => {
      if (!withPacks.has(use.material)) errors.push({ field: `stages.${si}.materials.${mi}.material`, message: `is not a material in the price list: "${use.material}"` });
    }),
  );
  if (errors.length > 0) {
    throw new HttpProblem(400, 'validation_failed', 'Invalid input', validationSentence(errors[0]!.field.split('.'), errors[0]!.message), { field: errors[0]!.field, errors });
  }
}

export async function updateSystem(sequelize: Sequelize, actorId: number, id: number, input: z.output<typeof SystemUpdateSchema>): Promise<FinishingSystemDto> {
  return sequelize.transaction(async (transaction) => {
    const system = await FinishingSystem.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!system) throw problems.notFound('Finishing system');
    await checkStageMaterials(input.stages, transaction);
    const before = { name: system.name, description: system.description, stages: system.stages };
    system.set({ name: input.name, description: input.description, stages: input.stages });
    system.changed('stages', true);
    await system.save({ transaction });
    await audit({ userId: actorId, action: 'finishing-system.update', entityType: 'finishing-system', entityId: id, before, after: { name: input.name, description: input.description, stages: input.stages } }, transaction);
    return systemDto(system);
  });
}

export async function copySystem(sequelize: Sequelize, actorId: number, input: CopySystemInput): Promise<FinishingSystemDto> {
  return sequelize.transaction(async (transaction) => {
    const from = await FinishingSystem.findByPk(input.fromId, { transaction });
    if (!from) throw problems.badRequest('no_such_system', 'is not a finishing system', 'fromId');
    const key = await freeKey(FinishingSystem, keyFromName(input.name), transaction);
    const copy = await FinishingSystem.create(
      { key, name: input.name, description: from.description, stages: structuredClone(from.stages), preset: false, archived: false },
      { transaction },
    );
    await audit({ userId: actorId, action: 'finishing-system.create', entityType: 'finishing-system', entityId: copy.id, after: { key, name: input.name, copiedFrom: from.name, stages: copy.stages.length } }, transaction);
    return systemDto(copy);
  });
}

export async function archiveSystem(sequelize: Sequelize, actorId: number, id: number, archived: boolean): Promise<FinishingSystemDto> {
  return sequelize.transaction(async (transaction) => {
    const system = await FinishingSystem.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!system) throw problems.notFound('Finishing system');
    if (system.archived === archived) return systemDto(system);
    if (archived && (await FinishingSystem.count({ where: { archived: false, id: { [Op.ne]: id } }, transaction })) === 0) {
      throw problems.conflict('last_system', 'The estimator needs at least one finishing system: add or restore another first.');
    }
    system.archived = archived;
    await system.save({ transaction });
    await audit({ userId: actorId, action: archived ? 'finishing-system.archive' : 'finishing-system.restore', entityType: 'finishing-system', entityId: id, before: { name: system.name, archived: !archived }, after: { name: system.name, archived } }, transaction);
    return systemDto(system);
  });
}

/* Species ---------------------------------------------------------------------------------------------------- */

function speciesDto(s: Species): SpeciesDto {
  return { id: s.id, key: s.key, name: s.name, pores: s.pores, needsGrainFill: s.needsGrainFill, absorbency: Number(s.absorbency), archived: s.archived, updatedAt: s.updatedAt.toISOString() };
}

export async function listSpecies(query: SpeciesListQuery): Promise<Page<SpeciesDto>> {
  const where: WhereOptions<Species> = {};
  if (query.archived !== 'all') Object.assign(where, { archived: query.archived === 'archived' });
  if (query.q) Object.assign(where, { name: { [Op.iLike]: `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } });
  const { rows, count } = await Species.findAndCountAll({
    where,
    order: [[query.sort, query.dir.toUpperCase()], ['id', 'ASC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { rows: rows.map(speciesDto), total: count, page: query.page, pageSize: query.pageSize };
}

export async function createSpecies(sequelize: Sequelize, actorId: number, input: z.output<typeof CreateSpeciesSchema>): Promise<SpeciesDto> {
  return sequelize.transaction(async (transaction) => {
    if (await Species.findOne({ where: { name: { [Op.iLike]: input.name } }, transaction })) {
      throw problems.badRequest('species_exists', `"${input.name}" is already in the list`, 'name');
    }
    if (input.key && (await Species.findOne({ where: { key: input.key }, transaction }))) throw problems.badRequest('key_taken', `key "${input.key}" is taken`, 'key');
    const key = input.key ?? (await freeKey(Species, keyFromName(input.name), transaction));
    const s = await Species.create({ key, name: input.name, pores: input.pores, needsGrainFill: input.needsGrainFill, absorbency: input.absorbency }, { transaction });
    await audit({ userId: actorId, action: 'species.create', entityType: 'species', entityId: s.id, after: { key, name: s.name, pores: s.pores, needsGrainFill: s.needsGrainFill, absorbency: input.absorbency } }, transaction);
    return speciesDto(s);
  });
}

export async function updateSpecies(sequelize: Sequelize, actorId: number, id: number, input: z.output<typeof UpdateSpeciesSchema>): Promise<SpeciesDto> {
  return sequelize.transaction(async (transaction) => {
    const s = await Species.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!s) throw problems.notFound('Species');
    if (input.name !== undefined && (await Species.findOne({ where: { name: { [Op.iLike]: input.name }, id: { [Op.ne]: id } }, transaction }))) {
      throw problems.badRequest('species_exists', `"${input.name}" is already in the list`, 'name');
    }
    if (input.archived === true && !s.archived && (await Species.count({ where: { archived: false, id: { [Op.ne]: id } }, transaction })) === 0) {
      throw problems.conflict('last_species', 'The estimator needs at least one wood species.');
    }
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const field of ['name', 'pores', 'needsGrainFill', 'absorbency', 'archived'] as const) {
      const value = input[field];
      const current = field === 'absorbency' ? Number(s.absorbency) : s[field];
      if (value === undefined || value === current) continue;
      before[field] = current;
      after[field] = value;
    }
    if (Object.keys(after).length === 0) return speciesDto(s);
    const nameBefore = s.name;
    s.set(after);
    await s.save({ transaction });
    const action = 'archived' in after ? (input.archived ? 'species.archive' : 'species.restore') : 'species.update';
    await audit({ userId: actorId, action, entityType: 'species', entityId: id, before: { name: nameBefore, ...before }, after: { name: s.name, ...after } }, transaction);
    await s.reload({ transaction });
    return speciesDto(s);
  });
}
