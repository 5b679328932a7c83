// Plain words where a slip costs something, in a real browser on the demo workshop: an admin's role
// change asks first and says when it is saved (and stands after a reload), the workshop's default
// units reach a member who chose none, an unknown address is an app page with a way back, and a
// viewer sees no field actions.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { clientDir, startTestServer, type TestServer } from '../support/test-app';
import { launchBrowser } from '../support/browser';
import { seedDemo, DEMO_PASSWORD, DEMO_PEOPLE } from '../../server/seed/demo';

let ts: TestServer;
let browser: Browser;
beforeAll(async () => {
  ts = await startTestServer({ clientDir });
  await seedDemo();
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await ts?.close();
});

async function signIn(page: Page, email: string) {
  await page.goto(ts.baseUrl + '/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

describe('plain words at the desk', () => {
  it('asks before a role change, says it is saved, and the team page shows it after a reload', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, DEMO_PEOPLE[0].email);
    await page.getByRole('link', { name: 'Team' }).click();
    const role = page.getByLabel('Role of Joss Harl');
    await role.selectOption('engineer');
    const confirm = page.getByRole('group', { name: 'Confirm the role of Joss Harl' });
    await confirm.getByText(/Change Joss Harl from tester to engineer\?/).waitFor();
    await confirm.getByRole('button', { name: 'Cancel' }).click();
    await expect.poll(() => role.inputValue(), { timeout: 10_000 }).toBe('tester');
    await confirm.waitFor({ state: 'detached' });
    await role.selectOption('engineer');
    await confirm.getByRole('button', { name: 'Change role' }).click();
    await page.getByText('Saved: Joss Harl is now an engineer.').waitFor();
    await page.reload();
    // A loaded machine may take more than a second to bring the page back after the reload.
    await expect.poll(() => page.getByLabel('Role of Joss Harl').inputValue(), { timeout: 15_000 }).toBe('engineer');

    // The workshop's default units: a member who chose none sees inches at once.
    await page.getByRole('radio', { name: /^Inches \(in\)/ }).click();
    await page.getByText('Saved: the workshop now works in inches.').waitFor();
    const member = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(member, DEMO_PEOPLE[1].email);
    await member.locator('a[href^="/desk/sessions/"]').filter({ hasText: 'Yard flex test before boot order' }).click();
    await member.getByText(/Readings \(in\)/).waitFor();
    await member.close();
    await page.getByRole('radio', { name: /^Millimetres \(mm\)/ }).click();
    await page.getByText('Saved: the workshop now works in millimetres.').waitFor();

    // An unknown address: an app page with the header and a way back.
    await page.goto(ts.baseUrl + '/desk/nowhere/at-all');
    await page.getByRole('heading', { name: 'There is no page here' }).waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Desk' }).waitFor();
    expect(await page.getByText(/Hey developer|Unexpected Application Error/).count()).toBe(0);
    await page.getByRole('link', { name: 'Back to the start' }).click();
    await page.waitForURL('**/desk');
    await page.close();
  });

  it('shows a viewer no field actions', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, DEMO_PEOPLE[3].email);
    await page.getByRole('heading', { name: 'Signed-off envelopes' }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.getByRole('link', { name: 'Field' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: /Start a session/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Sync/ }).count()).toBe(0);
    await page.close();
  });
});
