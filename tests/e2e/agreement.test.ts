/**
 * The agreement in a real browser: a quote with two extras, the customer ticks one, accepts and pays on the payment
 * stand-in; then the customer's page, the staff quote page, the job and the PDFs all show the same agreed total,
 * deposit and balance. The setup (estimate, quote, sending) goes through the API, as covered by the quotes journey.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite({ services: true });

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `agreement-e2e-${process.pid}-${Date.now()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}

async function signIn(page: Page, role: 'sales' | 'workshop'): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('what the customer agreed, everywhere', () => {
  it('two extras offered, one ticked, deposit paid: customer page, staff page, job and PDFs agree', async () => {
    const { app } = getTestApp();
    const sales = await signInAs(app, 'sales');
    const estimator = await signInAs(app, 'estimator');
    const c = await post(sales, '/api/customers', { name: 'Ottoline Brackenbury', email: 'ottoline.brackenbury@example.com' }).expect(201);
    const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: 'Burr walnut upright' }).expect(201);
    const input = { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish' };
    const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
    await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
    const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, {
      message: 'Thank you for bringing the upright to us.',
      depositPct: 30,
      extras: [
        { label: 'Regulate the action', description: 'Key dip and let-off', hours: 6, price: '300.00' },
        { label: 'New castor cups', description: 'Turned walnut, felt bases', hours: 1.5, price: '80.00' },
      ],
    }).expect(201);
    const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
    const link: string = sent.body.link;

    // The customer ticks one extra, accepts and pays.
    const customer = await suite.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const phone = await customer.newPage();
    const customerErrors = watchConsole(phone);
    await phone.goto(link);
    const accept = phone.getByRole('form', { name: 'Accept the quote' });
    await accept.waitFor();
    await phone.getByRole('checkbox', { name: /Regulate the action/ }).check();
    const acceptTotal = (await accept.getByTestId('accept-total').textContent())!;
    const acceptDeposit = (await accept.getByTestId('accept-deposit').textContent())!;
    await accept.getByLabel('Your full name').fill('Ottoline Brackenbury');
    await accept.getByRole('checkbox', { name: /I have read the quote/ }).check();
    await accept.getByRole('button', { name: /Accept for/ }).click();
    const outcome = phone.getByTestId('outcome');
    await outcome.waitFor();
    await outcome.getByRole('button', { name: /Pay the deposit/ }).click();
    await phone.waitForURL((u) => u.href.startsWith(suite.server.services!.payments!.url));
    expect(await phone.locator('.amount').textContent()).toBe(acceptDeposit);
    await phone.getByRole('button', { name: /^Pay / }).click();
    await phone.waitForURL((u) => u.href.startsWith(`${link}?deposit=paid`));
    await phone.getByTestId('deposit-paid').waitFor();
    await screenshot(phone, 'agreement-customer-paid');

    // The figures the server agreed, which every place must show.
    const staffApi = await sales.agent.get(`/api/quotes/${q.body.id}`).expect(200);
    const agreed = staffApi.body.agreed as { total: string; deposit: string; balance: string };
    expect(gbp(agreed.total)).toBe(acceptTotal);
    expect(gbp(agreed.deposit)).toBe(acceptDeposit);

    // Customer's page.
    expect(await phone.getByTestId('public-total').textContent()).toBe(gbp(agreed.total));
    expect(await phone.getByTestId('public-deposit').textContent()).toBe(gbp(agreed.deposit));
    expect(await phone.getByTestId('outcome-balance').textContent()).toBe(gbp(agreed.balance));
    const customerPrice = phone.getByTestId('price-breakdown').locator('..');
    expect(await customerPrice.getByTestId('agreed-total').textContent()).toBe(gbp(agreed.total));
    expect(await customerPrice.getByTestId('quote-deposit').textContent()).toBe(gbp(agreed.deposit));
    expect(await customerPrice.getByTestId('quote-balance').textContent()).toBe(gbp(agreed.balance));
    expect(await phone.getByTestId('not-booked').count()).toBe(1);
    expect(await phone.getByText(/reserved/).count()).toBe(0);
    expect(customerErrors).toEqual([]);
    await customer.close();

    // Staff quote page.
    const staff = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await staff.newPage();
    const errors = watchConsole(page);
    await signIn(page, 'sales');
    await page.goto(`${suite.server.baseUrl}/quotes/${q.body.id}`);
    await expect.poll(() => page.locator('h1 [data-quote-state]').textContent()).toBe('Deposit paid');
    expect(await page.getByTestId('agreed-total').textContent()).toBe(gbp(agreed.total));
    expect(await page.getByTestId('quote-deposit').textContent()).toBe(gbp(agreed.deposit));
    expect(await page.getByTestId('quote-balance').textContent()).toBe(gbp(agreed.balance));
    expect(await page.getByTestId('timeline-agreed-total').textContent()).toBe(gbp(agreed.total));
    await screenshot(page, 'agreement-staff-quote');

    // The estimate's agreed figure.
    await page.goto(`${suite.server.baseUrl}/estimates/${e.body.id}`);
    expect(await page.getByTestId('estimate-agreed-total').textContent()).toBe(gbp(agreed.total));

    // The PDFs.
    const acceptance = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/quotes/${q.body.id}/acceptance.pdf`)).body()));
    const quotePdf = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/quotes/${q.body.id}/pdf`)).body()));
    for (const text of [acceptance, quotePdf]) {
      expect(text).toContain(gbp(agreed.total));
      expect(text).toContain(gbp(agreed.deposit));
      expect(text).toContain(gbp(agreed.balance));
    }
    expect(acceptance).toContain('Ottoline Brackenbury');
    expect(errors).toEqual([]);
    await staff.close();

    // The job, made by the workshop: the extra's hours are in it, and it shows the same figures.
    const workshop = await signInAs(app, 'workshop');
    const job = await post(workshop, '/api/jobs', { quoteId: q.body.id }).expect(201);
    expect(job.body.sessions.filter((s: { stageKind: string }) => s.stageKind === 'extra').length).toBeGreaterThan(0);
    const shop = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const jobPage = await shop.newPage();
    await signIn(jobPage, 'workshop');
    await jobPage.goto(`${suite.server.baseUrl}/planning/jobs/${job.body.id}`);
    const fact = (label: string) => jobPage.locator(`[data-fact="${label}"] dd`);
    await fact('Agreed total').waitFor();
    expect(await fact('Agreed total').textContent()).toBe(gbp(agreed.total));
    expect(await fact('Deposit').textContent()).toBe(gbp(agreed.deposit));
    expect(await fact('Balance due on collection').textContent()).toBe(gbp(agreed.balance));
    expect(await jobPage.getByText('Extra: Regulate the action').count()).toBeGreaterThan(0);
    await screenshot(jobPage, 'agreement-job');
    await shop.close();
  });
});
