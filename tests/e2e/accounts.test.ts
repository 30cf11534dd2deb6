/**
 * A job's account in a real browser: after the deposit, sales records a cash part-payment and issues the tax invoice
 * from the account panel, the invoice shows on the owed list, the customer pays the rest by card on the payment
 * stand-in from their quote page, and the receipts and invoice PDFs read as text with the same figures.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import type { AccountDto } from '../../shared/schemas/accounts';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';


const suite = browserSuite({ services: true });

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const put = (s: Session, url: string, body: object) => s.agent.put(url).set('x-csrf-token', s.csrf).send(body);
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `accounts-e2e-${process.pid}-${Date.now()}-${Math.random()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}

async function signIn(page: Page, role: 'sales' | 'owner'): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('from a paid deposit to a settled invoice', () => {
  it('a cash part-payment and the invoice from the account panel, the rest paid by card from the customer’s page', async () => {
    const { app } = getTestApp();
    const sales = await signInAs(app, 'sales');
    const estimator = await signInAs(app, 'estimator');
    const owner = await signInAs(app, 'owner');
    const stage = (await owner.agent.get('/api/accounts/settings').expect(200)).body.invoiceStage as string;
    await put(owner, '/api/accounts/settings', { invoiceStage: 'deposit-paid' }).expect(200);
    try {
      const c = await post(sales, '/api/customers', { name: 'Isolde Marchbanks', email: `isolde.${process.pid}@example.com` }).expect(201);
      const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'upright', description: 'Figured mahogany upright' }).expect(201);
      const input = { piece: { template: 'upright', dimensions: { width: '150 cm' }, species: 'walnut', veneered: true }, system: 'full-repolish' };
      const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
      await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
      const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, { depositPct: 30 }).expect(201);
      const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
      const link: string = sent.body.link;
      const token = link.split('/q/')[1]!;
      await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Isolde Marchbanks', acceptTerms: true, extras: [] }).expect(200);
      const checkout = await request(app).post(`/api/public/quotes/${token}/deposit`).send({}).expect(200);
      await suite.server.services!.payments!.pay(String(checkout.body.url).split('/checkout/')[1]!);
      const before = (await sales.agent.get(`/api/accounts/quotes/${q.body.id}`).expect(200)).body as AccountDto;
      const { agreedTotal, paid: deposit, balance } = before.figures;
      expect(before.documents.map((d) => d.kind)).toEqual(['receipt']);

      // Sales: the account panel, a cash part-payment of 100.00, then the invoice.
      const staff = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
      const page = await staff.newPage();
      const errors = watchConsole(page);
      await signIn(page, 'sales');
      await page.goto(`${suite.server.baseUrl}/quotes/${q.body.id}`);
      await page.getByRole('link', { name: 'Account: invoice and payments' }).click();
      const panel = page.getByTestId('account-panel');
      await panel.waitFor();
      expect(await panel.getByTestId('account-balance').textContent()).toBe(gbp(balance));
      const form = page.getByRole('form', { name: 'Record a payment' });
      await form.getByLabel('How it was paid').selectOption('cash');
      await form.getByLabel('Amount (GBP)').fill('100');
      await form.getByLabel('Reference').fill('Counter book 12');
      await form.getByRole('button', { name: 'Record the payment' }).click();
      const afterCash = (Math.round(Number(balance) * 100) - 10_000) / 100;
      // The receipt is issued and e-mailed before the answer: wait for the form to say so.
      await form.getByText(/£100\.00 recorded/).waitFor();
      expect(await panel.getByTestId('account-balance').textContent()).toBe(gbp(afterCash.toFixed(2)));
      await panel.getByRole('button', { name: /Issue the tax invoice/ }).click();
      await panel.getByText(/Invoice INV-\d{5} issued/).waitFor();
      await screenshot(page, 'accounts-staff-panel');

      // The owed list has it, in the youngest bucket.
      await page.getByRole('link', { name: 'Owed to us' }).click();
      const row = page.getByRole('row', { name: new RegExp(`Isolde Marchbanks`) });
      await row.first().waitFor();
      expect(await row.first().textContent()).toContain(gbp(afterCash.toFixed(2)));
      expect(await row.first().textContent()).toContain('0–30 days');
      await screenshot(page, 'accounts-owed');
      expect(errors).toEqual([]);

      // The customer pays the rest by card from their quote page.
      const customer = await suite.browser.newContext({ viewport: { width: 390, height: 844 } });
      const phone = await customer.newPage();
      const customerErrors = watchConsole(phone);
      await phone.goto(link);
      const box = phone.getByTestId('public-balance');
      await box.waitFor();
      expect(await box.getByTestId('balance-owed').textContent()).toBe(gbp(afterCash.toFixed(2)));
      expect(await box.textContent()).not.toMatch(/margin|overhead|per hour/i);
      await box.getByRole('button', { name: /Pay the balance of/ }).click();
      await phone.waitForURL((u) => u.href.startsWith(suite.server.services!.payments!.url));
      expect(await phone.locator('.amount').textContent()).toBe(gbp(afterCash.toFixed(2)));
      await phone.getByRole('button', { name: /^Pay / }).click();
      await phone.waitForURL((u) => u.href.startsWith(`${link}?balance=paid`));
      await box.getByText('Nothing more to pay. Thank you.').waitFor();
      await screenshot(phone, 'accounts-customer-settled');
      expect(customerErrors).toEqual([]);
      await customer.close();

      // The PDFs: the invoice with the deposit and cash deducted; the last receipt for the card payment.
      const after = (await sales.agent.get(`/api/accounts/quotes/${q.body.id}`).expect(200)).body as AccountDto;
      expect(after.figures).toMatchObject({ agreedTotal, balance: '0.00' });
      const invoice = after.documents.find((d) => d.kind === 'invoice')!;
      const lastReceipt = after.documents.filter((d) => d.kind === 'receipt').at(-1)!;
      const invoiceText = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/accounts/documents/${invoice.id}/pdf`)).body()));
      for (const s of [`Tax invoice ${invoice.number}`, gbp(agreedTotal), gbp(deposit), gbp('100.00'), 'Balance due', gbp(afterCash.toFixed(2))]) expect(invoiceText).toContain(s);
      const receiptText = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/accounts/documents/${lastReceipt.id}/pdf`)).body()));
      expect(receiptText).toContain(`Receipt ${lastReceipt.number}`);
      expect(receiptText).toContain(gbp(afterCash.toFixed(2)));
      expect(receiptText).toMatch(/Still to pay £0\.00/);
      await staff.close();
    } finally {
      await put(owner, '/api/accounts/settings', { invoiceStage: stage });
    }
  });
});
