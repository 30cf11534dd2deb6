/**
 * The owner reads the reports: quotes by month, money (an agreement of this file's own, paid in part by bank
 * transfer and invoiced, shows in the months, the money held and the owed list), capacity by week, each chart with its table beside it, a period
 * of their choosing (a period that ends before it starts is refused by the form), and the CSV of what is shown. On a
 * phone the charts and tables stack and nothing sticks out of the screen. Screenshots of both widths are kept.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, settle, watchConsole } from '../helpers/browser';

const suite = browserSuite({ services: true });

async function signIn(page: Page, role: 'owner' | 'workshop') {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-user').waitFor({ state: 'attached' });
}

/** An agreement of this file's own through the API as staff would make it: accepted, 100.00 paid by transfer, invoiced. */
async function paidAgreement(page: Page): Promise<{ quoteNumber: string; invoiceNumber: string }> {
  const csrf = ((await (await page.request.get(`${suite.server.baseUrl}/api/auth/csrf`)).json()) as { csrfToken: string }).csrfToken;
  const call = async <T,>(method: 'post' | 'put' | 'get', url: string, data?: object): Promise<T> => {
    const res = await page.request[method](`${suite.server.baseUrl}${url}`, { data, headers: { 'x-csrf-token': csrf } });
    expect(res.ok(), `${url}: ${await res.text()}`).toBe(true);
    return (await res.json()) as T;
  };
  const tag = `${process.pid}-${Date.now().toString(36)}`;
  const c = await call<{ id: number }>('post', '/api/customers', { name: `Reports Money ${tag}`, email: `reports.money.${tag}@example.com` });
  const p = await call<{ id: number }>('post', '/api/pieces', { customerId: c.id, kind: 'upright', description: 'Walnut upright' });
  const e = await call<{ id: number }>('post', '/api/estimates', {
    customerId: c.id,
    pieceId: p.id,
    input: { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish', discountPct: 0 },
  });
  await call('post', `/api/estimates/${e.id}/state`, { state: 'priced' });
  const q = await call<{ id: number; number: string }>('post', `/api/estimates/${e.id}/quotes`, {});
  const sent = await call<{ link: string }>('post', `/api/quotes/${q.id}/send`, {});
  const token = sent.link.split('/q/')[1]!;
  const accepted = await page.request.post(`${suite.server.baseUrl}/api/public/quotes/${token}/accept`, { data: { name: 'Reports Money', acceptTerms: true, extras: [] } });
  expect(accepted.ok(), await accepted.text()).toBe(true);
  const today = (await call<{ today: string }>('get', '/api/reports/capacity?from=2026-01-05&to=2026-01-11')).today;
  await call('post', `/api/accounts/quotes/${q.id}/payments`, { method: 'bank-transfer', amount: '100.00', receivedOn: today, reference: 'Transfer' });
  const stage = (await call<{ invoiceStage: string }>('get', '/api/accounts/settings')).invoiceStage;
  await call('put', '/api/accounts/settings', { invoiceStage: 'accepted' });
  try {
    const account = await call<{ documents: { kind: string; number: string }[] }>('post', `/api/accounts/quotes/${q.id}/invoice`, {});
    return { quoteNumber: q.number, invoiceNumber: account.documents.find((d) => d.kind === 'invoice')!.number };
  } finally {
    await call('put', '/api/accounts/settings', { invoiceStage: stage });
  }
}

describe('the owner\u2019s reports', () => {
  it('shows money by month, what is held and what is owed, with the money CSV and the accounting export', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    const made = await paidAgreement(page);
    await page.goto(`${suite.server.baseUrl}/reports`);
    await page.getByRole('heading', { level: 1, name: 'Reports' }).waitFor();
    const months = page.getByRole('table', { name: 'Money by month' });
    await months.waitFor();
    await page.getByRole('figure', { name: /money invoiced and received/ }).locator('.recharts-surface').first().waitFor();
    // The agreement's 100.00 is held (no job yet) and its invoice is owed, today's, in the first bucket.
    const held = page.getByRole('table', { name: 'Money held against work not yet done' });
    // Other files hold money on agreements of their own: newest quote first brings this file's to the first page.
    const byQuote = held.getByRole('columnheader', { name: /Quote/ });
    for (let i = 0; i < 3 && (await byQuote.getAttribute('aria-sort')) !== 'descending'; i++) await byQuote.getByRole('button').click();
    expect(await byQuote.getAttribute('aria-sort')).toBe('descending');
    await expect.poll(async () => (await held.textContent()) ?? '').toContain(made.quoteNumber);
    const owed = page.getByRole('table', { name: 'Owed to the workshop by age' });
    await expect.poll(async () => (await owed.textContent()) ?? '').toContain(made.invoiceNumber);
    expect(await owed.getByRole('row').filter({ hasText: made.invoiceNumber }).textContent()).toMatch(/0 days/);
    // Beside: the chart and the month table share a row on a wide screen.
    const chartBox = await page.getByRole('figure', { name: /money invoiced/ }).boundingBox();
    const tableBox = await months.boundingBox();
    expect(Math.abs(chartBox!.y - tableBox!.y)).toBeLessThan(chartBox!.height);

    const moneyHref = await page.getByRole('link', { name: 'CSV of money by month' }).getAttribute('href');
    expect(moneyHref).toMatch(/^\/api\/reports\/money\.csv\?from=\d{4}-\d{2}-01&to=\d{4}-\d{2}-\d{2}$/);
    const moneyCsv = await page.request.get(`${suite.server.baseUrl}${moneyHref}`);
    expect((await moneyCsv.text()).replace(/^\ufeff/, '').split('\r\n')[0]).toMatch(/^"Month","Invoiced \(/);
    const accountingHref = await page.getByRole('link', { name: /Accounting export/ }).getAttribute('href');
    const accounting = await page.request.get(`${suite.server.baseUrl}${accountingHref}`);
    expect(accounting.headers()['content-type']).toMatch(/text\/csv/);
    const text = (await accounting.text()).replace(/^\ufeff/, '');
    expect(text.split('\r\n')[0]).toBe('"Date","Type","Number","Customer","Quote","Net","Tax","Tax rate (%)","Total","Currency","Method","Reference","Against invoice"');
    expect(text).toContain(`"Tax invoice","${made.invoiceNumber}"`);
    expect(text).toMatch(new RegExp(`"Payment received","RC-\\d{5}","Reports Money [^"]+","${made.quoteNumber}","","","","100.00"`));

    await page.getByRole('heading', { name: 'Money' }).scrollIntoViewIfNeeded();
    await settle(page);
    await screenshot(page, 'reports-money');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('shows quotes and capacity for a chosen period, each chart beside its table, with CSV exports', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Reports' }).click();
    await page.getByRole('heading', { level: 1, name: 'Reports' }).waitFor();

    const quotesTable = page.getByRole('table', { name: 'Quotes by month' });
    await quotesTable.waitFor();
    const capacityTable = page.getByRole('table', { name: 'Capacity by week' });
    await capacityTable.waitFor();
    await page.getByRole('figure', { name: /quotes sent, opened, accepted/ }).locator('.recharts-surface').first().waitFor();
    await page.getByRole('figure', { name: /drying-room and polisher use/ }).locator('.recharts-surface').first().waitFor();
    // Beside: on a wide screen the chart and the table share a row.
    const chartBox = await page.getByRole('figure', { name: /quotes sent/ }).boundingBox();
    const tableBox = await quotesTable.boundingBox();
    expect(Math.abs(chartBox!.y - tableBox!.y)).toBeLessThan(chartBox!.height);
    expect(tableBox!.x).toBeGreaterThan(chartBox!.x + chartBox!.width / 2);
    // The demo workshop has booked jobs in the weeks ahead: some week shows the room in use.
    await expect.poll(async () => (await capacityTable.textContent()) ?? '').toMatch(/\d+(\.\d)? %/);
    await settle(page);
    await screenshot(page, 'reports-desktop');

    // A period that ends before it starts is refused by the form, naming the end.
    const quotesPeriod = page.getByRole('form', { name: 'Period of the quotes report' });
    await quotesPeriod.getByLabel('From').fill('2026-06-01');
    await quotesPeriod.getByLabel('To').fill('2026-05-01');
    await quotesPeriod.getByRole('button', { name: 'Show' }).click();
    await expect.poll(() => quotesPeriod.textContent()).toMatch(/To must be on or after the start of the period/);
    // A year of months is shown as asked, one row a month (twelve to a page).
    await quotesPeriod.getByLabel('From').fill('2025-12-01');
    await quotesPeriod.getByLabel('To').fill('2026-11-30');
    await quotesPeriod.getByRole('button', { name: 'Show' }).click();
    await expect.poll(async () => (await quotesTable.getByRole('row').allTextContents()).slice(1, 2).join('')).toMatch(/^Dec 2025/);
    await expect.poll(() => quotesTable.getByRole('row').count()).toBe(13);

    const href = await page.getByRole('link', { name: 'CSV of quotes by month' }).getAttribute('href');
    expect(href).toBe('/api/reports/quotes.csv?from=2025-12-01&to=2026-11-30');
    const csv = await page.request.get(`${suite.server.baseUrl}${href}`);
    expect(csv.status()).toBe(200);
    expect(csv.headers()['content-type']).toMatch(/text\/csv/);
    const lines = (await csv.text()).replace(/^\ufeff/, '').split('\r\n');
    expect(lines[0]).toBe('"Month","Sent","Opened","Accepted","Declined","Expired"');
    expect(lines[1]).toMatch(/^"2025-12",/);
    const capacityCsv = await page.request.get(`${suite.server.baseUrl}${await page.getByRole('link', { name: 'CSV of capacity by week' }).getAttribute('href')}`);
    expect((await capacityCsv.text()).replace(/^\ufeff/, '').split('\r\n')[0]).toMatch(/^"Week from","Room booked/);
    await settle(page);
    await screenshot(page, 'reports-period');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('stacks the charts and tables on a phone, nothing wider than the screen', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 390, height: 844 } });
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    await page.goto(`${suite.server.baseUrl}/reports`);
    await page.getByRole('table', { name: 'Quotes by month' }).waitFor();
    await page.getByRole('table', { name: 'Capacity by week' }).waitFor();
    await settle(page);
    const chartBox = await page.getByRole('figure', { name: /quotes sent/ }).boundingBox();
    const tableBox = await page.getByRole('table', { name: 'Quotes by month' }).boundingBox();
    expect(tableBox!.y).toBeGreaterThanOrEqual(chartBox!.y + chartBox!.height - 1);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await screenshot(page, 'reports-phone');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('is the owner\u2019s only: the workshop has no Reports in its navigation', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1280, height: 800 } });
    const errors = watchConsole(page);
    await signIn(page, 'workshop');
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Stock' }).waitFor();
    expect(await nav.getByRole('link', { name: 'Reports' }).count()).toBe(0);
    await nav.getByRole('link', { name: 'Stock' }).click();
    await page.getByRole('heading', { level: 1, name: 'Stock' }).waitFor();
    await page.getByRole('table', { name: 'Stock on hand and low-stock warnings' }).waitFor();
    await settle(page);
    await screenshot(page, 'stock-workshop');
    expect(errors).toEqual([]);
    await page.close();
  });
});
