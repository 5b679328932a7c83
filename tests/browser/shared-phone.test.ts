// One phone, two accounts: records one person left unsent are never shown to, nor sent under,
// the next person who signs in; that person can sign out again or discard them.
import { describe, expect, it } from 'vitest';
import { createTeam, signedInAgent } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { vehicleWithPoints } from '../support/sync';
import { TestSessionModel } from '../../server/models';

const h = browserHarness();

describe('a phone shared by two accounts', () => {
  it("keeps one account's unsent records away from the next, until discarded on purpose", async () => {
    const first = await createTeam('First workshop');
    const second = await createTeam('Second workshop');
    await vehicleWithPoints(await signedInAgent(h.ts, first.members.tester.email), ['A', 'B']);

    const context = await h.browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true });
    const page = await context.newPage();
    const signIn = (email: string) => h.signIn(page, email);

    // The first tester records a session while pushes fail: it stays on the phone, unsent.
    await signIn(first.members.tester.email);
    await page.getByText('All saved on the server').waitFor();
    await page.route('**/api/sync/push', (route) => route.abort());
    await page.getByRole('link', { name: 'Start a session' }).click();
    await page.getByLabel('Vehicle', { exact: true }).selectOption({ label: 'Test truck' });
    await page.getByLabel('Title', { exact: true }).fill('Unsent yard test');
    for (const box of await page.getByRole('checkbox').all()) await box.check();
    await page.getByRole('button', { name: 'Start session' }).click();
    await page.waitForURL(/\/field\/sessions\/[0-9a-f-]{36}$/);
    const sessionId = page.url().split('/').pop()!;
    await page.getByText(/Waiting to send/).waitFor();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL('**/sign-in');
    await page.unroute('**/api/sync/push');

    // The second tester, of another workshop, is told and shown nothing of it.
    await signIn(second.members.tester.email);
    await page.getByRole('heading', { name: 'Unsent records of another account' }).waitFor();
    expect(await page.getByText(first.members.tester.email).count()).toBe(1);
    expect(await page.getByText('Unsent yard test').count()).toBe(0);
    // Nothing was sent under the second account, to either workshop.
    await page.waitForTimeout(1500);
    expect(await TestSessionModel.count({ where: { id: sessionId } })).toBe(0);

    // Discarding is explicit; afterwards the phone is the second tester's, and empty of the first's.
    page.once('dialog', (d) => void d.accept());
    await page.getByRole('button', { name: 'Discard them' }).click();
    await page.getByText('All saved on the server').waitFor();
    await page.goto(h.ts.baseUrl + '/field');
    await page.getByRole('link', { name: 'Start a session' }).waitFor();
    expect(await page.getByText('Unsent yard test').count()).toBe(0);
    expect(await TestSessionModel.count({ where: { id: sessionId } })).toBe(0);
    await context.close();
  });
});
