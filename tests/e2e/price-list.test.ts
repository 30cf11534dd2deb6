import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { rootDir } from '../../server/config';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite();

async function signIn(page: Page, role: 'owner' | 'estimator') {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-user').waitFor();
}

const fixture = path.join(rootDir, 'tests', 'fixtures', 'supplier-prices.csv');
const escapeRe = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

describe('the owner keeps the price list', () => {
  it('uploads a supplier file, reviews the preview, applies it and sees the new prices and their history', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Price list' }).click();
    await page.getByRole('heading', { level: 1, name: 'Price list' }).waitFor();
    // Other files add materials of their own: the flakes are found by searching, not by the first page.
    await page.getByRole('searchbox', { name: /Search materials/ }).fill('shellac');
    await page.getByRole('searchbox', { name: /Search materials/ }).press('Enter');
    await expect.poll(() => page.getByTestId('price-SHELLAC-FLAKES-250').textContent()).toBe('£11.40');
    await screenshot(page, 'price-list-before');

    await page.getByRole('link', { name: 'Upload supplier file' }).click();
    await page.getByRole('heading', { level: 1, name: 'Supplier price file' }).waitFor();
    await page.getByRole('button', { name: 'Read and preview' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/Choose a CSV file first/);
    await page.setInputFiles('#price-file', fixture);
    await page.getByRole('button', { name: 'Read and preview' }).click();
    const changes = page.getByRole('table', { name: 'Prices that change' });
    await changes.waitFor();
    const shellacRow = changes.getByRole('row').filter({ hasText: 'SHELLAC-FLAKES-250' });
    await expect.poll(() => shellacRow.textContent()).toMatch(/£11\.40.*£12\.35.*\+8\.3 %/);
    const spiritRow = changes.getByRole('row').filter({ hasText: 'SPIRIT-1000' });
    await expect.poll(() => spiritRow.textContent()).toMatch(/1000 mL.*£6\.20.*£6\.85/);
    await expect.poll(() => page.getByRole('table', { name: 'New items' }).textContent()).toMatch(/Shellac flakes, amber button/);
    await expect.poll(() => page.getByText('vat_band — these are ignored.').count()).toBe(1);
    await screenshot(page, 'price-file-preview');

    await page.getByRole('button', { name: 'Apply 5 changes' }).click();
    await expect.poll(() => page.getByText('Price list updated').count()).toBe(1);
    await expect.poll(() => page.getByText(/5 prices recorded, 1 pack and 1 material added/).count()).toBe(1);
    await screenshot(page, 'price-file-applied');

    // The open estimates were priced with the list before the file: the notice leads to repricing them.
    const notice = page.getByRole('status').filter({ hasText: 'use older prices' });
    await expect.poll(() => notice.textContent()).toMatch(/^Caution: \d+ open estimates use older prices — review repricing/);
    await notice.getByRole('link', { name: 'review repricing' }).click();
    await page.getByRole('heading', { level: 1, name: 'Reprice open estimates' }).waitFor();
    const candidate = page.getByRole('table', { name: 'Open estimates on an older price list' }).getByRole('row').filter({ hasText: 'Barnaby Quillfeather' });
    await candidate.waitFor();
    const number = (await candidate.getByRole('link').first().textContent())!;
    const oldTotal = (await candidate.getByTestId('old-total').textContent())!;
    const newTotal = (await candidate.getByTestId('new-total').textContent())!;
    expect(oldTotal).toMatch(/^£[\d,]+\.\d\d$/);
    expect(newTotal).not.toBe(oldTotal);
    expect(await candidate.textContent()).toMatch(/up\+£[\d,]+\.\d\d\+\d+\.\d %/);
    await candidate.getByRole('checkbox', { name: `Select ${number}, Barnaby Quillfeather` }).check();
    await screenshot(page, 'reprice-list');
    await page.getByRole('button', { name: 'Reprice selected (1)' }).click();
    const confirm = page.getByRole('dialog', { name: 'Reprice 1 estimate?' });
    await expect.poll(() => confirm.getByRole('listitem').textContent()).toBe(`${number} · Barnaby Quillfeather${oldTotal}${newTotal}`);
    await screenshot(page, 'reprice-confirm');
    await confirm.getByRole('button', { name: 'Reprice 1 estimate' }).click();
    await page.getByRole('heading', { level: 2, name: '1 estimate repriced' }).waitFor();
    const repriced = page.getByTestId(`repriced-${number}`);
    await expect.poll(() => repriced.textContent()).toMatch(new RegExp(`Revision 2 saved${escapeRe(oldTotal)}${escapeRe(newTotal)}`));
    await expect.poll(() => candidate.count()).toBe(0);
    await screenshot(page, 'reprice-done');

    // A new revision with the new total; revision 1 keeps the total it was saved with.
    await repriced.getByRole('link', { name: `Open ${number}` }).click();
    await page.getByText(`Estimate ${number}`, { exact: true }).waitFor();
    await expect.poll(() => page.getByTestId('revision-2').textContent()).toMatch(new RegExp(`Revision 2current.*Repriced with prices of \\d{1,2} \\w{3} \\d{4}.*${escapeRe(newTotal)}`));
    await expect.poll(() => page.getByTestId('revision-1').textContent()).toContain(oldTotal);
    expect(await page.getByTestId('revision-1').textContent()).not.toContain(newTotal);
    await screenshot(page, 'reprice-estimate');
    await page.getByRole('button', { name: 'Compare 1 and 2' }).click();
    await page.getByRole('heading', { level: 1, name: `Compare revisions of ${number}` }).waitFor();
    await screenshot(page, 'reprice-compare');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Price list' }).click();
    await page.getByRole('searchbox', { name: /Search materials/ }).fill('shellac');
    await page.getByRole('searchbox', { name: /Search materials/ }).press('Enter');
    await expect.poll(() => page.getByTestId('price-SHELLAC-FLAKES-250').textContent()).toBe('£12.35');
    await expect.poll(() => page.getByTestId('price-SHELLAC-FLAKES-500').textContent()).toBe('£21.40');
    await expect.poll(() => page.getByTestId('price-QFS-AMBER-250').textContent()).toBe('£13.20');
    await screenshot(page, 'price-list-after-shellac');
    await page.getByRole('searchbox', { name: /Search materials/ }).fill('SPIRIT-');
    await page.getByRole('searchbox', { name: /Search materials/ }).press('Enter');
    await expect.poll(() => page.getByTestId('price-SPIRIT-1000').textContent()).toBe('£6.85');
    await expect.poll(() => page.getByTestId('price-SPIRIT-5000').textContent()).toBe('£24.10');
    await expect.poll(() => page.getByTestId('price-SPIRIT-2500').textContent()).toBe('£12.90');

    await page.getByRole('link', { name: 'Price history of Finishing spirit (methylated)' }).click();
    await page.getByRole('heading', { level: 1, name: 'Finishing spirit (methylated)' }).waitFor();
    await page.locator('.recharts-surface').first().waitFor();
    const history1000 = page.getByRole('table', { name: 'Price history of the 1000 mL pack' });
    await expect.poll(() => history1000.getByRole('row').nth(1).textContent()).toMatch(/£6\.85.*\+10\.5 %.*supplier-prices\.csv.*Ottilie Marchbank/);
    await expect.poll(() => history1000.textContent()).toMatch(/£6\.20/);
    await expect.poll(() => page.locator('.recharts-line').count()).toBe(3);
    await screenshot(page, 'price-history-spirit');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('a file with a bad row shows the line and reason and cannot be applied', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, 'owner');
    await page.goto(`${suite.server.baseUrl}/price-list/upload`);
    await page.setInputFiles('#price-file', { name: 'bad.csv', mimeType: 'text/csv', buffer: Buffer.from('supplier,supplier_code,price\nQuillby Finishing Supplies,WAX-200,9.80\nQuillby Finishing Supplies,WAX-400,about sixteen\n') });
    await page.getByRole('button', { name: 'Read and preview' }).click();
    const bad = page.getByRole('table', { name: 'Rows that cannot be read' });
    await expect.poll(() => bad.textContent()).toMatch(/3.*price "about sixteen" is not an amount/);
    expect(await page.getByRole('button', { name: /Apply 1 change/ }).isDisabled()).toBe(true);
    await screenshot(page, 'price-file-bad-row');
    await page.close();
  });

  it('the owner edits a pack price in place, then settings, a finishing system and reads the audit log', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    const errors = watchConsole(page);
    await signIn(page, 'owner');
    await page.goto(`${suite.server.baseUrl}/price-list?q=pumice`);
    await page.getByRole('button', { name: 'New price for Pumice powder, fine, 250 g' }).click();
    await page.getByRole('textbox', { name: 'New price for Pumice powder, fine, 250 g' }).fill('6,1.0');
    await page.getByRole('button', { name: 'Save price for Pumice powder, fine, 250 g' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/Price must be an amount/);
    await page.getByRole('textbox', { name: 'New price for Pumice powder, fine, 250 g' }).fill('6,10');
    await page.getByRole('button', { name: 'Save price for Pumice powder, fine, 250 g' }).click();
    await expect.poll(() => page.getByTestId('price-PUMICE-250').textContent()).toBe('£6.10');
    await screenshot(page, 'price-list-inline-price');
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'use older prices' }).textContent()).toMatch(/\d+ open estimates? uses? older prices — review repricing/);
    await screenshot(page, 'price-list-reprice-notice');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Settings' }).click();
    await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
    await page.getByLabel('Markup on materials (%)').fill('140');
    await page.getByRole('button', { name: 'Save settings' }).last().click();
    await screenshot(page, 'settings-error');
    await expect.poll(() => page.getByText('must be at most 100').count()).toBeGreaterThan(0);
    expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-invalid'))).toBe('true');
    await page.getByLabel('Markup on materials (%)').fill('27.5');
    await page.getByRole('button', { name: 'Save settings' }).first().click();
    await expect.poll(() => page.getByText('Settings saved. New estimates use them at once.').count()).toBe(1);
    await screenshot(page, 'settings-saved');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Finishing systems' }).click();
    await page.getByRole('link', { name: 'Full repolish', exact: false }).first().click();
    await page.getByRole('heading', { level: 2, name: 'Stages, in order' }).waitFor();
    await page.locator('li button[aria-expanded]').nth(1).click();
    await screenshot(page, 'finishing-system-editor');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Wood species' }).click();
    await page.getByRole('table', { name: 'Wood species' }).getByRole('cell', { name: 'Mahogany', exact: true }).waitFor();
    await screenshot(page, 'species');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit log' }).click();
    await page.getByRole('heading', { level: 1, name: 'Audit log' }).waitFor();
    await page.getByLabel('Record').selectOption('workshop');
    await expect.poll(() => page.getByRole('table', { name: 'Audit log' }).textContent()).toMatch(/pricing › markup %25 %27\.5 %/);
    await page.getByLabel('Record').selectOption('pack-price');
    await expect.poll(() => page.getByRole('table', { name: 'Audit log' }).textContent()).toMatch(/Pumice powder, fine, 250 gprice£5\.60£6\.10from/);
    await screenshot(page, 'audit-log');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('the estimator reads the price list and the systems without edit controls', async () => {
    const page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, 'estimator');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Price list' }).click();
    await page.getByRole('table', { name: 'Materials' }).waitFor();
    await expect.poll(() => page.getByTestId('price-WAX-200').count()).toBe(1);
    expect(await page.getByRole('button', { name: /New price for/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Add material' }).count()).toBe(0);
    await screenshot(page, 'price-list-estimator');
    await page.goto(`${suite.server.baseUrl}/settings`);
    await expect.poll(() => page.getByText('Not available to your role').count()).toBe(1);
    await page.close();
  });
});
