import type { Page } from 'playwright-core';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { BIG_PARTS } from '../fixtures/golden/cases';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite();

/** A small walnut-brown image, as a photo of the piece would be. */
function photo(background: string): Promise<Buffer> {
  return sharp({ create: { width: 320, height: 240, channels: 3, background } }).png().toBuffer();
}

async function signInAsEstimator(page: Page): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail('estimator'));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

const number = (text: string | null) => Number((text ?? '').replace(/[^\d.]/g, ''));

describe('estimates, in a real browser', () => {
  it('the estimator prices a grand from the template, saves, revises and compares the revisions', async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await signInAsEstimator(page);

    // A customer and their piece.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Customers' }).click();
    await page.getByRole('heading', { level: 1, name: 'Customers' }).waitFor();
    await screenshot(page, 'customers-list');
    await page.getByRole('button', { name: 'Add customer' }).click();
    const name = 'Tamsin Brackenridge';
    let dialog = page.getByRole('dialog');
    await dialog.getByLabel('Name').fill(name);
    await dialog.getByLabel('E-mail').fill('tamsin.brackenridge@example.com');
    await dialog.getByRole('button', { name: 'Add customer' }).click();
    await page.getByRole('heading', { level: 1, name }).waitFor();

    await page.getByRole('button', { name: 'Add a piece' }).click();
    dialog = page.getByRole('dialog');
    await dialog.getByLabel('Kind').selectOption('grand');
    await dialog.getByLabel('Description').fill('Rosewood grand with a crazed finish');
    await dialog.getByLabel('Length').fill('6 ft 3 in');
    await expect.poll(() => dialog.getByText('1905 mm · 75.0 in').count()).toBe(1);
    await dialog.getByRole('button', { name: 'Add piece' }).click();
    await page.getByRole('heading', { level: 1, name: 'Rosewood grand with a crazed finish' }).waitFor();

    // Condition photos, two at once.
    await page.getByLabel('Choose photos to upload').setInputFiles([
      { name: 'lid.png', mimeType: 'image/png', buffer: await photo('#6b3a22') },
      { name: 'fall.png', mimeType: 'image/png', buffer: await photo('#a0652f') },
    ]);
    await page.getByLabel('Caption for lid.png').fill('Lid: crazing along the bentside');
    await page.getByRole('button', { name: 'Upload 2 photos' }).click();
    await expect.poll(() => page.getByRole('list', { name: 'Condition photos' }).getByRole('listitem').count(), { timeout: 15_000 }).toBe(2);
    await expect.poll(() => page.getByText('Lid: crazing along the bentside').count()).toBe(1);
    await screenshot(page, 'piece-page');

    // A new estimate from the grand template.
    await page.getByRole('link', { name: 'New estimate' }).click();
    await page.getByRole('heading', { level: 1, name: 'New estimate' }).waitFor();
    await expect.poll(() => page.getByLabel('Length').inputValue()).toBe('6 ft 3 in');
    const price = page.getByTestId('total-price');
    await expect.poll(() => price.textContent()).toMatch(/^£[\d,]+\.\d{2}$/);
    const area = page.getByTestId('total-area');
    const areaBefore = number(await area.textContent());
    expect(await area.textContent()).toMatch(/m²$/);
    expect(await page.getByTestId('total-hours').textContent()).toMatch(/ h$/);
    await page.getByTestId('calendar-chart').waitFor();
    await screenshot(page, 'estimate-new');

    // A length it cannot read is named beside the field; the last figures stay, marked out of date.
    await page.getByLabel('Length').fill('190 furlongs');
    await expect.poll(() => page.getByText(/"furlongs" is not a length unit/).count()).toBe(1);
    await page.getByTestId('stale').waitFor();
    await screenshot(page, 'estimate-bad-length');
    await page.getByLabel('Length').fill('6 ft 8 in');
    await expect.poll(() => page.getByTestId('stale').count()).toBe(0);
    await expect.poll(async () => number(await area.textContent())).toBeGreaterThan(areaBefore);
    const livePrice = await price.textContent();

    await page.getByRole('button', { name: 'Save estimate' }).click();
    await page.getByText('Revision 1 saved').waitFor();
    expect(await page.getByTestId('total-price').textContent()).toBe(livePrice);
    await expect.poll(() => page.locator('[data-state="draft"]').first().textContent()).toBe('Draft');
    expect(await page.getByRole('heading', { name: 'Safety cautions' }).count()).toBe(1);
    await screenshot(page, 'estimate-saved');
    const estimateUrl = page.url();

    // A revision: fewer bodying sessions and a discount.
    await page.getByRole('button', { name: 'Revise' }).click();
    await page.getByRole('heading', { level: 1, name: /^Revise estimate/ }).waitFor();
    await expect.poll(() => page.getByLabel('Length').inputValue()).toBe('6 ft 8 in');
    await page.getByLabel('Sessions of Bodying with the rubber').fill('8');
    await page.getByLabel('Discount').fill('5');
    await page.getByLabel('Note for this revision').fill('One more bodying session; loyal customer discount');
    await page.getByRole('button', { name: 'Save as revision 2' }).click();
    await page.getByText('Revision 2 saved').waitFor();
    expect(page.url()).toBe(estimateUrl);
    await page.getByTestId('revision-1').waitFor();
    await page.getByTestId('revision-2').waitFor();
    await page.getByRole('button', { name: 'Mark as priced' }).click();
    await expect.poll(() => page.locator('h1 [data-state]').textContent()).toBe('Priced');
    await screenshot(page, 'estimate-revised');

    // Both revisions side by side.
    await page.getByRole('button', { name: 'Compare 1 and 2' }).click();
    await page.getByTestId('comparison').waitFor();
    await expect.poll(() => page.getByTestId('input-change-discountPct').textContent()).toMatch(/0.*5/);
    expect(await page.getByTestId('input-change-stages.body.sessions').textContent()).toMatch(/7.*8/);
    expect(await page.getByTestId('figure-labourHours').textContent()).toMatch(/up/);
    expect(await page.getByTestId('price-change-total').textContent()).toMatch(/£/);
    await screenshot(page, 'estimate-compare');

    // The list: the new estimate, filtered by state.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Estimates' }).click();
    await page.getByLabel('State').selectOption('priced');
    await page.getByLabel('Search').fill(name);
    await page.getByLabel('Search').press('Enter');
    await expect.poll(() => page.getByRole('row').filter({ hasText: name }).count()).toBe(1);
    await screenshot(page, 'estimates-list');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a 200-part table draws the rows in view; the last part is reached by scrolling, rows by Tab, and edits price as before', async () => {
    const context = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await signInAsEstimator(page);
    const csrf = ((await (await page.request.get(`${suite.server.baseUrl}/api/auth/csrf`)).json()) as { csrfToken: string }).csrfToken;
    const list = (await (await page.request.get(`${suite.server.baseUrl}/api/estimates?pageSize=1`)).json()) as { rows: { customer: { id: number }; piece: { id: number } }[] };
    const { customer, piece } = list.rows[0]!;
    const made = await page.request.post(`${suite.server.baseUrl}/api/estimates`, {
      headers: { 'x-csrf-token': csrf },
      data: { customerId: customer.id, pieceId: piece.id, title: 'A long parts table', input: { piece: { parts: BIG_PARTS }, system: 'full-repolish', startDate: '2025-03-03' } },
    });
    expect(made.ok()).toBe(true);
    const { id } = (await made.json()) as { id: number };
    await page.goto(`${suite.server.baseUrl}/estimates/${id}/edit`);
    await page.getByTestId('row-area-0').waitFor();

    // A screenful of rows is in the page, each giving its place in the list of 200.
    const rows = page.locator('li[aria-label^="Part "]');
    expect(await rows.count()).toBeLessThan(40);
    expect(await rows.first().getAttribute('aria-setsize')).toBe('200');

    // The last part, scrolled to, is there and prices as before: twice the count, twice its area.
    await page.getByRole('button', { name: 'Add a part' }).scrollIntoViewIfNeeded();
    const last = page.getByRole('listitem', { name: 'Part 200: Part 200', exact: true });
    await last.waitFor();
    expect(await last.getAttribute('aria-posinset')).toBe('200');
    const area = last.getByTestId('row-area-199');
    const before = number(await area.textContent());
    const count = last.getByLabel('Count of Part 200', { exact: true });
    await count.fill(String(Number(await count.inputValue()) * 2));
    await expect.poll(async () => number(await area.textContent())).toBeCloseTo(before * 2, 1);

    // Tab walks on from row to row past the rows first drawn, and the row holding the focus stays when scrolled away.
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.getByLabel('Name of part 1', { exact: true }).focus();
    const focusedRow = () => page.evaluate(() => document.activeElement?.closest('li[aria-posinset]')?.getAttribute('aria-posinset') ?? null);
    let at = await focusedRow();
    for (let presses = 0; presses < 800 && at !== '12'; presses++) {
      await page.keyboard.press('Tab');
      at = await focusedRow();
    }
    expect(at).toBe('12');
    await page.evaluate(() => window.scrollTo(0, 0));
    await expect.poll(() => page.evaluate(() => window.scrollY)).toBe(0);
    expect(await focusedRow()).toBe('12');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('sales sees estimates but not the controls to change them', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    await page.goto(`${suite.server.baseUrl}/signin`);
    await page.getByLabel('E-mail').fill(demoEmail('sales'));
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Estimates' }).click();
    const first = page.getByRole('row').nth(1).getByRole('link').first();
    await first.waitFor();
    await first.click();
    await page.getByTestId('total-price').waitFor();
    expect(await page.getByRole('heading', { name: 'Safety cautions' }).count()).toBe(1);
    expect(await page.getByRole('button', { name: 'Revise' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Mark as priced' }).count()).toBe(0);
    await screenshot(page, 'estimate-sales-view');
    await page.close();
  });
});
