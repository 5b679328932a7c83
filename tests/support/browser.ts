// The one harness of the browser tests: the test server serving the built client, Debian's
// Chromium driven by playwright-core (no browser download, with the flags this closed network
// needs), phone-sized contexts, and signing in through the sign-in page as a person would.
// A test file calls `browserHarness()` once at its top and reads `h.ts` and `h.browser` in
// its tests; the harness starts both before the file's tests and closes both after them.
import { afterAll, beforeAll } from 'vitest';
import { chromium, type Browser, type BrowserContext, type BrowserContextOptions, type Page } from 'playwright-core';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { clientDir, startTestServer, TEST_PASSWORD, type TestServer } from './test-app';
import { seedDemo } from '../../server/seed/demo';

/** A tester's phone: 390 × 844, touch. */
export const PHONE: BrowserContextOptions = { viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true };

export async function launchBrowser(): Promise<Browser> {
  const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (!fs.existsSync(executablePath)) throw new Error(`Chromium not found at ${executablePath}: run the tests with \`npm test\`, which installs it`);
  return chromium.launch({
    executablePath,
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
      '--disable-quic',
    ],
  });
}

export const screenshotDir = () => {
  const dir = path.join(os.tmpdir(), 'twistlog-screens');
  fs.mkdirSync(dir, { recursive: true });
  return dir;
};

/** Signs in through the sign-in page, as a person would, and waits to leave it. */
export async function signInAs(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

export interface BrowserHarness {
  /** The test server (API, built client, SMTP sink), started before the file's tests. */
  readonly ts: TestServer;
  readonly browser: Browser;
  /** Signs `page` in as `email` (the test password unless given) through the sign-in page. */
  signIn(page: Page, email: string, password?: string): Promise<void>;
  /** A new context and page (a phone unless `options` say otherwise), signed in as `email` when given. */
  open(email?: string, options?: BrowserContextOptions & { password?: string }): Promise<{ context: BrowserContext; page: Page }>;
}

/**
 * Starts the test server (with the invented demo workshop when `seedDemo`) and Chromium before
 * the file's tests, and closes both after them.
 */
export function browserHarness(opts: { seedDemo?: boolean } = {}): BrowserHarness {
  let ts: TestServer | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    ts = await startTestServer({ clientDir });
    if (opts.seedDemo) await seedDemo();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await ts?.close();
  });
  const started = <T>(value: T | undefined, what: string): T => {
    if (value === undefined) throw new Error(`the browser harness has not started ${what}: use it inside a test or a hook`);
    return value;
  };
  const harness: BrowserHarness = {
    get ts() {
      return started(ts, 'the test server');
    },
    get browser() {
      return started(browser, 'Chromium');
    },
    signIn: (page, email, password = TEST_PASSWORD) => signInAs(page, harness.ts.baseUrl, email, password),
    async open(email, { password, ...options } = PHONE) {
      const context = await harness.browser.newContext(options);
      const page = await context.newPage();
      if (email) await harness.signIn(page, email, password);
      return { context, page };
    },
  };
  return harness;
}
