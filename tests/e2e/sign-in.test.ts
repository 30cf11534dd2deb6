import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLE_LABELS, ROLES } from '../../shared/schemas/auth';
import { navFor } from '../../src/config/nav';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { closeTestApp, demoEmail } from '../helpers/app';
import { launchBrowser, screenshot, startServer, watchConsole } from '../helpers/browser';

let browser: Browser;
let server: Awaited<ReturnType<typeof startServer>>;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
  await closeTestApp();
});

describe('signing in, in a real browser', () => {
  for (const role of ROLES) {
    it(`the demo ${role} signs in and sees the navigation of that role`, async () => {
      const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      const errors = watchConsole(page);
      await page.goto(`${server.baseUrl}/`);
      await page.waitForURL(/\/signin/);
      await page.getByLabel('E-mail').fill(demoEmail(role));
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await expect.poll(() => page.getByTestId('current-role').textContent()).toBe(ROLE_LABELS[role]);
      const links = await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents();
      expect(links.map((l) => l.trim())).toEqual(navFor(role).map((n) => n.label));
      await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toMatch(/Good to see you/);
      await screenshot(page, `sign-in-${role}`);
      if (role !== 'owner') {
        await page.goto(`${server.baseUrl}/users`);
        await expect.poll(() => page.getByText('Not available to your role').count()).toBe(1);
      }
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/signin/);
      expect(errors).toEqual([]);
      await context.close();
    });
  }

  it('a wrong password shows an error and stays on the sign-in page', async () => {
    const page = await browser.newPage();
    await page.goto(`${server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill('owner@example.com');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/do not match an active account/);
    expect(page.url()).toMatch(/\/signin$/);
    await screenshot(page, 'sign-in-wrong-password');
    await page.close();
  });

  it('the owner adds a user from the users page', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.goto(`${server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill('owner@example.com');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('link', { name: 'Users' }).click();
    await page.getByRole('button', { name: 'Add user' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('button', { name: 'Add user' }).click();
    await expect.poll(() => dialog.getByText('is required').count()).toBeGreaterThan(0);
    const email = `apprentice-${Date.now()}@example.com`;
    await dialog.getByLabel('Name').fill('Agatha Wrenfield');
    await dialog.getByLabel('E-mail').fill(email);
    await dialog.getByLabel('First password').fill('apprentice-pass-1');
    await dialog.getByRole('button', { name: 'Add user' }).click();
    await expect.poll(() => page.getByRole('cell', { name: email }).count()).toBe(1);
    await screenshot(page, 'users-added');
    await page.close();
  });
});
