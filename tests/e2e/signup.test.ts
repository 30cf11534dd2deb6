/**
 * A new workshop's owner signs up in a real browser, is refused sign-in until the address is confirmed, opens the
 * link from the local mail catcher, confirms, signs in and finds the setting-up checklist on the overview.
 */
import { randomBytes } from 'node:crypto';
import { createRequire } from 'node:module';
import { afterAll, describe, expect, it } from 'vitest';
import { getTestApp } from '../helpers/app';
import { browserSuite, screenshot, settle, watchConsole } from '../helpers/browser';

const suite = browserSuite({ services: true });
const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js');

afterAll(async () => {
  await getTestApp().sequelize.query(`DELETE FROM login_attempts WHERE key LIKE 'signup:%'`);
});

describe('signing up a workshop, in a real browser', () => {
  it('signs up, confirms from the e-mailed link, signs in and sees the checklist', async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    // Signing in before confirming is refused on purpose (403).
    const errors = watchConsole(page, [/status of 403/]);
    const email = `fenwick-${randomBytes(4).toString('hex')}@bramblecote.example`;
    const password = 'a long new-owner password';

    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByRole('link', { name: 'Sign up your workshop' }).click();
    await page.getByRole('heading', { level: 1, name: 'Sign up your workshop' }).waitFor();

    // Sent empty, the form names what is missing.
    await page.getByRole('button', { name: 'Sign up the workshop' }).click();
    await expect.poll(() => page.getByText(/things to put right/).count()).toBe(1);

    await page.getByLabel('Workshop name').fill('Bramblecote Finishing');
    await page.getByLabel('Country').selectOption('IE');
    expect(await page.getByLabel('Currency').inputValue()).toBe('EUR');
    await page.getByLabel('Tax rate (%)').fill('23');
    await page.getByLabel('Your name').fill('Fenwick Haldane');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password', { exact: true }).fill(password);
    await page.getByLabel('The same password again').fill(password);
    await screenshot(page, 'signup-form');
    const before = suite.server.services!.mail!.messages.length;
    await page.getByRole('button', { name: 'Sign up the workshop' }).click();
    await page.getByText('Confirmation link sent').waitFor();
    await screenshot(page, 'signup-sent');

    // Not confirmed yet: sign-in says so and offers a new link.
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('button', { name: 'Send the link again' }).waitFor();
    expect(await page.getByRole('status').textContent()).toMatch(/Confirm your e-mail address first/);
    await screenshot(page, 'signup-unconfirmed-sign-in');

    await expect.poll(() => suite.server.services!.mail!.messages.slice(before).some((m) => m.to.includes(email))).toBe(true);
    const raw = suite.server.services!.mail!.messages.slice(before).find((m) => m.to.includes(email))!.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
    const path = /\/confirm\/[A-Za-z0-9_-]+/.exec(raw)![0];
    await page.goto(`${suite.server.baseUrl}${path}`);
    await page.getByRole('button', { name: 'Confirm my address' }).click();
    await page.getByRole('heading', { level: 1, name: 'Address confirmed' }).waitFor();
    await screenshot(page, 'signup-confirmed');
    await page.getByRole('link', { name: 'Sign in' }).click();

    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    const checklist = page.getByTestId('first-run-checklist');
    await checklist.waitFor();
    expect(await checklist.getByRole('link').allTextContents()).toEqual(['Enter what you pay for materials', 'Set your labour rates', 'Check the drying room', 'Add the polishers']);
    await settle(page);
    await screenshot(page, 'signup-checklist');

    // Put away, it stays away on the next visit and can be brought back.
    await page.getByRole('button', { name: 'Put the checklist away' }).click();
    await expect.poll(() => checklist.count()).toBe(0);
    await page.reload();
    await page.getByRole('button', { name: 'Setting up the workshop' }).waitFor();
    expect(await checklist.count()).toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});

describe('the sign-up pages on a phone', () => {
  for (const path of ['/signup', `/confirm/${'x'.repeat(43)}`]) {
    it(`${path.slice(0, 9)} fits 390 px and has no serious accessibility problem`, async () => {
      // axe is injected as a script: the page's content security policy would refuse it, so this context bypasses it.
      const context = await suite.browser.newContext({ viewport: { width: 390, height: 844 }, bypassCSP: true });
      const page = await context.newPage();
      const errors = watchConsole(page);
      await page.goto(`${suite.server.baseUrl}${path}`);
      await page.getByRole('heading', { level: 1 }).waitFor();
      await settle(page);
      expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
      await screenshot(page, `signup-phone-${path.split('/')[1]}`);
      await page.addScriptTag({ path: axePath });
      const violations = await page.evaluate(async () => {
        const w = window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string; impact: string | null }[] }> } };
        const result = await w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
        return result.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id);
      });
      expect(violations).toEqual([]);
      expect(errors).toEqual([]);
      await context.close();
    });
  }
});
