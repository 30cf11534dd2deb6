/**
 * A quote for the whole household in a real browser: sales builds a quote of two pieces, one of them with two options
 * (full repolish recommended, or the lighter re-body and refresh); the customer switches options on their page and
 * sees total, deposit and balance follow; accepts with the lighter option, pays on the payment stand-in; the jobs
 * made are one a chosen piece, of the chosen estimates. The customer, pieces and estimates are set up through the API.
 */
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { choiceFigures, type QuoteDetail } from '../../shared/schemas/quotes';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite({ services: true });

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));

async function signIn(page: Page): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail('sales'));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('a quote for the whole household', () => {
  it('sales offers two pieces with options; the customer switches, accepts the lighter option and pays; the jobs follow the choice', async () => {
    const { app } = getTestApp();
    const sales = await signInAs(app, 'sales');
    const estimator = await signInAs(app, 'estimator');
    const workshop = await signInAs(app, 'workshop');
    const c = await post(sales, '/api/customers', { name: 'Clemency Harrowgate', email: 'clemency.harrowgate@example.com' }).expect(201);
    const piece = async (kind: string, description: string) => (await post(estimator, '/api/pieces', { customerId: c.body.id, kind, description }).expect(201)).body.id as number;
    const estimate = async (pieceId: number, input: object) => {
      const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId, input }).expect(201);
      await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
      return e.body.id as number;
    };
    const upright = await piece('upright', 'Harrowgate walnut upright');
    const table = await piece('furniture', 'Harrowgate dining table');
    const uprightInput = { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true };
    const full = await estimate(upright, { piece: uprightInput, system: 'full-repolish' });
    const light = await estimate(upright, { piece: uprightInput, system: 'revive' });
    const tableEstimate = await estimate(table, { piece: { template: 'table', dimensions: { length: '160 cm', width: '90 cm', height: '75 cm' }, species: 'mahogany', veneered: false }, system: 'full-repolish' });

    // Sales builds the quote on the full repolish's estimate page.
    const staff = await suite.browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await staff.newPage();
    const staffErrors = watchConsole(page);
    await signIn(page);
    await page.goto(`${suite.server.baseUrl}/estimates/${full}`);
    await page.getByRole('button', { name: 'Prepare a quote' }).click();
    const form = page.getByRole('form', { name: 'Prepare a quote' });
    const lines = form.getByTestId('quote-lines');
    await lines.waitFor();
    await form.getByLabel('Line 1: option name').fill('Full repolish');
    await expect.poll(() => lines.getByRole('button', { name: 'Add another estimate' }).isEnabled()).toBe(true);
    await lines.getByRole('button', { name: 'Add another estimate' }).click();
    await form.getByLabel('Line 2: estimate').selectOption(String(light));
    await form.getByLabel('Line 2: piece', { exact: true }).selectOption('1');
    await form.getByLabel('Line 2: option name').fill('Re-body and refresh');
    await lines.getByRole('button', { name: 'Add another estimate' }).click();
    await form.getByLabel('Line 3: estimate').selectOption(String(tableEstimate));
    await form.getByLabel('Line 3: piece', { exact: true }).selectOption('2');
    await form.getByLabel('Line 3: option name').fill('Full repolish');
    await form.getByRole('button', { name: 'Prepare the quote' }).click();
    // "Prepare the quote" opens the quote it made.
    await page.waitForURL(/\/quotes\/\d+$/);
    const prepared = page.locator('main');
    await prepared.getByRole('heading', { level: 1, name: /Q-/ }).waitFor();
    await prepared.getByTestId('quote-lines-view').waitFor();
    expect(await prepared.getByTestId('quote-lines-view').getByRole('row').count()).toBe(4);
    await screenshot(page, 'quote-options-prepared');
    await prepared.getByRole('button', { name: 'Send to the customer' }).click();
    await page.getByTestId('quote-link-box').waitFor();
    const link = await page.getByLabel('Customer’s link').inputValue();
    const quoteId = Number(new URL(page.url()).pathname.split('/').pop());
    const quote = (await sales.agent.get(`/api/quotes/${quoteId}`).expect(200)).body as QuoteDetail;
    expect(quote.lines.map((l) => [l.estimate.id, l.group, l.recommended])).toEqual([
      [full, 1, true],
      [light, 1, false],
      [tableEstimate, 2, true],
    ]);
    const [fullLine, lightLine, tableLine] = quote.lines;
    const figures = (ids: number[]) => choiceFigures({ lines: quote.lines, depositPct: quote.depositPct, extras: quote.extras }, ids, []);
    const recommended = figures([fullLine!.id, tableLine!.id]);
    const lighter = figures([lightLine!.id, tableLine!.id]);
    expect(recommended.total).not.toBe(lighter.total);

    // The customer switches between the options and sees the figures follow, then accepts the lighter one.
    const customer = await suite.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const phone = await customer.newPage();
    const customerErrors = watchConsole(phone);
    await phone.goto(link);
    const accept = phone.getByRole('form', { name: 'Accept the quote' });
    await accept.waitFor();
    await phone.getByTestId('piece-2').waitFor();
    const shown = async () => [await accept.getByTestId('accept-total').textContent(), await accept.getByTestId('accept-deposit').textContent(), await accept.getByTestId('accept-balance').textContent()];
    expect(await shown()).toEqual([gbp(recommended.total), gbp(recommended.deposit), gbp(recommended.balance)]);
    await phone.getByRole('radio', { name: /Re-body and refresh/ }).check();
    await expect.poll(shown).toEqual([gbp(lighter.total), gbp(lighter.deposit), gbp(lighter.balance)]);
    await phone.getByRole('radio', { name: /Option A: Full repolish/ }).check();
    await expect.poll(shown).toEqual([gbp(recommended.total), gbp(recommended.deposit), gbp(recommended.balance)]);
    await phone.getByRole('radio', { name: /Re-body and refresh/ }).check();
    await expect.poll(shown).toEqual([gbp(lighter.total), gbp(lighter.deposit), gbp(lighter.balance)]);
    await screenshot(phone, 'quote-options-customer-choice');
    await accept.getByLabel('Your full name').fill('Clemency Harrowgate');
    await accept.getByRole('checkbox', { name: /I have read the quote/ }).check();
    await accept.getByRole('button', { name: /Accept for/ }).click();
    const outcome = phone.getByTestId('outcome');
    await outcome.waitFor();
    expect(await phone.getByTestId('public-total').textContent()).toBe(gbp(lighter.total));
    await outcome.getByRole('button', { name: /Pay the deposit/ }).click();
    await phone.waitForURL((u) => u.href.startsWith(suite.server.services!.payments!.url));
    expect(await phone.locator('.amount').textContent()).toBe(gbp(lighter.deposit));
    await phone.getByRole('button', { name: /^Pay / }).click();
    await phone.waitForURL((u) => u.href.startsWith(`${link}?deposit=paid`));
    await phone.getByTestId('deposit-paid').waitFor();
    expect(customerErrors).toEqual([]);
    await customer.close();

    // The staff page shows the choice; the jobs are the lighter upright and the table, nothing of the full repolish.
    const after = (await sales.agent.get(`/api/quotes/${quoteId}`).expect(200)).body as QuoteDetail;
    expect(after).toMatchObject({ state: 'deposit-paid', acceptedTotal: lighter.total, acceptedDeposit: lighter.deposit });
    await page.goto(`${suite.server.baseUrl}/quotes/${quoteId}`);
    await expect.poll(() => page.getByTestId('quote-line-2-choice').textContent()).toBe('Chosen');
    expect(await page.getByTestId('quote-line-1-choice').textContent()).toBe('Not chosen');
    expect(await page.getByTestId('agreed-total').textContent()).toBe(gbp(lighter.total));
    await screenshot(page, 'quote-options-staff');
    expect(staffErrors).toEqual([]);
    await staff.close();

    const jobA = await post(workshop, '/api/jobs', { quoteId }).expect(201);
    const jobB = await post(workshop, '/api/jobs', { quoteId }).expect(201);
    await post(workshop, '/api/jobs', { quoteId }).expect(409);
    expect([jobA.body.estimate.id, jobB.body.estimate.id]).toEqual([light, tableEstimate]);
    expect(jobA.body.sessions.length).toBeGreaterThan(0);
    expect(jobB.body.sessions.length).toBeGreaterThan(0);
  });
});
