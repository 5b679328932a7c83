// The newcomer's path in a real browser, e-mail included: sign up a workshop, follow the
// confirmation link from the development mailbox, invite a teammate as a tester, follow the
// invitation from the mailbox, join, and sign in again as that teammate with the tester's role.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import type { Page } from 'playwright-core';
import { screenshotDir, browserHarness } from '../support/browser';
import { waitForMail } from '../support/mail';

const h = browserHarness();

const shot = (page: Page, name: string) => page.screenshot({ path: path.join(screenshotDir(), `invite-flow-${name}.png`), fullPage: true });

/** A phone as a person holds it: the "works offline now" notice is dismissed when it shows up. */
async function newPhone(): Promise<Page> {
  const page = await h.browser.newPage({ viewport: { width: 390, height: 844 } });
  const notice = page.getByRole('status').filter({ hasText: 'works offline on this device' });
  await page.addLocatorHandler(notice, async () => {
    await notice.getByRole('button', { name: 'OK' }).click();
  });
  return page;
}

/** Open the mailbox page and follow the link of the newest message to `to` whose subject matches. */
async function followFromMailbox(page: Page, to: string, subject: RegExp, linkPath: string) {
  await waitForMail(h.ts, to, subject);
  await page.goto(`${h.ts.baseUrl}/dev/mailbox`);
  const message = page
    .locator('li')
    .filter({ hasText: to })
    .filter({ has: page.locator('h2', { hasText: subject }) })
    .first();
  await message.waitFor();
  await message.getByRole('link', { name: new RegExp(linkPath) }).click();
  await page.waitForURL(`**${linkPath}**`);
}

describe('a newcomer', () => {
  it('signs up, invites a teammate by e-mail, and the teammate joins and signs in with the right role', async () => {
    const tag = randomUUID().slice(0, 8);
    const founder = { email: `founder-${tag}@camper.test`, password: 'ridge line passphrase' };
    const teammate = { email: `tester-${tag}@camper.test`, name: 'Oda Tarrant', password: 'mud season passphrase' };
    const page = await newPhone();

    // Sign up from the sign-in page.
    await page.goto(`${h.ts.baseUrl}/sign-in`);
    await page.getByRole('link', { name: 'New workshop? Create an account' }).click();
    await page.getByLabel('Workshop name').fill('Quarry Lane Campers');
    await page.getByLabel('Your name').fill('Bram Oakes');
    await page.getByLabel('E-mail').fill(founder.email);
    await page.getByLabel('Password').fill(founder.password);
    await shot(page, '1-sign-up');
    await page.getByRole('button', { name: 'Create workshop' }).click();
    await page.getByRole('heading', { name: 'Check your e-mail' }).waitFor();
    await shot(page, '2-check-mail');
    await waitForMail(h.ts, founder.email, /Confirm your e-mail/);

    // The mailbox page is linked from there; follow the confirmation link.
    await page.getByRole('link', { name: 'open the development mailbox' }).click();
    await page.waitForURL('**/dev/mailbox');
    await shot(page, '3-mailbox');
    await followFromMailbox(page, founder.email, /Confirm your e-mail/, '/sign-up/confirm/');
    await page.getByRole('button', { name: 'Create my workshop' }).click();
    await page.waitForURL('**/desk');
    await expect.poll(() => page.locator('header').innerText()).toContain('admin');

    // Invite a teammate as a tester from the Team page.
    await page.getByRole('link', { name: 'Team' }).click();
    await page.waitForURL('**/team');
    await page.getByLabel('E-mail address').fill(teammate.email);
    await page.getByLabel('Role', { exact: true }).selectOption('tester');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText(`Invitation sent to ${teammate.email}`).waitFor();
    await page.getByRole('button', { name: `Revoke the invitation of ${teammate.email}` }).waitFor();
    await shot(page, '4-team');
    await waitForMail(h.ts, teammate.email, /invited you/);

    // The founder signs out; the teammate follows the invitation from the mailbox.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/sign-in');
    await followFromMailbox(page, teammate.email, /invited you to Quarry Lane Campers/, '/invite/');
    await page.getByRole('heading', { name: 'Join Quarry Lane Campers' }).waitFor();
    await page.getByLabel('Your name').fill(teammate.name);
    await page.getByLabel('Choose a password').fill(teammate.password);
    await shot(page, '5-accept');
    await page.getByRole('button', { name: 'Join workshop' }).click();
    await page.waitForURL('**/field');
    await expect.poll(() => page.locator('header').innerText()).toContain(`${teammate.name} · tester · Quarry Lane Campers`);
    // A tester manages no team: no Team link.
    expect(await page.getByRole('link', { name: 'Team' }).count()).toBe(0);

    // The invitation link works once.
    const used = await newPhone();
    await followFromMailbox(used, teammate.email, /invited you/, '/invite/');
    await used.getByRole('alert').filter({ hasText: 'not valid any more' }).waitFor();
    await used.close();

    // Sign out, and sign in again as the teammate with the chosen password.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/sign-in');
    await page.getByLabel('E-mail').fill(teammate.email);
    await page.getByLabel('Password').fill(teammate.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/field');
    await expect.poll(() => page.locator('header').innerText()).toContain(`${teammate.name} · tester`);
    await shot(page, '6-teammate');

    // The server agrees, whatever the screen shows.
    const me = await page.evaluate(() => fetch('/api/me').then((r) => r.json()));
    expect(me).toMatchObject({ role: 'tester', user: { email: teammate.email, name: teammate.name }, team: { name: 'Quarry Lane Campers' } });
    const denied = await page.evaluate(() => fetch('/api/team/invitations').then((r) => r.status));
    expect(denied).toBe(403);
    await page.close();
  });

  it('resets a forgotten password through the e-mailed link', async () => {
    const tag = randomUUID().slice(0, 8);
    const email = `forgetful-${tag}@camper.test`;
    const page = await newPhone();
    // An account made through sign-up in the API, to keep this test about the reset screens.
    await page.goto(`${h.ts.baseUrl}/sign-up`);
    await page.getByLabel('Workshop name').fill('Reset Works');
    await page.getByLabel('Your name').fill('Ivo Penn');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill('first passphrase here');
    await page.getByRole('button', { name: 'Create workshop' }).click();
    await page.getByRole('heading', { name: 'Check your e-mail' }).waitFor();
    await followFromMailbox(page, email, /Confirm your e-mail/, '/sign-up/confirm/');
    await page.getByRole('button', { name: 'Create my workshop' }).click();
    await page.waitForURL('**/desk');
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/sign-in');

    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await page.getByRole('heading', { name: 'Check your e-mail' }).waitFor();
    await waitForMail(h.ts, email, /Reset your Twistlog password/);
    await followFromMailbox(page, email, /Reset your Twistlog password/, '/reset-password/');
    await page.getByLabel('New password', { exact: true }).fill('second passphrase here');
    await page.getByLabel('Repeat the new password').fill('second passphrase here');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.waitForURL('**/desk');
    await expect.poll(() => page.locator('header').innerText()).toContain('Ivo Penn · admin');

    // Account page: units and the sign-out of all devices.
    await page.getByRole('link', { name: 'Account' }).click();
    await page.getByLabel('Inches (in)').check();
    await expect
      .poll(() =>
        page.evaluate(() =>
          fetch('/api/me')
            .then((r) => r.json())
            .then((m) => m.user.unitSystem),
        ),
      )
      .toBe('in');
    await shot(page, '7-account');
    await page.getByRole('button', { name: 'Sign out of all devices' }).click();
    await page.waitForURL('**/sign-in');
    expect(await page.evaluate(() => fetch('/api/me').then((r) => r.status))).toBe(401);
    await page.close();
  });
});
