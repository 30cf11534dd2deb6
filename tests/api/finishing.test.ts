import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FinishingSystemDto } from '../../shared/schemas/finishing-admin';
import { AuditEntry } from '../../server/models';
import { loadCatalog } from '../../server/services/catalog';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
let estimator: Session;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
  estimator = await signInAs(app, 'estimator');
});

const send = (s: Session, method: 'post' | 'put' | 'patch', path: string, body: object) => s.agent[method](path).set('x-csrf-token', s.csrf).send(body);

describe('finishing systems', () => {
  it('copies a system, reorders, disables and edits stages, and the estimator reads the result', async () => {
    const list = await estimator.agent.get('/api/finishing-systems').expect(200);
    const full = (list.body as FinishingSystemDto[]).find((s) => s.key === 'full-repolish')!;
    const copied = await send(owner, 'post', '/api/finishing-systems', { fromId: full.id, name: 'Full repolish, test bench' }).expect(201);
    const copy = copied.body as FinishingSystemDto;
    expect(copy).toMatchObject({ key: 'full-repolish-test-bench', preset: false, archived: false });
    expect(copy.stages).toEqual(full.stages);

    const stages = structuredClone(copy.stages);
    const [first, second] = stages;
    stages[0] = second!;
    stages[1] = first!;
    stages[2]!.enabled = !stages[2]!.enabled;
    const body = stages.find((s) => s.kind === 'body')!;
    body.sessions = 7;
    body.restHours = 36;
    const saved = await send(owner, 'put', `/api/finishing-systems/${copy.id}`, { name: copy.name, description: 'Bench test', stages }).expect(200);
    expect(saved.body.stages.map((s: { key: string }) => s.key)).toEqual(stages.map((s) => s.key));
    const { catalog } = await loadCatalog(sequelize);
    const inCatalog = catalog.systems.find((s) => s.key === copy.key)!;
    expect(inCatalog.stages.find((s) => s.kind === 'body')).toMatchObject({ sessions: 7, restHours: 36 });
    const entry = await AuditEntry.findOne({ where: { action: 'finishing-system.update', entityId: String(copy.id) } });
    expect((entry?.before as { stages: unknown[] }).stages).toHaveLength(copy.stages.length);
  });

  it('names the stage field that is wrong, and unknown materials', async () => {
    const list = await owner.agent.get('/api/finishing-systems').expect(200);
    const system = (list.body as FinishingSystemDto[])[0]!;
    const stages = structuredClone(system.stages);
    stages[1]!.cutLb = 9;
    let res = await send(owner, 'put', `/api/finishing-systems/${system.id}`, { name: system.name, stages });
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).field).toBe('stages.1.cutLb');
    const withMaterial = structuredClone(system.stages);
    const idx = withMaterial.findIndex((s) => s.materials.length > 0);
    withMaterial[idx]!.materials[0]!.material = 'unobtainium';
    res = await send(owner, 'put', `/api/finishing-systems/${system.id}`, { name: system.name, stages: withMaterial });
    expect(JSON.parse(res.text)).toMatchObject({ status: 400, field: `stages.${idx}.materials.0.material` });
    const dupKeys = structuredClone(system.stages);
    dupKeys[1]!.key = dupKeys[0]!.key;
    res = await send(owner, 'put', `/api/finishing-systems/${system.id}`, { name: system.name, stages: dupKeys });
    expect(JSON.parse(res.text).field).toBe('stages.1.key');
    res = await send(owner, 'put', `/api/finishing-systems/${system.id}`, { name: system.name, stages: [] });
    expect(JSON.parse(res.text).field).toBe('stages');
    await send(estimator, 'put', `/api/finishing-systems/${system.id}`, { name: system.name, stages: system.stages }).expect(403);
  });

  it('archives and restores a system', async () => {
    const list = await owner.agent.get('/api/finishing-systems').expect(200);
    const copy = (list.body as FinishingSystemDto[]).find((s) => s.key === 'full-repolish-test-bench')!;
    await send(owner, 'patch', `/api/finishing-systems/${copy.id}`, { archived: true }).expect(200);
    const active = await owner.agent.get('/api/finishing-systems').expect(200);
    expect(active.body.some((s: { id: number }) => s.id === copy.id)).toBe(false);
    const archived = await owner.agent.get('/api/finishing-systems?archived=archived').expect(200);
    expect(archived.body.some((s: { id: number }) => s.id === copy.id)).toBe(true);
    await send(owner, 'patch', `/api/finishing-systems/${copy.id}`, { archived: false }).expect(200);
  });
});

describe('wood species', () => {
  it('adds, edits and archives a species with audit entries', async () => {
    const created = await send(owner, 'post', '/api/species', { name: 'Padauk', pores: 'open', needsGrainFill: true, absorbency: 1.25 }).expect(201);
    expect(created.body).toMatchObject({ key: 'padauk', absorbency: 1.25 });
    const dup = await send(owner, 'post', '/api/species', { name: 'padauk', pores: 'open', needsGrainFill: true, absorbency: 1.2 });
    expect(JSON.parse(dup.text)).toMatchObject({ status: 400, field: 'name' });
    const bad = await send(owner, 'post', '/api/species', { name: 'Zebrano', pores: 'open', needsGrainFill: true, absorbency: 7 });
    expect(JSON.parse(bad.text)).toMatchObject({ status: 400, field: 'absorbency' });
    const edited = await send(owner, 'patch', `/api/species/${created.body.id}`, { absorbency: 1.35, needsGrainFill: false }).expect(200);
    expect(edited.body).toMatchObject({ absorbency: 1.35, needsGrainFill: false });
    const entry = await AuditEntry.findOne({ where: { action: 'species.update', entityId: String(created.body.id) } });
    expect(entry?.before).toMatchObject({ absorbency: 1.25, needsGrainFill: true });
    expect(entry?.after).toMatchObject({ absorbency: 1.35, needsGrainFill: false });
    await send(owner, 'patch', `/api/species/${created.body.id}`, { archived: true }).expect(200);
    const list = await estimator.agent.get('/api/species?q=pada').expect(200);
    expect(list.body.rows).toHaveLength(0);
    const sorted = await estimator.agent.get('/api/species?sort=absorbency&dir=desc&pageSize=3').expect(200);
    const values = sorted.body.rows.map((r: { absorbency: number }) => r.absorbency);
    expect([...values].sort((a, b) => b - a)).toEqual(values);
    expect(sorted.body.total).toBeGreaterThan(3);
  });
});
