// The built app in a real browser: sign in with the demo engineer and find the demo session.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { screenshotDir, browserHarness } from '../support/browser';
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_SIGN_IN } from '../../server/seed/demo';
import { MembershipModel } from '../../server/models';

const h = browserHarness({ seedDemo: true });

describe('the built app', () => {
  it('loads, signs in the demo engineer and shows the demo session readings', async () => {
    const page = await h.browser.newPage({ viewport: { width: 390, height: 844 } });
    await page.goto(h.ts.baseUrl + '/');
    await page.waitForURL('**/sign-in');
    await page.getByLabel('E-mail').fill(DEMO_SIGN_IN.email);
    await page.getByLabel('Password').fill(DEMO_SIGN_IN.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL('**/desk');
    await page.getByRole('link', { name: 'TC-14 "Mossback"', exact: true }).first().waitFor();
    await page.locator('a[href^="/desk/sessions/"]').filter({ hasText: 'Yard flex test before boot order' }).click();
    await page.getByRole('table').waitFor();
    expect(await page.getByRole('row').count()).toBeGreaterThan(7);
    await page.screenshot({ path: path.join(screenshotDir(), 'session.png'), fullPage: true });
    const font = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(font).toMatch(/Atkinson Hyperlegible/);
    await page.close();
  });

  // Signing in goes to the person's start page in one step. Through '/' and its redirect, a tap
  // on a menu link made in between could be undone by the redirect landing after it.
  it('signs each person in straight to their start page, never by way of /', async () => {
    // The demo's roles as seeded: another file of the run may have made the tester an engineer.
    for (const p of DEMO_PEOPLE) await MembershipModel.update({ role: p.role }, { where: { userId: p.id } });
    for (const [who, start] of [
      [DEMO_PEOPLE.find((p) => p.role === 'engineer')!, '/desk'],
      [DEMO_PEOPLE.find((p) => p.role === 'tester')!, '/field'],
    ] as const) {
      const context = await h.browser.newContext({ viewport: { width: 390, height: 844 } });
      const page = await context.newPage();
      // Every address the page's history takes, in order, as the app changes it.
      await page.addInitScript(() => {
        const seen: string[] = [];
        (window as unknown as { __paths: string[] }).__paths = seen;
        for (const method of ['pushState', 'replaceState'] as const) {
          const original = history[method].bind(history);
          history[method] = (data: unknown, unused: string, url?: string | URL | null) => {
            original(data, unused, url);
            seen.push(location.pathname);
          };
        }
      });
      await page.goto(h.ts.baseUrl + '/sign-in');
      await page.getByLabel('E-mail').fill(who.email);
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      // What the router did on loading the sign-in page is not the sign-in's.
      await page.evaluate(() => ((window as unknown as { __paths: string[] }).__paths.length = 0));
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(`**${start}`);
      expect(await page.evaluate(() => (window as unknown as { __paths: string[] }).__paths)).toEqual([start]);
      await context.close();
    }
  });
});
