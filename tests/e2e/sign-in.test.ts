import { describe, expect, it } from 'vitest';
import { ROLE_LABELS, ROLES } from '../../shared/schemas/auth';
import { navFor } from '../../src/config/nav';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite({ services: true });

describe('signing in, in a real browser', () => {
  for (const role of ROLES) {
    it(`the demo ${role} signs in and sees the navigation of that role`, async () => {
      const context = await suite.browser.newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      const errors = watchConsole(page);
      await page.goto(`${suite.server.baseUrl}/`);
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
        await page.goto(`${suite.server.baseUrl}/users`);
        await expect.poll(() => page.getByText('Not available to your role').count()).toBe(1);
      }
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/signin/);
      expect(errors).toEqual([]);
      await context.close();
    });
  }

  it('a wrong password shows an error and stays on the sign-in page', async () => {
    const page = await suite.browser.newPage();
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill('owner@example.com');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/do not match an active account/);
    expect(page.url()).toMatch(/\/signin$/);
    await screenshot(page, 'sign-in-wrong-password');
    await page.close();
  });

  it('the owner adds a user from the users page', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.goto(`${suite.server.baseUrl}/signin`);
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

  it('a person who forgot the password asks for a link from the sign-in page and chooses a new one from the e-mail', async () => {
    // A person of their own, so the demo accounts the other tests use keep their password.
    const owner = await suite.browser.newContext();
    const op = await owner.newPage();
    await op.goto(`${suite.server.baseUrl}/signin`);
    await op.getByLabel('E-mail').fill(demoEmail('owner'));
    await op.getByLabel('Password').fill(DEMO_PASSWORD);
    await op.getByRole('button', { name: 'Sign in' }).click();
    await op.getByTestId('current-role').waitFor();
    const csrf = ((await (await op.request.get(`${suite.server.baseUrl}/api/auth/csrf`)).json()) as { csrfToken: string }).csrfToken;
    const email = `forgetful-${Date.now()}@example.com`;
    const made = await op.request.post(`${suite.server.baseUrl}/api/users`, { data: { email, name: 'Ivo Forgetful', role: 'sales', password: 'the first long password' }, headers: { 'x-csrf-token': csrf } });
    expect(made.status()).toBe(201);
    await owner.close();

    const context = await suite.browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByRole('heading', { level: 1, name: 'Set a new password' }).waitFor();
    const before = suite.server.services!.mail!.messages.length;
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'E-mail me a link' }).click();
    await expect.poll(() => page.getByText('a link to set a new password is on its way').count()).toBe(1);
    await screenshot(page, 'password-reset-asked');
    await expect.poll(() => suite.server.services!.mail!.messages.length).toBe(before + 1);
    const raw = suite.server.services!.mail!.messages.at(-1)!.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
    const path = /\/reset-password\/[A-Za-z0-9_-]+/.exec(raw)![0];

    await page.goto(`${suite.server.baseUrl}${path}`);
    await page.getByRole('heading', { level: 1, name: 'Choose a new password' }).waitFor();
    await page.getByLabel('New password', { exact: true }).fill('a second long password');
    await page.getByLabel('The same password again').fill('a second long password');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await expect.poll(() => page.getByText('Your new password is set').count()).toBe(1);
    await screenshot(page, 'password-reset-done');
    await page.getByRole('link', { name: 'Sign in with it now' }).click();
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('a second long password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    // The first visit shows where a seller starts.
    await page.getByTestId('where-to-start').waitFor();
    expect(await page.getByTestId('where-to-start').getByRole('link').allTextContents()).toEqual(['Estimates', 'Quotes', 'Outbox']);
    await screenshot(page, 'first-visit-where-to-start-phone');
    await page.getByRole('button', { name: 'Close: I know my way' }).click();
    await page.reload();
    await page.getByRole('heading', { level: 1 }).waitFor();
    expect(await page.getByTestId('where-to-start').count()).toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});
