// Accessibility of the main field and desk screens in Chromium: axe-core finds no serious or
// critical violation (WCAG 2.x A and AA rules), every control is reachable with the Tab key, and
// every touch target on a phone-sized screen is at least 44 × 44 CSS px (WCAG 2.2 SC 2.5.5 asks
// 44 px; inline links inside a sentence are exempt, as that criterion allows).
import { describe, expect, it } from 'vitest';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { browserHarness } from '../support/browser';
import { DEMO_PASSWORD, DEMO_PEOPLE, DEMO_VEHICLES } from '../../server/seed/demo';

const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js');
const DEMO_SESSION = '0d3c5a10-0000-4000-8003-000000000001';
const DEMO_POSE = '0d3c5a10-0000-4000-8004-000000000002';

const h = browserHarness({ seedDemo: true });

async function signedInPage(role: 'admin' | 'engineer' | 'tester'): Promise<Page> {
  // bypassCSP: axe is injected by this test as an inline script; the app's own policy is checked by content-security-policy.test.ts.
  const { page } = await h.open(DEMO_PEOPLE.find((p) => p.role === role)!.email, {
    viewport: { width: 390, height: 844 },
    hasTouch: true,
    bypassCSP: true,
    password: DEMO_PASSWORD,
  });
  return page;
}

interface Finding {
  id: string;
  impact: string;
  help: string;
  targets: string[];
}

async function axeFindings(page: Page): Promise<Finding[]> {
  await page.addScriptTag({ path: axePath });
  const result = await page.evaluate(async () => {
    const axe = (
      window as unknown as {
        axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string; impact: string; help: string; nodes: { target: string[] }[] }[] }> };
      }
    ).axe;
    return axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'] } });
  });
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => ({ id: v.id, impact: v.impact, help: v.help, targets: v.nodes.slice(0, 5).map((n) => n.target.join(' ')) }));
}

/** Visible controls smaller than 44 × 44 px (a checkbox or radio counts with its label). */
async function smallTargets(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const controls = document.querySelectorAll<HTMLElement>('button, a[href], input:not([type=hidden]), select, textarea, [role=button], summary');
    for (const el of controls) {
      const style = getComputedStyle(el);
      if (style.visibility === 'hidden' || style.display === 'none') continue;
      let box = el.getBoundingClientRect();
      if (box.width === 0 && box.height === 0) continue;
      // A link inside running text is exempt (WCAG 2.2 SC 2.5.8, "inline" exception).
      if (el.tagName === 'A' && style.display === 'inline' && el.closest('p, li, td, dd')) continue;
      const label = el.closest('label');
      if (label) box = label.getBoundingClientRect();
      if (box.width < 44 || box.height < 44) {
        const name = (el.getAttribute('aria-label') ?? el.textContent ?? (el as HTMLInputElement).name ?? '').trim().slice(0, 30);
        out.push(`${el.tagName.toLowerCase()} "${name}" ${Math.round(box.width)}×${Math.round(box.height)}`);
      }
    }
    return out;
  });
}

/** Controls never reached by pressing Tab through the whole page. */
async function unreachableByKeyboard(page: Page): Promise<string[]> {
  await page.evaluate(() => {
    (document.activeElement as HTMLElement | null)?.blur();
    (window as unknown as { __reached: Set<Element> }).__reached = new Set();
    document.addEventListener('focusin', (e) => (window as unknown as { __reached: Set<Element> }).__reached.add(e.target as Element), true);
  });
  const count = await page.evaluate(() => document.querySelectorAll('button, a[href], input, select, textarea, [tabindex]').length);
  for (let i = 0; i < count + 10; i++) await page.keyboard.press('Tab');
  return page.evaluate(() => {
    const reached = (window as unknown as { __reached: Set<Element> }).__reached;
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>(
      'button:not([disabled]), a[href], input:not([type=hidden]):not([disabled]), select:not([disabled]), textarea:not([disabled]), [role=button]',
    )) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 && r.height === 0) continue;
      if (getComputedStyle(el).visibility === 'hidden') continue;
      // A radio group is one Tab stop; the arrow keys move within it (WAI-ARIA Authoring Practices).
      if (el instanceof HTMLInputElement && el.type === 'radio') {
        const group = document.querySelectorAll(`input[type=radio][name="${CSS.escape(el.name)}"]`);
        if ([...group].some((r) => reached.has(r))) continue;
      }
      if (!reached.has(el)) out.push(`${el.tagName.toLowerCase()} "${(el.getAttribute('aria-label') ?? el.textContent ?? '').trim().slice(0, 30)}"`);
    }
    return out;
  });
}

async function check(page: Page, path: string, ready: (p: Page) => Promise<unknown>) {
  await page.goto(h.ts.baseUrl + path);
  await ready(page);
  // Let the first sync finish: its button is disabled while it runs, and skipped by Tab.
  await page.waitForLoadState('networkidle');
  const findings = await axeFindings(page);
  const small = await smallTargets(page);
  const unreachable = await unreachableByKeyboard(page);
  return { path, findings, small, unreachable };
}

const heading = (p: Page) => p.getByRole('heading').first().waitFor();

describe('accessibility of the main screens', () => {
  it('sign-in (signed out)', async () => {
    const page = await h.browser.newPage({ viewport: { width: 390, height: 844 }, bypassCSP: true });
    const r = await check(page, '/sign-in', heading);
    expect(r).toEqual({ path: '/sign-in', findings: [], small: [], unreachable: [] });
  });

  it('field screens (tester)', async () => {
    const page = await signedInPage('tester');
    for (const [path, ready] of [
      ['/field', heading],
      ['/field/sessions/new', heading],
      [`/field/sessions/${DEMO_SESSION}`, heading],
      [`/field/sessions/${DEMO_SESSION}/poses/${DEMO_POSE}`, heading],
    ] as const) {
      const r = await check(page, path, ready);
      expect(r).toEqual({ path, findings: [], small: [], unreachable: [] });
    }
  });

  it('desk screens (engineer)', async () => {
    const page = await signedInPage('engineer');
    const envelopes = await page.evaluate(async (id) => (await fetch(`/api/sessions/${id}/envelopes`)).json(), DEMO_SESSION);
    const envelopeId = Array.isArray(envelopes) ? envelopes[0]?.id : envelopes?.envelopes?.[0]?.id;
    const paths = [
      '/desk',
      `/desk/vehicles/${DEMO_VEHICLES[0].id}`,
      `/desk/sessions/${DEMO_SESSION}`,
      '/desk/compare',
      ...(envelopeId ? [`/desk/envelopes/${envelopeId}`] : []),
    ];
    expect(envelopeId).toBeTruthy();
    for (const path of paths) {
      const r = await check(page, path, heading);
      expect(r).toEqual({ path, findings: [], small: [], unreachable: [] });
    }
  });

  it('team and account screens (admin)', async () => {
    const page = await signedInPage('admin');
    for (const path of ['/team', '/account']) {
      const r = await check(page, path, heading);
      expect(r).toEqual({ path, findings: [], small: [], unreachable: [] });
    }
  });
});
