/**
 * Two workshops on one service, in a real browser: each owner signs up and confirms from the e-mailed link, invites
 * an estimator who accepts from theirs, and the estimator adds a customer. Then neither workshop sees anything of the
 * other: not in the customers list, not by searching for the other's customer, not by opening its page by id, and
 * not among its users.
 */
import { randomBytes } from 'node:crypto';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getTestApp } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';

const suite = browserSuite({ services: true });
const tag = randomBytes(3).toString('hex');

interface Team {
  name: string;
  ownerEmail: string;
  estimatorEmail: string;
  customer: string;
  country: string;
  taxPct: string;
  customerPath?: string;
  contexts: BrowserContext[];
  owner?: Page;
  estimator?: Page;
  errors: string[][];
}

const team = (name: string, domain: string, country: string, taxPct: string): Team => ({
  country,
  taxPct,
  name: `${name} ${tag}`,
  ownerEmail: `owner-${tag}@${domain}`,
  estimatorEmail: `estimator-${tag}@${domain}`,
  customer: `${name.split(' ')[0]} Customer ${tag}`,
  contexts: [],
  errors: [],
});

const A = team('Hollowmere Polishing', 'hollowmere.example', 'GB', '20');
const B = team('Ravensgill Pianos', 'ravensgill.example', 'US', '0');
const PASSWORD = 'a long password for the journey';

async function clearSignupLimits(): Promise<void> {
  await getTestApp().sequelize.query(`DELETE FROM login_attempts WHERE key LIKE 'signup:%'`);
}
beforeAll(clearSignupLimits);
afterAll(async () => {
  for (const t of [A, B]) for (const c of t.contexts) await c.close();
  await clearSignupLimits();
});

/** The first link of `pattern` in the newest message to `to` (quoted-printable soft breaks undone). */
async function linkFor(to: string, pattern: RegExp): Promise<string> {
  const mail = () => suite.server.services!.mail!.messages.filter((m) => m.to.includes(to));
  await expect.poll(() => mail().length).toBeGreaterThan(0);
  const raw = mail().at(-1)!.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
  return pattern.exec(raw)![0];
}

async function newPage(browser: Browser, t: Team, allowed: RegExp[] = []): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  t.contexts.push(context);
  const page = await context.newPage();
  t.errors.push(watchConsole(page, allowed));
  return page;
}

async function signIn(page: Page, email: string): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('two workshops signed up through the browser', () => {
  for (const t of [A, B]) {
    it(`${t.name.split(' ')[0]}: the owner signs up, confirms and signs in`, async () => {
      const page = await newPage(suite.browser, t);
      await page.goto(`${suite.server.baseUrl}/signup`);
      await page.getByLabel('Workshop name').fill(t.name);
      await page.getByLabel('Country').selectOption(t.country);
      await page.getByLabel('Tax rate (%)').fill(t.taxPct);
      await page.getByLabel('Your name').fill(`Owner of ${t.name}`);
      await page.getByLabel('E-mail').fill(t.ownerEmail);
      await page.getByLabel('Password', { exact: true }).fill(PASSWORD);
      await page.getByLabel('The same password again').fill(PASSWORD);
      await page.getByRole('button', { name: 'Sign up the workshop' }).click();
      await page.getByText('Confirmation link sent').waitFor();

      await page.goto(`${suite.server.baseUrl}${await linkFor(t.ownerEmail, /\/confirm\/[A-Za-z0-9_-]+/)}`);
      await page.getByRole('button', { name: 'Confirm my address' }).click();
      await page.getByRole('heading', { level: 1, name: 'Address confirmed' }).waitFor();
      await signIn(page, t.ownerEmail);
      await page.getByTestId('first-run-checklist').waitFor();
      t.owner = page;
    });

    it(`${t.name.split(' ')[0]}: the owner invites an estimator, who accepts and adds a customer`, async () => {
      const op = t.owner!;
      await op.getByRole('link', { name: 'Users' }).click();
      const form = op.getByRole('form', { name: 'Invite someone' });
      await form.getByLabel('E-mail').fill(t.estimatorEmail);
      await form.getByLabel('Role').selectOption('estimator');
      await form.getByRole('button', { name: 'Send invitation' }).click();
      await expect.poll(() => form.getByText(`${t.estimatorEmail} has a link to join`).count()).toBe(1);

      const page = await newPage(suite.browser, t);
      await page.goto(`${suite.server.baseUrl}${await linkFor(t.estimatorEmail, /\/invite\/[A-Za-z0-9_-]+/)}`);
      await page.getByRole('heading', { level: 1, name: new RegExp(`^Join ${t.name}`) }).waitFor();
      await page.getByLabel('Your name').fill(`Estimator of ${t.name}`);
      await page.getByLabel('Choose a password').fill(PASSWORD);
      await page.getByLabel('The same password again').fill(PASSWORD);
      await page.getByRole('button', { name: 'Accept and sign in' }).click();
      await page.getByTestId('current-role').waitFor();

      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Customers' }).click();
      await page.getByRole('heading', { level: 1, name: 'Customers' }).waitFor();
      await page.getByRole('button', { name: 'Add customer' }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Name').fill(t.customer);
      await dialog.getByRole('button', { name: 'Add customer' }).click();
      await page.getByRole('heading', { level: 1, name: t.customer }).waitFor();
      t.customerPath = new URL(page.url()).pathname;
      t.estimator = page;
    });
  }

  for (const [mine, theirs] of [
    [A, B],
    [B, A],
  ] as const) {
    it(`${mine.name.split(' ')[0]} sees none of ${theirs.name.split(' ')[0]}: customers, search, by id, users`, async () => {
      const page = mine.estimator!;
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Customers' }).click();
      await page.getByRole('heading', { level: 1, name: 'Customers' }).waitFor();
      await expect.poll(() => page.getByRole('row').filter({ hasText: mine.customer }).count()).toBe(1);
      expect(await page.getByText(theirs.customer).count()).toBe(0);
      const search = page.getByRole('searchbox', { name: /Search customers/ });
      await search.fill(theirs.customer);
      await search.press('Enter');
      await expect.poll(() => page.getByText('No customer matches that search.').count()).toBe(1);
      expect(await page.getByText(theirs.customer).count()).toBe(0);
      await screenshot(page, `two-workshops-${mine === A ? 'a' : 'b'}-search`);

      // The other's customer by its id: the API answers 404, the page says it could not be loaded.
      const byId = await newPage(suite.browser, mine, [/status of 404/]);
      await signIn(byId, mine.estimatorEmail);
      await byId.goto(`${suite.server.baseUrl}${theirs.customerPath!}`);
      await byId.getByText('The customer could not be loaded').waitFor();
      expect(await byId.getByText(theirs.customer).count()).toBe(0);
      await screenshot(byId, `two-workshops-${mine === A ? 'a' : 'b'}-other-customer`);

      // The owner's users page lists their own two people and none of the other's.
      const op = mine.owner!;
      await op.getByRole('link', { name: 'Users' }).click();
      await expect.poll(() => op.getByText(mine.estimatorEmail).count()).toBeGreaterThan(0);
      expect(await op.getByText(mine.ownerEmail).count()).toBeGreaterThan(0);
      expect(await op.getByText(theirs.ownerEmail).count()).toBe(0);
      expect(await op.getByText(theirs.estimatorEmail).count()).toBe(0);
      expect(await op.getByText(theirs.name).count()).toBe(0);
      for (const errors of mine.errors) expect(errors).toEqual([]);
    });
  }
});
