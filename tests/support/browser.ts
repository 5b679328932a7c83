// Debian's Chromium driven by playwright-core (no browser download), with the flags this
// closed network needs.
import { chromium, type Browser, type Page } from 'playwright-core';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

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
