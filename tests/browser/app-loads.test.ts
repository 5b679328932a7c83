// The built app in a real browser: sign in with the demo engineer and find the demo session.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { screenshotDir, browserHarness } from '../support/browser';
import { DEMO_SIGN_IN } from '../../server/seed/demo';

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
});
