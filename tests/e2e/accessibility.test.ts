/**
 * Every main page checked with axe-core in Debian's Chromium (no serious or critical violations), and output
 * escaping: data full of HTML and script never runs as code.
 */
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { browserSuite, screenshot } from '../helpers/browser';

const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js');


const suite = browserSuite({ services: true });

interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

async function axe(page: Page): Promise<Violation[]> {
  await page.addScriptTag({ path: axePath });
  const result = await page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: Violation[] }> } };
    return w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
  });
  return result.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

async function signIn(page: Page, email: string): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

async function api<T>(page: Page, method: 'GET' | 'POST', url: string, data?: object): Promise<T> {
  const csrf = ((await (await page.request.get(`${suite.server.baseUrl}/api/auth/csrf`)).json()) as { csrfToken: string }).csrfToken;
  const res = method === 'GET' ? await page.request.get(`${suite.server.baseUrl}${url}`) : await page.request.post(`${suite.server.baseUrl}${url}`, { data, headers: { 'x-csrf-token': csrf } });
  if (!res.ok()) throw new Error(`${method} ${url}: ${res.status()} ${await res.text()}`);
  return (await res.json()) as T;
}

async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.waitForTimeout(300);
}

describe('accessibility of the main pages', () => {
  it('the sign-in page', async () => {
    // axe is injected as a script: the page's content security policy would refuse it, so this context bypasses it.
    const page = await suite.browser.newPage({ bypassCSP: true });
    await page.goto(`${suite.server.baseUrl}/signin`);
    await settle(page);
    expect(await axe(page)).toEqual([]);
    await page.close();
  });

  it('every page in the owner\u2019s navigation, and the record pages', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1366, height: 900 }, bypassCSP: true });
    await signIn(page, 'owner@example.com');
    const estimates = await api<{ rows: { id: number; customer: { id: number }; piece: { id: number } }[] }>(page, 'GET', '/api/estimates?pageSize=5');
    const first = estimates.rows[0]!;
    const pages = [
      '/', '/estimates', `/estimates/${first.id}`, `/estimates/${first.id}/edit`, '/customers', `/customers/${first.customer.id}`,
      `/pieces/${first.piece.id}`, '/quotes', '/outbox', '/planning', '/forecast', '/actuals', '/price-list',
      '/price-list/upload', '/price-list/reprice', '/settings', '/finishing-systems', '/species', '/users', '/audit-log',
    ];
    const found: Record<string, Violation[]> = {};
    for (const path of pages) {
      await page.goto(`${suite.server.baseUrl}${path}`);
      await settle(page);
      const v = await axe(page);
      if (v.length) found[path] = v;
    }
    expect(
      Object.entries(found).map(([path, v]) => `${path}: ${v.map((x) => `${x.id} (${x.impact}) ${x.help} at ${x.nodes.slice(0, 2).map((n) => n.target.join(' ')).join(', ')}`).join('; ')}`),
    ).toEqual([]);
    await page.close();
  });

  it('the customer\u2019s quote page', async () => {
    const page = await suite.browser.newPage();
    await signIn(page, 'sales@example.com');
    const list = await api<{ rows: { id: number; state: string }[] }>(page, 'GET', '/api/estimates?state=priced&pageSize=5');
    const quote = await api<{ id: number }>(page, 'POST', `/api/estimates/${list.rows[0]!.id}/quotes`, { message: 'Thank you for your enquiry.' });
    const sent = await api<{ link: string }>(page, 'POST', `/api/quotes/${quote.id}/send`, {});
    const customer = await suite.browser.newPage({ bypassCSP: true });
    await customer.goto(sent.link.replace(/^http:\/\/[^/]+/, suite.server.baseUrl));
    await settle(customer);
    expect(await axe(customer)).toEqual([]);
    await screenshot(customer, 'a11y-public-quote');
    await customer.close();
    await page.close();
  });
});

describe('output escaping', () => {
  it('HTML and script in data show as text and never run', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1366, height: 900 } });
    const dialogs: string[] = [];
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    await signIn(page, 'estimator@example.com');
    const evil = '<img src=x onerror="window.__pwned=1"><script>window.__pwned=2</script>';
    const customer = await api<{ id: number }>(page, 'POST', '/api/customers', { name: `Evil ${evil}`, notes: evil, address: evil });
    const piece = await api<{ id: number }>(page, 'POST', '/api/pieces', { customerId: customer.id, kind: 'furniture', description: `Chest ${evil}`, conditionNotes: evil });
    for (const path of ['/customers', `/customers/${customer.id}`, `/pieces/${piece.id}`]) {
      await page.goto(`${suite.server.baseUrl}${path}`);
      await settle(page);
      expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
    }
    expect(await page.getByText('Evil <img src=x', { exact: false }).first().isVisible()).toBe(true);
    expect(dialogs).toEqual([]);
    await screenshot(page, 'escaping-piece');
    await page.close();
  });
});
