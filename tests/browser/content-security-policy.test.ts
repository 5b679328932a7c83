// The built app under its Content-Security-Policy, in Chromium: every screen of the field, the
// desk and the admin (with the lazily loaded charts), the service worker's registration and its
// control of the page, all without one CSP violation. Violations are caught both as the browser
// reports them in the console and as `securitypolicyviolation` events.
import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import type { Page } from 'playwright-core';
import { browserHarness } from '../support/browser';
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_TEAM_ID } from '../../server/seed/demo';

const h = browserHarness({ seedDemo: true });

/** A page that records every CSP violation, however the browser reports it. */
async function watchedPage(): Promise<{ page: Page; violations: string[] }> {
  const violations: string[] = [];
  const page = await h.browser.newPage({ viewport: { width: 1280, height: 900 } });
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      (window as unknown as { __csp?: string[] }).__csp ??= [];
      (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} blocked ${e.blockedURI || 'inline'} at ${e.sourceFile}:${e.lineNumber}`);
    });
  });
  page.on('console', (m) => {
    if (/content security policy|refused to (load|execute|apply|connect|frame|create)/i.test(m.text())) violations.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => violations.push(`page error: ${e.message}`));
  return { page, violations };
}

async function eventsOn(page: Page): Promise<string[]> {
  return page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? []);
}

async function signIn(page: Page, email: string) {
  await h.signIn(page, email, DEMO_PASSWORD);
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

describe('the built app under its Content-Security-Policy', () => {
  it('serves the policy with the shell', async () => {
    const res = await fetch(`${h.ts.baseUrl}/sign-in`);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    expect(csp).toMatch(/frame-ancestors 'none'/);
    expect(await res.text()).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('loads every screen and the service worker without a violation', async () => {
    const [session] = await h.ts.sequelize.query<{ id: string }>(`SELECT id FROM test_sessions WHERE team_id = :t ORDER BY created_at LIMIT 1`, {
      replacements: { t: DEMO_TEAM_ID },
      type: QueryTypes.SELECT,
    });
    const [pose] = await h.ts.sequelize.query<{ id: string }>(`SELECT id FROM poses WHERE session_id = :s ORDER BY seq LIMIT 1`, {
      replacements: { s: session.id },
      type: QueryTypes.SELECT,
    });
    const [envelope] = await h.ts.sequelize.query<{ id: string }>(`SELECT id FROM envelopes WHERE team_id = :t AND status = 'signed' LIMIT 1`, {
      replacements: { t: DEMO_TEAM_ID },
      type: QueryTypes.SELECT,
    });
    const admin = DEMO_PEOPLE.find((p) => p.role === 'admin')!;
    const { page, violations } = await watchedPage();
    await signIn(page, admin.email);
    // The service worker registers and takes control (it is offered by a bundled module, no inline script).
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
    const screens = [
      ['/desk', /Sessions|Desk/i],
      [`/desk/sessions/${session.id}`, /readings/i],
      [`/desk/envelopes/${envelope.id}`, /envelope/i],
      ['/desk/compare', /compare/i],
      ['/team', /Members/],
      ['/account', /account|password/i],
      ['/field', /session/i],
      [`/field/sessions/${session.id}`, /pose/i],
      [`/field/sessions/${session.id}/poses/${pose.id}`, /photo/i],
      ['/field/vehicles', /vehicle/i],
      ['/field/sync', /sync|sent|phone/i],
    ] as const;
    for (const [path, text] of screens) {
      await page.goto(`${h.ts.baseUrl}${path}`);
      await page.getByText(text).first().waitFor({ timeout: 30_000 });
      // Charts and other on-demand parts get their moment to load.
      await page.waitForLoadState('networkidle');
      violations.push(...(await eventsOn(page)).map((v) => `${path}: ${v}`));
    }
    expect(await page.evaluate(() => !!navigator.serviceWorker.controller)).toBe(true);
    expect(violations).toEqual([]);
  });
});
