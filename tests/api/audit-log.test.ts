import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry, User } from '../../server/models';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
let ownerId: number;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
  ownerId = (await User.findOne({ where: { email: 'owner@example.com' } }))!.id;
  // A few known entries on known days.
  await AuditEntry.bulkCreate([
    { userId: ownerId, action: 'pack-price.create', entityType: 'pack-price', entityId: '1', before: { price: '1.00' }, after: { price: '1.10' }, at: new Date('2026-06-10T09:00:00Z') },
    { userId: ownerId, action: 'pack-price.create', entityType: 'pack-price', entityId: '1', before: { price: '1.10' }, after: { price: '1.20' }, at: new Date('2026-06-11T23:30:00Z') },
    { userId: null, action: 'species.create', entityType: 'species', entityId: '2', before: null, after: { name: 'Teak' }, at: new Date('2026-06-11T10:00:00Z') },
  ]);
});

describe('audit log', () => {
  it('filters by entity type, user and date range, newest first, paged on the server', async () => {
    const res = await owner.agent.get('/api/audit?entityType=pack-price&from=2026-06-10&to=2026-06-11').expect(200);
    expect(res.body.total).toBe(2);
    expect(res.body.rows.map((r: { after: { price: string } }) => r.after.price)).toEqual(['1.20', '1.10']);
    expect(res.body.rows[0]).toMatchObject({ userName: 'Ottilie Marchbank', entityType: 'pack-price', before: { price: '1.10' } });
    const oneDay = await owner.agent.get('/api/audit?from=2026-06-11&to=2026-06-11').expect(200);
    expect(oneDay.body.total).toBe(2);
    const byUser = await owner.agent.get(`/api/audit?userId=${ownerId}&from=2026-06-01&to=2026-06-30`).expect(200);
    expect(byUser.body.total).toBe(2);
    const paged = await owner.agent.get('/api/audit?from=2026-06-01&to=2026-06-30&pageSize=1&page=2&dir=asc').expect(200);
    expect(paged.body).toMatchObject({ total: 3, page: 2, pageSize: 1 });
    expect(paged.body.rows[0].after).toEqual({ name: 'Teak' });
    const beyond = await owner.agent.get('/api/audit?from=2026-06-01&to=2026-06-30&pageSize=10&page=5').expect(200);
    expect(beyond.body).toMatchObject({ total: 3, rows: [] });
  });

  it('lists its filters and names a bad one', async () => {
    const filters = await owner.agent.get('/api/audit/filters').expect(200);
    expect(filters.body.entityTypes).toEqual(expect.arrayContaining(['pack-price', 'species']));
    expect(filters.body.users).toEqual(expect.arrayContaining([{ id: ownerId, name: 'Ottilie Marchbank' }]));
    const bad = await owner.agent.get('/api/audit?from=2026-06-30&to=2026-06-01');
    expect(JSON.parse(bad.text)).toMatchObject({ status: 400, field: 'to' });
    const date = await owner.agent.get('/api/audit?from=yesterday');
    expect(JSON.parse(date.text)).toMatchObject({ status: 400, field: 'from' });
  });
});
