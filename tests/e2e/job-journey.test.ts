/**
 * The rest of the job in a real browser, from a paid deposit to a settled invoice: the owner books the job (the
 * customer is e-mailed the dates), marks the piece arrived and its first session done, adds extra work found once the
 * old finish is off and sends it; the customer approves it on its own signed page; the work is finished, the piece is
 * marked ready (the customer is told), the tax invoice is issued from the account panel with the variation on it, a
 * reminder of the balance goes from the owed list, and the customer pays the balance by card on the payment stand-in
 * from their quote page. The invoice and the last receipt are read back as text. Everything the test relies on it
 * makes itself through the API first.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import type { AccountDto } from '../../shared/schemas/accounts';
import type { JobDetail } from '../../shared/schemas/planning';
import { nowLocal } from '../../shared/time';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail, getTestApp, signInAs, type Session } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';

const suite = browserSuite({ services: true });

const CUSTOMER = 'Perpetua Wrenfield-Oakes';
const EMAIL = `perpetua.wrenfield.${process.pid}@example.com`;
const VARIATION = 'Re-lay the lifting veneer on the fall';
const VARIATION_PRICE = '145.00';

const post = (s: Session, url: string, body: object) => s.agent.post(url).set('x-csrf-token', s.csrf).send(body);
const gbp = (amount: string) => new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(Number(amount));
const cents = (amount: string) => Math.round(Number(amount) * 100);

function pdfText(pdf: Buffer): string {
  const file = path.join(os.tmpdir(), `job-journey-e2e-${process.pid}-${Date.now()}-${Math.random()}.pdf`);
  fs.writeFileSync(file, pdf);
  try {
    return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
  } finally {
    fs.rmSync(file, { force: true });
  }
}

/** A caught e-mail as plain text: quoted-printable soft breaks joined and escapes decoded (UTF-8). */
function mailText(raw: string): string {
  const joined = raw.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < joined.length; i++) {
    const hex = joined[i] === '=' ? /^[0-9A-F]{2}/.exec(joined.slice(i + 1, i + 3)) : null;
    if (hex) {
      bytes.push(parseInt(hex[0], 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(joined[i]!, 'utf8'));
    }
  }
  return Buffer.from(bytes).toString('utf8').replace(/\s+/g, ' ');
}

/** The texts of the e-mails the customer has been sent so far. */
const mailsToCustomer = () =>
  suite.server.services!.mail!.messages.filter((m) => m.to.includes(EMAIL)).map((m) => mailText(m.raw));

async function signIn(page: Page, role: 'owner'): Promise<void> {
  await page.goto(`${suite.server.baseUrl}/signin`);
  await page.getByLabel('E-mail').fill(demoEmail(role));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('current-role').waitFor();
}

describe('the rest of the job, from a paid deposit to a settled invoice', () => {
  it('booking message, progress, a variation the customer approves, ready message, the balance paid by card, the PDFs', { timeout: 420_000 }, async () => {
    const { app } = getTestApp();
    const [sales, estimator, owner] = await Promise.all([signInAs(app, 'sales'), signInAs(app, 'estimator'), signInAs(app, 'owner')]);

    // Set-up through the API (the quote's own journey is the quotes and agreement tests'): a customer of our own, a
    // priced estimate, a quote sent, accepted and its deposit paid on the payment stand-in, and the job made from it.
    const c = await post(sales, '/api/customers', { name: CUSTOMER, email: EMAIL }).expect(201);
    const p = await post(estimator, '/api/pieces', { customerId: c.body.id, kind: 'furniture', description: 'Rosewood bureau with a fall front' }).expect(201);
    const input = { piece: { template: 'cabinet', dimensions: { height: '105 cm', width: '95 cm', depth: '50 cm' }, species: 'rosewood', veneered: true }, system: 'full-repolish' };
    const e = await post(estimator, '/api/estimates', { customerId: c.body.id, pieceId: p.body.id, input }).expect(201);
    await post(estimator, `/api/estimates/${e.body.id}/state`, { state: 'priced' }).expect(200);
    const q = await post(sales, `/api/estimates/${e.body.id}/quotes`, { depositPct: 30 }).expect(201);
    const sent = await post(sales, `/api/quotes/${q.body.id}/send`, {}).expect(200);
    const link: string = sent.body.link;
    const token = link.split('/q/')[1]!;
    await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: CUSTOMER, acceptTerms: true, extras: [] }).expect(200);
    const checkout = await request(app).post(`/api/public/quotes/${token}/deposit`).send({}).expect(200);
    await suite.server.services!.payments!.pay(String(checkout.body.url).split('/checkout/')[1]!);
    const account = async () => (await sales.agent.get(`/api/accounts/quotes/${q.body.id}`).expect(200)).body as AccountDto;
    await expect.poll(async () => (await account()).documents.map((d) => d.kind)).toEqual(['receipt']);
    const { agreedTotal: quotedTotal, paid: deposit } = (await account()).figures;
    const job = await post(owner, '/api/jobs', { quoteId: q.body.id }).expect(201);
    const jobId = job.body.id as number;
    const jobUrl = `${suite.server.baseUrl}/planning/jobs/${jobId}`;

    const staff = await suite.browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await staff.newPage();
    const errors = watchConsole(page);
    await signIn(page, 'owner');

    // 1. The owner books the job at its earliest start; the customer is e-mailed the dates through the queue.
    await page.goto(jobUrl);
    await page.getByRole('heading', { level: 1, name: /^JOB-\d{4}-\d{4} · / }).waitFor();
    await page.getByRole('button', { name: 'Find the earliest start' }).click();
    const consequences = page.getByRole('region', { name: 'Consequences' });
    await consequences.getByRole('button', { name: /^Book from / }).click();
    await page.getByRole('status').filter({ hasText: /JOB-\d{4}-\d{4} booked/ }).waitFor();
    await expect.poll(() => page.locator('[data-state="booked"]').first().textContent()).toBe('Booked');
    await expect.poll(() => mailsToCustomer().filter((m) => m.includes(`(quote ${q.body.number as string}) is booked:`)).length).toBe(1);
    const booking = mailsToCustomer().find((m) => m.includes('is booked:'))!;
    expect(booking).toMatch(/Subject: Dates for your /);
    expect(booking).toMatch(/flammable/i);
    await screenshot(page, 'job-journey-01-booked');

    // 2. Progress: the piece arrives and its first session is marked done.
    await page.getByRole('button', { name: 'The piece has arrived' }).click();
    await expect.poll(() => page.getByTestId('job-custody').textContent()).toMatch(/^The piece is in the workshop/);
    await page.getByRole('button', { name: 'Mark done' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Notes').fill('Old finish stripped; the veneer on the fall is lifting along the lower edge.');
    await dialog.getByRole('button', { name: 'Mark done' }).click();
    await dialog.getByText(/ is done$/).waitFor();
    await dialog.getByRole('button', { name: 'OK', exact: true }).click();
    await expect.poll(() => page.getByRole('cell', { name: 'Done', exact: true }).count()).toBe(1);
    await expect.poll(() => page.locator('[data-state="in-progress"]').first().textContent()).toBe('In progress');
    const before = (await owner.agent.get(`/api/jobs/${jobId}`).expect(200)).body as JobDetail;
    await screenshot(page, 'job-journey-02-progress');

    // 3. Work found once the old finish is off: a variation priced by hand, added and sent from the job page.
    const variations = page.getByTestId('job-variations');
    await page.getByLabel('What the work is').fill(VARIATION);
    await page.getByLabel("Why, in the customer's words").fill('Once the old polish was off, the veneer on the fall proved loose along its lower edge; it is glued down before the new finish.');
    await page.getByLabel('Price, tax included').fill(VARIATION_PRICE);
    await page.getByLabel('Hands-on hours it adds (h)').fill('3');
    await page.getByRole('button', { name: 'Add variation' }).click();
    const row = variations.getByRole('row').filter({ hasText: VARIATION });
    await expect.poll(() => row.textContent()).toContain('Not sent yet');
    expect(await row.textContent()).toContain(gbp(VARIATION_PRICE));
    await row.getByRole('button', { name: 'Send' }).click();
    const variationLink = (await page.getByTestId('variation-link').textContent())!;
    expect(variationLink).toMatch(new RegExp(`^${suite.server.baseUrl}/v/`));
    await expect.poll(() => row.textContent()).toContain('Waiting for the customer');
    await screenshot(page, 'job-journey-03-variation-sent');

    // 4. The customer approves it on its signed page, in a browser of their own.
    const customer = await suite.browser.newContext({ viewport: { width: 390, height: 844 } });
    const phone = await customer.newPage();
    const customerErrors = watchConsole(phone);
    await phone.goto(variationLink);
    const proposal = phone.getByTestId('public-variation');
    await proposal.getByRole('heading', { level: 1, name: VARIATION }).waitFor();
    expect(await proposal.getByTestId('variation-price').textContent()).toBe(gbp(VARIATION_PRICE));
    expect(await proposal.textContent()).toMatch(/flammable/i);
    expect(await proposal.textContent()).not.toMatch(/margin|overhead|per hour|hours/i);
    await proposal.getByRole('button', { name: 'Approve the extra work' }).click();
    await proposal.getByTestId('variation-answered').getByText(/^Approved/).waitFor();
    await screenshot(phone, 'job-journey-04-variation-approved');

    // The staff page follows: approved, its hours added as sessions, the agreed total grown by its price.
    await page.reload();
    await expect.poll(() => row.textContent()).toContain('Approved');
    const agreedTotal = ((cents(quotedTotal) + cents(VARIATION_PRICE)) / 100).toFixed(2);
    await expect.poll(() => page.locator('[data-fact="Agreed total"] dd').textContent()).toBe(gbp(agreedTotal));
    expect(await page.locator('[data-fact="Balance due on collection"] dd').textContent()).toBe(gbp(((cents(agreedTotal) - cents(deposit)) / 100).toFixed(2)));
    const after = (await owner.agent.get(`/api/jobs/${jobId}`).expect(200)).body as JobDetail;
    expect(after.sessionsTotal).toBeGreaterThan(before.sessionsTotal);
    expect((await account()).figures.agreedTotal).toBe(agreedTotal);

    // 5. The rest of the work. The dialog was used once above; the remaining sessions (the variation's among them)
    // are marked done through the API, each finishing now at the latest, in the order the board requires.
    for (const s of after.sessions.filter((x) => !x.done)) {
      const now = nowLocal();
      await post(owner, `/api/jobs/${jobId}/sessions/${s.id}/done`, {
        actualEnd: s.end && s.end < now ? s.end : now,
        actualHours: s.handsOnHours,
        temperatureC: 19,
        humidityPct: 55,
        notes: `${s.label}: done as planned.`,
      }).expect(200);
    }
    await page.reload();
    await expect.poll(() => page.locator('[data-state="finished"]').first().textContent()).toBe('Finished');

    // 6. The piece is marked ready; the customer is told through the message queue.
    await page.getByRole('button', { name: 'Mark ready' }).click();
    await expect.poll(() => page.getByTestId('job-custody').textContent()).toMatch(/^The piece is ready/);
    await expect.poll(() => mailsToCustomer().filter((m) => m.includes('ready for collection or delivery')).length).toBe(1);
    expect(mailsToCustomer().find((m) => m.includes('ready for collection or delivery'))).toMatch(/Subject: Your .* is ready/);
    await screenshot(page, 'job-journey-05-ready');
    // Both messages are on the customer's record, sent.
    await expect
      .poll(async () => ((await owner.agent.get(`/api/messages/customers/${c.body.id}`).expect(200)).body.rows as { kind: string | null; status: string }[]).filter((m) => (m.kind === 'booking' || m.kind === 'ready') && m.status === 'sent').length)
      .toBe(2);

    // 7. The tax invoice, from the account panel (the job is finished, so the default stage allows it).
    await page.getByRole('link', { name: 'account', exact: true }).click();
    const panel = page.getByTestId('account-panel');
    await panel.waitFor();
    const balance = ((cents(agreedTotal) - cents(deposit)) / 100).toFixed(2);
    await expect.poll(() => panel.getByTestId('account-balance').textContent()).toBe(gbp(balance));
    await panel.getByRole('button', { name: `Issue the tax invoice for ${gbp(agreedTotal)}` }).click();
    await panel.getByText(/Invoice INV-\d{5} issued/).waitFor();
    await screenshot(page, 'job-journey-06-invoiced');

    // The invoice is on the owed list; a reminder sent from there reaches the customer through the queue.
    const balanceMails = () => mailsToCustomer().filter((m) => m.includes('The balance still to pay is')).length;
    await expect.poll(balanceMails).toBe(1); // the invoice's own e-mail carries the balance-due text
    await page.getByRole('link', { name: 'Owed to us' }).click();
    const owedRow = page.getByRole('row').filter({ hasText: CUSTOMER });
    await expect.poll(() => owedRow.count()).toBe(1);
    expect(await owedRow.textContent()).toContain(gbp(balance));
    await owedRow.getByRole('button', { name: /^Send a reminder/ }).click();
    await owedRow.getByRole('status').getByText(`Reminder queued to ${EMAIL}`).waitFor();
    await expect.poll(balanceMails).toBe(2);
    await screenshot(page, 'job-journey-06b-reminded');

    // 8. The customer pays the balance by card from their quote page, which shows where the piece is.
    await phone.goto(link);
    await phone.getByTestId('public-job-where').waitFor();
    expect(await phone.getByTestId('public-job-where').textContent()).toMatch(/ready/i);
    const box = phone.getByTestId('public-balance');
    await box.waitFor();
    expect(await box.getByTestId('balance-owed').textContent()).toBe(gbp(balance));
    await box.getByRole('button', { name: /Pay the balance of/ }).click();
    await phone.waitForURL((u) => u.href.startsWith(suite.server.services!.payments!.url));
    expect(await phone.locator('.amount').textContent()).toBe(gbp(balance));
    await phone.getByRole('button', { name: /^Pay / }).click();
    await phone.waitForURL((u) => u.href.startsWith(`${link}?balance=paid`));
    await box.getByText('Nothing more to pay. Thank you.').waitFor();
    await screenshot(phone, 'job-journey-07-customer-settled');
    expect(customerErrors).toEqual([]);
    await customer.close();

    // 9. The PDFs read as text: the invoice with the variation on it, the card receipt leaving nothing to pay.
    const settled = await account();
    expect(settled.figures).toMatchObject({ agreedTotal, balance: '0.00' });
    const invoice = settled.documents.find((d) => d.kind === 'invoice')!;
    const lastReceipt = settled.documents.filter((d) => d.kind === 'receipt').at(-1)!;
    const invoiceText = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/accounts/documents/${invoice.id}/pdf`)).body()));
    for (const s of [`Tax invoice ${invoice.number}`, CUSTOMER, `Variation: ${VARIATION}`, gbp(VARIATION_PRICE), gbp(agreedTotal), gbp(deposit), 'Balance due', gbp(balance)]) expect(invoiceText).toContain(s);
    expect(invoiceText).toMatch(/flammable/i);
    const receiptText = pdfText(Buffer.from(await (await page.request.get(`${suite.server.baseUrl}/api/accounts/documents/${lastReceipt.id}/pdf`)).body()));
    expect(receiptText).toContain(`Receipt ${lastReceipt.number}`);
    expect(receiptText).toContain(gbp(balance));
    expect(receiptText).toMatch(/Still to pay £0\.00/);

    // The staff panel agrees: nothing owed.
    await page.goto(`${suite.server.baseUrl}/accounts/quotes/${q.body.id as number}`);
    await expect.poll(() => panel.getByTestId('account-balance').textContent()).toBe(gbp('0'));
    await screenshot(page, 'job-journey-08-settled');
    expect(errors).toEqual([]);
    await staff.close();
  });
});
