/**
 * The invitation journey in a real browser: the owner invites someone from the users page, the link arrives by
 * e-mail (the local mail catcher), the invited person opens it on a phone, chooses a name and a password, and lands
 * signed in with the pages of the role they were invited to.
 */
import { describe, expect, it } from 'vitest';
import { ROLE_LABELS } from '../../shared/schemas/auth';
import { navFor } from '../../src/config/nav';
import { DEMO_PASSWORD } from '../../server/seeders/demo';
import { demoEmail } from '../helpers/app';
import { browserSuite, screenshot, watchConsole } from '../helpers/browser';

const suite = browserSuite({ services: true });

describe('inviting someone, in a real browser', () => {
  it('the owner invites by e-mail; the invitee accepts from the link and signs in with the role’s view', async () => {
    const email = `invited-${Date.now()}@example.com`;
    const owner = await suite.browser.newContext({ viewport: { width: 1280, height: 800 } });
    const op = await owner.newPage();
    const ownerErrors = watchConsole(op);
    await op.goto(`${suite.server.baseUrl}/signin`);
    await op.getByLabel('E-mail').fill(demoEmail('owner'));
    await op.getByLabel('Password').fill(DEMO_PASSWORD);
    await op.getByRole('button', { name: 'Sign in' }).click();
    await op.getByTestId('current-role').waitFor();
    await op.getByRole('link', { name: 'Users' }).click();
    const form = op.getByRole('form', { name: 'Invite someone' });
    await form.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => form.getByText('is required').count()).toBe(1);
    await form.getByLabel('E-mail').fill(email);
    await form.getByLabel('Role').selectOption('workshop');
    await form.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => form.getByText(`${email} has a link to join`).count()).toBe(1);
    const row = op.getByRole('row', { name: new RegExp(email) });
    await expect.poll(() => row.getByText('Waiting for an answer').count()).toBe(1);
    await screenshot(op, 'invitation-sent');

    const mail = () => suite.server.services!.mail!.messages.filter((m) => m.to.includes(email));
    await expect.poll(() => mail().length).toBe(1);
    const raw = mail()[0]!.raw.replace(/=\r?\n/g, '').replace(/=3D/g, '=');
    const link = /\/invite\/[A-Za-z0-9_-]+/.exec(raw)![0];

    const invitee = await suite.browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await invitee.newPage();
    const errors = watchConsole(page);
    await page.goto(`${suite.server.baseUrl}${link}`);
    await page.getByRole('heading', { level: 1, name: /^Join / }).waitFor();
    expect(await page.getByText(ROLE_LABELS.workshop, { exact: true }).count()).toBe(1);
    expect(await page.getByText(email).count()).toBe(1);
    await page.getByLabel('Choose a password').fill('short');
    await page.getByRole('button', { name: 'Accept and sign in' }).click();
    await expect.poll(() => page.getByText('must be at least 10 characters').count()).toBe(1);
    await page.getByLabel('Your name').fill('Wren Mallory');
    await page.getByLabel('Choose a password').fill('a long invited password');
    await page.getByLabel('The same password again').fill('a long invited password');
    await screenshot(page, 'invitation-accept-phone');
    await page.getByRole('button', { name: 'Accept and sign in' }).click();
    await expect.poll(() => page.getByTestId('current-role').textContent()).toBe(ROLE_LABELS.workshop);
    // On a phone the navigation folds behind the menu button.
    await page.getByRole('button', { name: 'Menu' }).click();
    const links = await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents();
    expect(links.map((l) => l.trim())).toEqual(navFor('workshop').map((n) => n.label));
    await screenshot(page, 'invitation-accepted-phone');
    expect(errors).toEqual([]);
    await invitee.close();

    // The owner's list now shows it accepted.
    await op.reload();
    await op.getByLabel('Show invitations').selectOption('');
    await expect.poll(() => op.getByRole('row', { name: new RegExp(email) }).getByText('Accepted').count()).toBe(1);
    expect(ownerErrors).toEqual([]);
    await owner.close();
  });
});
