import type { Page } from 'playwright-core';
import sharp from 'sharp';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/models';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { bookJob } from '../../server/services/planning';
import { localNow } from '../../server/services/planning-context';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';

let quoteNumber = '';

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const table = { piece: { template: 'cabinet', dimensions: { height: '95 cm', width: '105 cm', depth: '45 cm' }, species: 'mahogany', veneered: true }, system: 'full-repolish' };

/** A priced estimate quoted, sent and accepted by its customer through the signed link. */
async function acceptedQuote(name: string): Promise<{ id: number; number: string }> {
  const { app } = getTestApp();
  const [sales, estimator] = await Promise.all([signInAs(app, 'sales'), signInAs(app, 'estimator')]);
  const c = await post(sales, '/api/customers', { name, email: `${name.toLowerCase().replace(/\W+/g, '.')}@example.com` }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'furniture', description: 'Mahogany side cabinet' }).expect(201);
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input: table }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
  const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {}).expect(201);
  const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
  await request(app).post(`/api/public/quotes/${String(sent.body.link).split('/q/')[1]}/accept`).send({ name, acceptTerms: true }).expect(200);
  return { id: q.body.id as number, number: q.body.number as string };
}

const suite = browserSuite({ services: true });
beforeAll(async () => {
  quoteNumber = (await acceptedQuote('Lavinia Stourcombe')).number;
});

async function signIn(page: Page, role: 'workshop' | 'owner'): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('planning, in a real browser', () => {
  it('the planner sees the next eight weeks, books a newly accepted job at the earliest start and marks a session done', async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await signIn(page, 'workshop');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Planning' }).click();
    await page.getByRole('heading', { level: 1, name: 'Planning' }).waitFor();
    await page.getByRole('heading', { name: 'The next 8 weeks' }).waitFor();
    // Eight weeks of days, the room's four bays and the polishers (other test files may have changed the demo's jobs).
    expect(await page.getByTestId('room-load').locator('[title]').count()).toBe(56);
    expect(await page.locator('[data-testid^="bay-row-"]').count()).toBeGreaterThanOrEqual(4);
    expect(await page.locator('[data-testid^="polisher-row-"]').count()).toBeGreaterThanOrEqual(1);
    await screenshot(page, 'planning-board');

    // Another planner fills the whole room from next Monday meanwhile (booked on that date and confirmed, so
    // the room is full that day whatever other test files have booked before).
    const monday = await page.evaluate(() => {
      const d = new Date();
      d.setDate(d.getDate() + ((8 - d.getDay()) % 7 || 7));
      return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
    });
    const { app } = getTestApp();
    const owner = await signInAs(app, 'owner');
    const filler = await acceptedQuote('Octavia Pennefather');
    const job = await post(owner, '/api/jobs', { quoteId: filler.id, bays: 4 }).expect(201);
    await post(owner, `/api/jobs/${job.body.id}/booking`, { mode: 'date', start: monday, confirm: true }).expect(200);
    await page.reload();
    await page.getByRole('heading', { name: 'Book a job' }).waitFor();
    await page.getByTestId(`job-bar-${job.body.id}`).waitFor();

    // A chosen date first: the consequences are shown before anything is booked.
    const form = page.locator('form').filter({ has: page.getByLabel('Job to book') });
    const select = form.getByLabel('Job to book');
    const value = await select.locator('option', { hasText: `Quote ${quoteNumber} ` }).getAttribute('value');
    await select.selectOption(value!);
    await page.getByText('On a chosen date').click();
    await page.getByLabel('Chosen date', { exact: true }).fill(monday);
    await page.getByRole('button', { name: 'Show the consequences' }).click();
    const consequences = page.getByRole('region', { name: 'Consequences' });
    await consequences.waitFor();
    await consequences.getByRole('list', { name: 'Overbooked days' }).waitFor();
    expect(await consequences.getByRole('button', { name: 'Force the booking' }).count()).toBe(1);
    await consequences.scrollIntoViewIfNeeded();
    await screenshot(page, 'planning-forced-preview');

    // Then the earliest start, with why it could not start sooner.
    await page.getByText('Earliest start', { exact: true }).click();
    await page.getByRole('button', { name: 'Find the earliest start' }).click();
    await consequences.getByRole('heading', { name: 'Why it could not start sooner' }).waitFor();
    const reasons = consequences.getByRole('list', { name: 'Why it could not start sooner' }).getByRole('listitem');
    await expect.poll(() => reasons.count()).toBeGreaterThan(0);
    expect(await reasons.allTextContents()).toEqual(expect.arrayContaining([expect.stringMatching(/drying room full|polisher hours taken|not a working day|closed date|opening hours left/)]));
    const start = await page.getByTestId('preview-start').textContent();
    await screenshot(page, 'planning-earliest-preview');
    await consequences.getByRole('button', { name: /^Book from / }).click();
    const booked = page.getByRole('status').filter({ hasText: /JOB-\d{4}-\d{4} booked/ });
    await booked.waitFor();
    await booked.getByRole('link', { name: 'Open the job' }).click();
    await page.getByRole('heading', { level: 1, name: /^JOB-\d{4}-\d{4} · / }).waitFor();
    expect(await page.locator('[data-state="booked"]').first().textContent()).toBe('Booked');
    expect(await page.getByRole('list', { name: 'Why it could not start sooner' }).getByRole('listitem').count()).toBeGreaterThan(0);
    expect(await page.getByText(start ?? 'none').count()).toBeGreaterThan(0);
    await screenshot(page, 'planning-job-booked');

    // Its first session is marked done with the day's figures; notes are required.
    await page.getByRole('button', { name: 'Mark done' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Hands-on hours (h)').fill('3.5');
    await dialog.getByLabel('Temperature (°C)').fill('18.5');
    await dialog.getByLabel('Humidity (% RH)').fill('58');
    await dialog.getByRole('button', { name: 'Mark done' }).click();
    await dialog.getByText('is required: say how the session went').waitFor();
    await dialog.getByLabel('Notes').fill('Old polish came away cleanly; a little stubborn in the mouldings.');
    await dialog.getByRole('button', { name: 'Mark done' }).click();
    await dialog.getByText(/ is done$/).waitFor();
    await screenshot(page, 'planning-session-done-dialog');
    await dialog.getByRole('button', { name: 'OK', exact: true }).click();
    await expect.poll(() => page.getByRole('cell', { name: 'Done', exact: true }).count()).toBe(1);
    await page.getByText('Old polish came away cleanly; a little stubborn in the mouldings.').waitFor();
    expect(await page.locator('[data-state="in-progress"]').first().textContent()).toBe('In progress');
    expect(await page.getByRole('row').filter({ hasText: 'Strip the old finish' }).first().textContent()).toMatch(/1 of 1.*3\.5 h/);
    await screenshot(page, 'planning-job-progress');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('the owner reads actual hours against estimates and the material forecast', async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Actuals' }).click();
    await page.getByRole('heading', { level: 1, name: 'Actual hours against estimates' }).waitFor();
    await page.getByRole('figure', { name: /Chart of estimated against actual hours/ }).locator('.recharts-bar-rectangle').first().waitFor();
    await page.getByRole('heading', { name: 'Suggested corrections' }).waitFor();
    expect(await page.getByRole('row').filter({ hasText: 'Bodying' }).count()).toBeGreaterThan(0);
    await screenshot(page, 'planning-actuals');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Forecast' }).click();
    await page.getByRole('heading', { level: 1, name: 'Material forecast' }).waitFor();
    await page.getByLabel('Weeks ahead').selectOption('8');
    await expect.poll(() => page.getByRole('row').filter({ hasText: /flakes/i }).count()).toBeGreaterThan(0);
    expect(await page.getByTestId('forecast-total').textContent()).toMatch(/^£[\d,]+\.\d{2}$/);
    await screenshot(page, 'planning-forecast');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('the polisher, on a phone, marks today\u2019s session done with the materials used, a problem and a camera photo', async () => {
    // A job of this test's own with a session due today, whatever the hour: booked from midnight today (as the demo
    // data books its jobs in progress), so the day's first session is open on the board until it is marked done.
    const { app, sequelize } = getTestApp();
    const planner = await signInAs(app, 'workshop');
    const own = await acceptedQuote('Perpetua Wrenfield');
    const made = await post(planner, '/api/jobs', { quoteId: own.id }).expect(201);
    const plannerId = (await User.findOne({ where: { email: demoEmail('workshop') } }))!.id;
    const todayIso = localNow().slice(0, 10);
    await bookJob(sequelize, plannerId, made.body.id as number, { mode: 'date', start: todayIso, confirm: true }, { now: `${todayIso}T00:00`, allowPast: true });

    const context = await suite.browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill(demoEmail('workshop'));
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => !u.pathname.startsWith('/signin'));
    await page.getByRole('button', { name: 'Menu' }).click();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Planning' }).click();
    const today = page.getByRole('list', { name: 'Sessions due today' });
    await today.waitFor();
    const mark = today.getByRole('button', { name: new RegExp(`^Mark ${made.body.number as string} .* done$`) }).first();
    // Big enough for a thumb.
    const box = (await mark.boundingBox())!;
    expect(box.height).toBeGreaterThanOrEqual(44);
    const label = (await mark.getAttribute('aria-label'))!;
    const jobNumber = /^Mark (JOB-\S+)/.exec(label)![1]!;
    await mark.click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Notes').fill('Second bodying session on the lid; good build.');
    await dialog.getByLabel('Materials used (optional)').fill('300 mL of 1.5 lb cut, a little pumice');
    await dialog.getByLabel('Something went wrong').check();
    await dialog.getByLabel('What went wrong').fill('A ring of blush near the hinge after the damp morning.');
    const camera = dialog.getByLabel('Photo of the work (optional)');
    expect(await camera.getAttribute('capture')).toBe('environment');
    const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#5a3520' } }).png().toBuffer();
    await camera.setInputFiles({ name: 'lid.png', mimeType: 'image/png', buffer: png });
    // The dialog fits the phone: nothing sticks out sideways.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await screenshot(page, 'planning-phone-mark-done');
    await dialog.getByRole('button', { name: 'Mark done' }).click();
    await expect.poll(() => dialog.getByText('The photo is with the piece\u2019s photos.', { exact: false }).count()).toBe(1);
    await dialog.getByRole('button', { name: 'OK', exact: true }).click();

    await page.getByRole('link', { name: jobNumber }).first().click();
    await page.getByRole('heading', { level: 1 }).filter({ hasText: jobNumber }).waitFor();
    await expect.poll(() => page.getByText('Problem: A ring of blush near the hinge after the damp morning.').count()).toBe(1);
    expect(await page.getByText('Materials: 300 mL of 1.5 lb cut, a little pumice').count()).toBe(1);
    await screenshot(page, 'planning-phone-job-with-problem');
    expect(errors).toEqual([]);
    await context.close();
  });
});
