/**
 * The owner reads the reports: quotes by month and capacity by week, each chart with its table beside it, a period
 * of their choosing (a period that ends before it starts is refused by the form), and the CSV of what is shown. On a
 * phone the charts and tables stack and nothing sticks out of the screen. Screenshots of both widths are kept.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, settle, watchConsole } from '../helpers/browser';


const suite = browserSuite();

async function signIn(page: Page, role: 'owner' | 'workshop') {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-user').waitFor({ state: 'attached' });
}

describe('the owner\u2019s reports', () => {
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
