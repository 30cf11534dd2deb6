/**
 * Every route of every role on a phone (390 × 844) and a tablet (768 × 1024), in Debian's Chromium: no page is wider
 * than the screen (nothing scrolls sideways), the main navigation folds into a menu on the phone, and the console
 * stays clean. A screenshot of each page at each size is kept in tests/artifacts/screenshots/responsive-*.png.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { Role } from '../../shared/schemas/auth';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { navFor } from '../../src/config/nav';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, settle, watchConsole } from '../helpers/browser';


const suite = browserSuite({ services: true });

const SIZES = [
  { name: 'phone', width: 390, height: 844 },
  { name: 'tablet', width: 768, height: 1024 },
] as const;

const ROLES: Role[] = ['owner', 'estimator', 'sales', 'workshop'];

async function getJson<T>(page: Page, url: string): Promise<T> {
  const res = await page.request.get(`${suite.server.baseUrl}${url}`);
  if (!res.ok()) throw new Error(`GET ${url}: ${res.status()} ${await res.text()}`);
  return (await res.json()) as T;
}

/** The record pages of the demo workshop this role can open, beside its navigation. */
async function routesFor(page: Page, role: Role): Promise<string[]> {
  const routes = navFor(role).map((n) => n.to);
  const estimates = await getJson<{ rows: { id: number; customer: { id: number }; piece: { id: number } }[] }>(page, '/api/estimates?pageSize=20');
  const first = estimates.rows[0]!;
  routes.push(`/estimates/${first.id}`, `/customers/${first.customer.id}`, `/pieces/${first.piece.id}`);
  for (const row of estimates.rows) {
    const detail = await getJson<{ revisions: { number: number }[] }>(page, `/api/estimates/${row.id}`);
    if (detail.revisions.length >= 2) {
      const [a, b] = detail.revisions.map((r) => r.number).sort((x, y) => x - y);
      routes.push(`/estimates/${row.id}/compare?a=${a}&b=${b}`);
      break;
    }
  }
  if (role === 'owner' || role === 'estimator') {
    const drafts = await getJson<{ rows: { id: number }[] }>(page, '/api/estimates?state=draft&pageSize=1');
    routes.push(`/estimates/new?pieceId=${first.piece.id}`, ...drafts.rows.map((d) => `/estimates/${d.id}/edit`));
  }
  const quotes = await getJson<{ rows: { id: number }[] }>(page, '/api/quotes?pageSize=1');
  if (quotes.rows[0]) routes.push(`/quotes/${quotes.rows[0].id}`);
  const jobs = await getJson<{ id: number }[] | { rows: { id: number }[] }>(page, '/api/jobs');
  const job = Array.isArray(jobs) ? jobs[0] : jobs.rows[0];
  if (job) routes.push(`/planning/jobs/${job.id}`);
  const materials = await getJson<{ rows: { id: number }[] }>(page, '/api/price-list/materials?pageSize=1');
  if (materials.rows[0]) routes.push(`/price-list/materials/${materials.rows[0].id}`);
  if (role === 'owner' || role === 'estimator') {
    const systems = await getJson<{ id: number }[] | { rows: { id: number }[] }>(page, '/api/finishing-systems');
    const system = Array.isArray(systems) ? systems[0] : systems.rows[0];
    if (system) routes.push(`/finishing-systems/${system.id}`);
  }
  if (role === 'owner') routes.push('/price-list/upload', '/price-list/reprice');
  if (role === 'owner' || role === 'sales') {
    // The first agreed quote whose account opens: other files plant quotes in a state by hand, for their reports.
    find: for (const state of ['deposit-paid', 'accepted']) {
      const agreed = await getJson<{ rows: { id: number }[] }>(page, `/api/quotes?state=${state}&pageSize=20`);
      for (const row of agreed.rows) {
        if ((await page.request.get(`${suite.server.baseUrl}/api/accounts/quotes/${row.id}`)).ok()) {
          routes.push(`/accounts/quotes/${row.id}`);
          break find;
        }
      }
    }
  }
  return routes;
}

/** How much wider than the screen the page is, and the widest elements sticking out (to say what to fix). */
async function overflow(page: Page): Promise<{ excess: number; culprits: string[] }> {
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const excess = Math.max(document.documentElement.scrollWidth, document.body.scrollWidth) - width;
    const culprits: string[] = [];
    if (excess > 0) {
      for (const el of Array.from(document.querySelectorAll<HTMLElement>('body *'))) {
        const r = el.getBoundingClientRect();
        // Elements inside a box that scrolls or clips on its own do not widen the page.
        let clipped = false;
        for (let a = el.parentElement; a && a !== document.body; a = a.parentElement) {
          if (getComputedStyle(a).overflowX !== 'visible') clipped = true;
        }
        if (r.right > width + 1 && r.width > 0 && !clipped) {
          const name = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}.${String(el.className).split(' ').slice(0, 3).join('.')}`;
          culprits.push(`${name} (right ${Math.round(r.right)})`);
          if (culprits.length >= 5) break;
        }
      }
    }
    return { excess, culprits };
  });
}

describe('every page fits a phone and a tablet', () => {
  for (const role of ROLES) {
    for (const size of SIZES) {
    it(`the ${role}'s pages on a ${size.name}`, { timeout: 600_000 }, async () => {
      const problems: string[] = [];
      {
        const context = await suite.browser.newContext({ viewport: { width: size.width, height: size.height }, isMobile: size.name === 'phone', hasTouch: true });
        const page = await context.newPage();
        const errors = watchConsole(page);
        await page.goto(`${suite.server.baseUrl}/signin`);
        await page.getByLabel('E-mail').fill(demoEmail(role));
        await page.getByLabel('Password').fill(DEMO_PASSWORD);
        await page.getByRole('button', { name: 'Sign in' }).click();
        await page.waitForURL((u) => !u.pathname.startsWith('/signin'));
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        await settle(page);
        const routes = await routesFor(page, role);
        for (const route of routes) {
          await page.goto(`${suite.server.baseUrl}${route}`);
          const opened = await page.getByRole('heading', { level: 1 }).first().waitFor({ timeout: 20_000 }).then(() => true, () => false);
          if (!opened) {
            problems.push(`${size.name} ${route}: no page heading`);
            await screenshot(page, `responsive-${role}-${size.name}-broken`);
            continue;
          }
          await settle(page);
          const { excess, culprits } = await overflow(page);
          if (excess > 0) problems.push(`${size.name} ${route}: ${excess} px too wide (${culprits.join(', ')})`);
          // On the phone the navigation is behind the menu button; on the tablet and up it is in view.
          const nav = page.getByRole('navigation', { name: 'Main' });
          if (size.name === 'phone' && (await nav.isVisible())) problems.push(`${size.name} ${route}: the main navigation is not folded into the menu`);
          await screenshot(page, `responsive-${role}-${size.name}-${route.replace(/^\//, '').replace(/[^\w]+/g, '-') || 'overview'}`);
        }
        if (size.name === 'phone') {
          // The menu opens, shows every entry of the role, and a choice closes it.
          await page.getByRole('button', { name: 'Menu' }).click();
          const nav = page.getByRole('navigation', { name: 'Main' });
          await nav.waitFor();
          expect(await nav.getByRole('link').count()).toBe(navFor(role).length);
          await screenshot(page, `responsive-${role}-phone-menu`);
          await nav.getByRole('link', { name: 'Estimates' }).click();
          await page.getByRole('heading', { level: 1, name: 'Estimates' }).waitFor();
          expect(await nav.isVisible()).toBe(false);
        }
        problems.push(...errors.map((e) => `${size.name} console: ${e}`));
        await context.close();
      }
      expect(problems).toEqual([]);
    });
    }
  }

  it('the sign-in page and the customer\u2019s quote page', { timeout: 300_000 }, async () => {
    const problems: string[] = [];
    for (const size of SIZES) {
      const context = await suite.browser.newContext({ viewport: { width: size.width, height: size.height }, isMobile: size.name === 'phone', hasTouch: true });
      const page = await context.newPage();
      const errors = watchConsole(page);
      await page.goto(`${suite.server.baseUrl}/signin`);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await settle(page);
      const signIn = await overflow(page);
      if (signIn.excess > 0) problems.push(`${size.name} /signin: ${signIn.excess} px too wide`);
      await screenshot(page, `responsive-signin-${size.name}`);
      // A quote sent to a customer, opened from its link without signing in.
      await page.getByLabel('E-mail').fill(demoEmail('sales'));
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL((u) => !u.pathname.startsWith('/signin'));
      const priced = await getJson<{ rows: { id: number }[] }>(page, '/api/estimates?state=priced&pageSize=1');
      const csrf = (await getJson<{ csrfToken: string }>(page, '/api/auth/csrf')).csrfToken;
      const made = await page.request.post(`${suite.server.baseUrl}/api/estimates/${priced.rows[0]!.id}/quotes`, { data: {}, headers: { 'x-csrf-token': csrf } });
      const quote = (await made.json()) as { id: number };
      const sent = await page.request.post(`${suite.server.baseUrl}/api/quotes/${quote.id}/send`, { data: {}, headers: { 'x-csrf-token': csrf } });
      const { link } = (await sent.json()) as { link: string };
      const customer = await suite.browser.newContext({ viewport: { width: size.width, height: size.height }, isMobile: size.name === 'phone', hasTouch: true });
      const cpage = await customer.newPage();
      const cerrors = watchConsole(cpage);
      await cpage.goto(link.replace(/^http:\/\/[^/]+/, suite.server.baseUrl));
      await cpage.getByRole('heading', { level: 1 }).first().waitFor();
      await settle(cpage);
      const q = await overflow(cpage);
      if (q.excess > 0) problems.push(`${size.name} customer's quote: ${q.excess} px too wide (${q.culprits.join(', ')})`);
      await screenshot(cpage, `responsive-customer-quote-${size.name}`);
      problems.push(...errors.map((e) => `${size.name} console: ${e}`), ...cerrors.map((e) => `${size.name} customer console: ${e}`));
      await customer.close();
      await context.close();
    }
    expect(problems).toEqual([]);
  });

  it('at 1440 \u00d7 900 the price list\u2019s notes and the parts table\u2019s drop-downs show their text whole', { timeout: 300_000 }, async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill(demoEmail('owner'));
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => !u.pathname.startsWith('/signin'));
    await settle(page);

    await page.goto(`${suite.server.baseUrl}/price-list`);
    await page.getByRole('heading', { level: 1, name: 'Price list' }).waitFor();
    await settle(page);
    // The notes column is wide enough that a note reads as lines of words, not a word per line.
    const notes = await page.evaluate(() => {
      const head = Array.from(document.querySelectorAll('th')).find((th) => th.textContent?.trim().toLowerCase() === 'notes');
      return head ? head.getBoundingClientRect().width : 0;
    });
    expect(notes).toBeGreaterThanOrEqual(250);
    expect((await overflow(page)).excess).toBeLessThanOrEqual(0);
    await screenshot(page, 'responsive-owner-desktop-price-list');

    const estimates = await getJson<{ rows: { piece: { id: number } }[] }>(page, '/api/estimates?pageSize=1');
    await page.goto(`${suite.server.baseUrl}/estimates/new?pieceId=${estimates.rows[0]!.piece.id}`);
    await page.getByRole('heading', { level: 1, name: 'New estimate' }).waitFor();
    await page.getByRole('button', { name: 'Edit the parts table' }).click();
    await page.getByRole('heading', { name: 'Parts' }).first().waitFor().catch(() => undefined);
    await settle(page);
    // Every drop-down is wide enough for its chosen option, arrow included.
    const cut = await page.evaluate(() => {
      const ctx = document.createElement('canvas').getContext('2d')!;
      const out: string[] = [];
      for (const sel of Array.from(document.querySelectorAll<HTMLSelectElement>('form[aria-label="Estimate"] select'))) {
        const cs = getComputedStyle(sel);
        ctx.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
        const text = sel.options[sel.selectedIndex]?.text ?? '';
        const need = ctx.measureText(text).width + parseFloat(cs.paddingLeft) + parseFloat(cs.paddingRight) + 20;
        if (need > sel.clientWidth) out.push(`${text} (${Math.round(need)} > ${sel.clientWidth})`);
      }
      return out;
    });
    expect(cut).toEqual([]);
    await screenshot(page, 'responsive-owner-desktop-parts-table');
    expect(errors).toEqual([]);
    await context.close();
  });
});
