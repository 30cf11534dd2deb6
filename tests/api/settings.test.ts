import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Workshop } from '../../shared/schemas/workshop';
import { AuditEntry, LabourRate } from '../../server/models';
import { loadCatalog } from '../../server/services/catalog';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app, sequelize } = getTestApp();
afterAll(closeTestApp);

let owner: Session;
let estimator: Session;
let original: Workshop;
beforeAll(async () => {
  owner = await signInAs(app, 'owner');
  estimator = await signInAs(app, 'estimator');
  original = (await owner.agent.get('/api/settings').expect(200)).body as Workshop;
});
afterAll(async () => {
  // Leave the demo workshop as it was for the other test files.
  const { id: _id, ...body } = original;
  await owner.agent.put('/api/settings').set('x-csrf-token', owner.csrf).send(body).expect(200);
});

const put = (s: Session, body: object) => s.agent.put('/api/settings').set('x-csrf-token', s.csrf).send(body);
const bodyOf = (w: Workshop) => ({ name: w.name, email: w.email, phone: w.phone, address: w.address, settings: structuredClone(w.settings) });

describe('workshop settings', () => {
  it('saves every section, audits only what changed, and the estimator reads the new figures', async () => {
    const body = bodyOf(original);
    body.settings.pricing.markupPct = 30;
    body.settings.pricing.maxDiscountPct = 12.5;
    body.settings.safety.room.airChangesPerHour = 6;
    body.settings.calendar.closedDates = [...body.settings.calendar.closedDates, '2027-08-30'];
    body.phone = '01632 960 999';
    const res = await put(owner, body).expect(200);
    expect(res.body.settings.pricing.markupPct).toBe(30);
    expect(res.body.phone).toBe('01632 960 999');
    const entry = await AuditEntry.findOne({ where: { action: 'workshop.update' }, order: [['id', 'DESC']] });
    expect(entry?.before).toMatchObject({ 'settings.pricing.markupPct': original.settings.pricing.markupPct, phone: original.phone });
    expect(entry?.after).toMatchObject({ 'settings.pricing.markupPct': 30, 'settings.pricing.maxDiscountPct': 12.5, 'settings.safety.room.airChangesPerHour': 6, phone: '01632 960 999' });
    expect(Object.keys(entry!.after as object)).not.toContain('settings.pricing.taxPct');
    const { catalog } = await loadCatalog(sequelize);
    expect(catalog.pricing.markupPct).toBe(30);
    // Everyone signed in reads the workshop; only the owner reads the settings route.
    const read = await estimator.agent.get('/api/workshop').expect(200);
    expect(read.body.settings.pricing.maxDiscountPct).toBe(12.5);
  });

  it('names the field that is wrong, including the ones only the database can check', async () => {
    const body = bodyOf(original);
    body.settings.pricing.markupPct = 140;
    let res = await put(owner, body);
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text).field).toBe('settings.pricing.markupPct');

    const spirit = bodyOf(original);
    spirit.settings.safety.spirit = { ethanol: 0.9, methanol: 0.2, isopropanol: 0 };
    res = await put(owner, spirit);
    expect(JSON.parse(res.text).field).toBe('settings.safety.spirit');

    const hours = bodyOf(original);
    hours.settings.calendar.workingWeek[0] = { day: 'mon', open: '17:00', close: '08:00' };
    res = await put(owner, hours);
    expect(JSON.parse(res.text).field).toBe('settings.calendar.workingWeek.0.close');

    const twice = bodyOf(original);
    twice.settings.calendar.workingWeek.push({ day: 'mon', open: '09:00', close: '12:00' });
    res = await put(owner, twice);
    expect(JSON.parse(res.text)).toMatchObject({ status: 400, field: 'settings.calendar.workingWeek.5.day' });

    const rate = bodyOf(original);
    rate.settings.pricing.polisherRate = 'journeyman';
    res = await put(owner, rate);
    expect(JSON.parse(res.text)).toMatchObject({ status: 400, field: 'settings.pricing.polisherRate' });

    const flakes = bodyOf(original);
    flakes.settings.shellac.flakesMaterial = 'no-such-flakes';
    res = await put(owner, flakes);
    expect(JSON.parse(res.text).field).toBe('settings.shellac.flakesMaterial');

    const email = { ...bodyOf(original), email: 'not an address' };
    res = await put(owner, email);
    expect(JSON.parse(res.text).field).toBe('email');

    const unknown = { ...bodyOf(original), colour: 'amber' };
    expect((await put(owner, unknown)).status).toBe(400);
    await put(estimator, bodyOf(original)).expect(403);
  });
});

describe('labour rates', () => {
  it('the owner changes a rate; it is audited and priced; others may not', async () => {
    const list = await estimator.agent.get('/api/labour-rates').expect(200);
    const apprentice = list.body.find((r: { key: string }) => r.key === 'apprentice');
    expect(apprentice.perHour).toMatch(/^\d+\.\d{2}$/);
    const res = await owner.agent.patch(`/api/labour-rates/${apprentice.id}`).set('x-csrf-token', owner.csrf).send({ perHour: '26,50' }).expect(200);
    expect(res.body.perHour).toBe('26.50');
    const entry = await AuditEntry.findOne({ where: { action: 'labour-rate.update', entityId: String(apprentice.id) }, order: [['id', 'DESC']] });
    expect(entry?.before).toMatchObject({ perHour: apprentice.perHour });
    expect(entry?.after).toMatchObject({ perHour: '26.50' });
    const { catalog } = await loadCatalog(sequelize);
    expect(catalog.labourRates.find((r) => r.key === 'apprentice')!.perHour).toBe('26.50');
    const bad = await owner.agent.patch(`/api/labour-rates/${apprentice.id}`).set('x-csrf-token', owner.csrf).send({ perHour: '-4' });
    expect(JSON.parse(bad.text)).toMatchObject({ status: 400, field: 'perHour' });
    await estimator.agent.patch(`/api/labour-rates/${apprentice.id}`).set('x-csrf-token', estimator.csrf).send({ perHour: '99' }).expect(403);
    expect(String((await LabourRate.findByPk(apprentice.id))!.perHour)).toBe('26.50');
    await owner.agent.patch(`/api/labour-rates/${apprentice.id}`).set('x-csrf-token', owner.csrf).send({ perHour: apprentice.perHour }).expect(200);
  });
});
