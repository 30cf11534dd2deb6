import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { rootDir } from '../../server/config';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';

const pdfDir = path.join(rootDir, 'tests', 'artifacts', 'pdf');

const suite = browserSuite({ services: true });

/** The customer of this file's own priced estimate: a grand in rosewood veneer with 5 % off, as the demo's first. */
const NAME = 'Araminta Coldbrook';
const EMAIL = 'araminta.coldbrook@example.com';
const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);

beforeAll(async () => {
  const { app } = getTestApp();
  const [sales, estimator] = await Promise.all([signInAs(app, 'sales'), signInAs(app, 'estimator')]);
  const c = await post(sales, '/api/customers', { name: NAME, email: EMAIL, address: '5 Orchard Rise\nHebbleton HB2 9IK' }).expect(201);
  const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'grand', description: 'Medium grand in rosewood veneer' }).expect(201);
  const input = { piece: { template: 'grand', dimensions: { length: '6 ft 3 in', width: '148 cm', rimHeight: '33 cm' }, species: 'rosewood', veneered: true }, system: 'full-repolish', discountPct: 5 };
  const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
  await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
});

async function signInAsSales(page: Page): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail('sales'));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

/** The customer's link from a raw message: quoted-printable soft line breaks removed, `=3D` read back as `=`. */
function linkFrom(raw: string): string {
  const text = raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
  const m = /https?:\/\/[^\s"'<>]+\/q\/[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+/.exec(text);
  if (!m) throw new Error('no quote link in the message');
  return m[0];
}

/** Writes a PDF to a temp file and renders its pages to PNG beside the other PDF artefacts. */
function renderPdf(pdf: Buffer, name: string): string[] {
  fs.mkdirSync(pdfDir, { recursive: true });
  for (const f of fs.readdirSync(pdfDir)) if (f.startsWith(`${name}-`)) fs.rmSync(path.join(pdfDir, f));
  const file = path.join(os.tmpdir(), `${name}-${process.pid}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    execFileSync('pdftoppm', ['-r', '60', '-png', file, path.join(pdfDir, name)]);
  } finally {
    fs.rmSync(file, { force: true });
  }
  return fs.readdirSync(pdfDir).filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'));
}

describe('quotes, from the salesperson to the customer and back, in a real browser', () => {
  it('sales prepares and sends a quote; the customer accepts with an extra and pays the deposit; sales sees it paid', async () => {
    const mail = suite.server.services!.mail!;
    const staff = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await staff.newPage();
    const errors = watchConsole(page);
    await signInAsSales(page);

    // A priced demo estimate.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Estimates' }).click();
    await page.getByLabel('State').selectOption('priced');
    await page.getByLabel('Search').fill(NAME);
    await page.getByLabel('Search').press('Enter');
    const row = page.getByRole('row').filter({ hasText: NAME });
    await expect.poll(() => row.count()).toBe(1);
    await row.getByRole('link').first().click();
    await page.getByTestId('estimate-quotes').waitFor();
    expect(await page.getByRole('link', { name: 'Customer’s view (PDF)' }).getAttribute('href')).toMatch(/^\/api\/estimates\/\d+\/quote\.pdf$/);

    // Prepare a quote with one extra.
    await page.getByRole('button', { name: 'Prepare a quote' }).click();
    const form = page.getByRole('form', { name: 'Prepare a quote' });
    await expect.poll(() => form.getByLabel('Recipient’s e-mail').inputValue()).toBe(EMAIL);
    expect(await form.getByLabel('Discount (%)').inputValue()).toBe('5');
    await form.getByLabel('Covering message').fill('Thank you for bringing the grand to us.\n\nThe figures below set out the work stage by stage.');
    await form.getByRole('button', { name: 'Add an extra' }).click();
    await form.getByLabel('Extra 1: label').fill('Regulate the action');
    await form.getByLabel('Description').fill('Key dip and let-off set by our technician');
    await form.getByLabel('Hours (h)').fill('6');
    await form.getByLabel(/^Price \(GBP/).fill('300.00');
    await screenshot(page, 'quote-form');
    await form.getByRole('button', { name: 'Prepare the quote' }).click();
    // "Prepare the quote" opens the quote it made.
    await page.waitForURL(/\/quotes\/\d+$/);
    const prepared = page.locator('main');
    await prepared.getByRole('heading', { level: 1, name: /Q-/ }).waitFor();
    expect(await prepared.getByText('Discount (5 %)').count()).toBe(1);
    expect(await prepared.getByTestId('quote-total').textContent()).toMatch(/^£[\d,]+\.\d{2}$/);
    expect(await prepared.getByText('Regulate the action').count()).toBe(1);
    const pdfHref = await prepared.getByRole('link', { name: 'PDF', exact: true }).getAttribute('href');
    expect(pdfHref).toMatch(/^\/api\/quotes\/\d+\/pdf$/);
    const quoteNumber = (await prepared.getByRole('heading', { level: 1 }).textContent())!.match(/Q-[\d-]+/)![0];
    await screenshot(page, 'quote-prepared');

    // The PDF, as the customer will receive it.
    const pdf = await page.request.get(`${suite.server.baseUrl}${pdfHref}`);
    expect(pdf.headers()['content-type']).toBe('application/pdf');
    expect(renderPdf(Buffer.from(await pdf.body()), 'quote-e2e').length).toBeGreaterThan(1);

    // Send it: the link is offered once, and the e-mail arrives with it.
    const before = mail.messages.length;
    await prepared.getByRole('button', { name: 'Send to the customer' }).click();
    await page.getByTestId('quote-link-box').waitFor();
    const shown = await page.getByLabel('Customer’s link').inputValue();
    await expect.poll(() => mail.messages.length).toBe(before + 1);
    const message = mail.messages[before]!;
    expect(message.to).toEqual([EMAIL]);
    const link = linkFrom(message.raw);
    expect(link).toBe(shown);
    await expect.poll(() => page.locator('main').getByRole('heading', { level: 1 }).locator('[data-quote-state]').textContent()).toBe('Sent');
    await screenshot(page, 'quote-sent');

    // The customer, on a phone, without signing in.
    const customer = await suite.browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 1 });
    const phone = await customer.newPage();
    const customerErrors = watchConsole(phone);
    await phone.goto(link);
    await phone.getByRole('heading', { level: 1, name: 'Medium grand in rosewood veneer' }).waitFor();
    expect(await phone.getByRole('heading', { name: 'Safety' }).count()).toBe(1);
    expect(await phone.getByText(NAME, { exact: false }).count()).toBeGreaterThan(0);
    await screenshot(phone, 'quote-public-phone');
    const accept = phone.getByRole('form', { name: 'Accept the quote' });
    const totalBefore = await accept.getByTestId('accept-total').textContent();
    await phone.getByRole('checkbox', { name: /Regulate the action/ }).check();
    await expect.poll(() => accept.getByTestId('accept-total').textContent()).not.toBe(totalBefore);
    await accept.getByRole('button', { name: /Accept for/ }).click();
    await accept.getByText('type your full name').waitFor();
    await accept.getByText('tick to accept the terms').waitFor();
    await accept.getByLabel('Your full name').fill(NAME);
    await accept.getByRole('checkbox', { name: /I have read the quote/ }).check();
    await screenshot(phone, 'quote-public-accepting');
    await accept.getByRole('button', { name: /Accept for/ }).click();
    const outcome = phone.getByTestId('outcome');
    await outcome.waitFor();
    expect(await outcome.textContent()).toMatch(new RegExp(`Accepted by ${NAME}`));
    await screenshot(phone, 'quote-public-accepted');

    // The deposit on the payment stand-in's page, then back.
    await outcome.getByRole('button', { name: /Pay the deposit/ }).click();
    await phone.waitForURL((u) => u.href.startsWith(suite.server.services!.payments!.url));
    await screenshot(phone, 'quote-payment-page');
    await phone.getByRole('button', { name: /^Pay / }).click();
    await phone.waitForURL((u) => u.href.startsWith(`${link}?deposit=paid`));
    await phone.getByTestId('deposit-paid').waitFor();
    expect(await phone.getByTestId('deposit-paid').textContent()).toMatch(/Deposit paid/);
    await screenshot(phone, 'quote-public-deposit-paid');
    expect(customerErrors).toEqual([]);

    // The same link on a wide screen, now answered.
    const wide = await suite.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const desk = await wide.newPage();
    await desk.goto(link);
    await desk.getByTestId('deposit-paid').waitFor();
    await screenshot(desk, 'quote-public-desktop');
    // A link that is not valid says so.
    await desk.goto(`${suite.server.baseUrl}/q/${link.split('/q/')[1]!.slice(0, -2)}xx`);
    await desk.getByRole('heading', { name: 'This link is not valid' }).waitFor();
    await screenshot(desk, 'quote-public-invalid');
    await wide.close();
    await customer.close();

    // Back to sales, still on the quote's page: the quote, the estimate, the list and the outbox.
    await page.reload();
    await page.getByRole('heading', { level: 1, name: new RegExp(quoteNumber) }).waitFor();
    await expect.poll(() => page.locator('h1 [data-quote-state]').textContent()).toBe('Deposit paid');
    expect(await page.getByTestId('step-accepted').textContent()).toMatch(new RegExp(`Accepted by ${NAME}`));
    expect(await page.getByTestId('step-accepted').textContent()).toMatch(/Regulate the action/);
    await page.getByTestId('step-deposit').waitFor();
    await screenshot(page, 'quote-page-paid');

    await page.getByRole('link', { name: /^EST-\d{4}-\d{4}$/ }).first().click();
    await expect.poll(() => page.locator('h1 [data-state]').textContent()).toBe('Deposit paid');
    await screenshot(page, 'quote-estimate-paid');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Estimates' }).click();
    await page.getByLabel('Search').fill(NAME);
    await page.getByLabel('Search').press('Enter');
    await expect.poll(() => page.getByRole('row').filter({ hasText: NAME }).locator('[data-state]').textContent()).toBe('Deposit paid');
    await expect.poll(() => page.getByRole('row').filter({ hasText: NAME }).getByText(/^deposit paid /).count()).toBe(1);
    await screenshot(page, 'quote-estimates-list');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Quotes' }).click();
    await page.getByTestId('pipeline-deposit-paid').waitFor();
    await page.locator('.recharts-bar-rectangle').first().waitFor();
    await expect.poll(() => page.getByRole('row').filter({ hasText: quoteNumber }).locator('[data-quote-state]').textContent()).toBe('Deposit paid');
    await screenshot(page, 'quotes-list');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click();
    // The quote's own e-mail (the acceptance confirmation names the quote too, and comes after it).
    const sent = page.getByRole('row').filter({ hasText: `Quote ${quoteNumber}` }).last();
    await expect.poll(() => sent.locator('[data-status]').textContent()).toBe('Sent');
    await screenshot(page, 'outbox-list');
    await sent.getByRole('button').first().click();
    const dialog = page.getByRole('dialog');
    await dialog.getByTestId('outbox-message').waitFor();
    const frame = dialog.locator('iframe');
    expect(await frame.getAttribute('sandbox')).toBe('');
    expect(await dialog.getByRole('link', { name: `${quoteNumber}.pdf` }).getAttribute('href')).toMatch(/^\/api\/outbox\/\d+\/attachment$/);
    await expect.poll(() => frame.contentFrame().getByText(new RegExp(`Dear ${NAME}`)).count()).toBe(1);
    await screenshot(page, 'outbox-message');
    await dialog.getByRole('tab', { name: 'Plain text' }).click();
    expect(await dialog.locator('pre').textContent()).toContain(link);

    expect(errors).toEqual([]);
    await staff.close();
  });
});
