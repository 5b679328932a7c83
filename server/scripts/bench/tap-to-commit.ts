// Time from a keystroke in a reading's box on the pose recorder to that reading committed in
// IndexedDB, in Debian's Chromium on a phone-sized screen. 60 keystrokes 120 ms apart, median and
// p95. Two instants are taken for each keystroke: when the strict-durability transaction completed
// (the 'twistlog:saved' event's detail.committedAt: taken at the transaction's complete event, in
// the keystroke worker that commits it or in the page), and when the page's main thread announced
// it (the event itself). The goal is judged on the first: the reading committed.
import { randomUUID } from 'node:crypto';
import { chromium } from 'playwright-core';
import type { BenchRow } from './report';
import { sessionChanges, type BenchServer } from './fixture';

const KEYSTROKES = 60;

export async function runTapBench(s: BenchServer): Promise<BenchRow[]> {
  const workshop = await s.newWorkshop();
  const { sessionId, parents } = sessionChanges(36 * 3);
  await s.post('/api/sync/push', { idempotencyKey: randomUUID(), changes: parents }, workshop.headers);
  const pose = parents.find((c) => c.entity === 'pose' && (c.record as { seq: number }).seq === 1)!.record as { id: string };

  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
  try {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true });
    const [name, value] = workshop.headers.Cookie.split('=');
    await context.addCookies([{ name, value, url: s.baseUrl }]);
    const page = await context.newPage();
    await page.goto(`${s.baseUrl}/field`);
    // The first sync brings the session to the phone; then open the pose.
    await page.waitForFunction(() => document.body.innerText.includes('Bench'), undefined, { timeout: 60_000 });
    await page.goto(`${s.baseUrl}/field/sessions/${sessionId}/poses/${pose.id}`);
    const box = page.getByLabel('P1 lateral');
    await box.waitFor({ timeout: 60_000 });
    await box.click();
    await page.evaluate(() => {
      const w = window as unknown as { __t0: number[]; __dt: number[]; __committed: number[] };
      w.__t0 = [];
      w.__dt = [];
      w.__committed = [];
      document.addEventListener('keydown', () => w.__t0.push(performance.now()), true);
      window.addEventListener('twistlog:saved', (e) => {
        const now = performance.now();
        const t0 = w.__t0.shift();
        if (t0 === undefined) return;
        w.__dt.push(now - t0);
        // The commit's time since the epoch, comparable between the page and its worker.
        const committedAt = (e as CustomEvent<{ committedAt?: number }>).detail?.committedAt;
        w.__committed.push((committedAt === undefined ? now : committedAt - performance.timeOrigin) - t0);
      });
    });
    for (let i = 0; i < KEYSTROKES; i++) {
      // A brisk typing cadence (about 8 keys a second), so each keystroke is timed on its own
      // rather than queued behind the screen's update for the one before.
      await page.waitForTimeout(120);
      // Alternate typing a digit and deleting it, each a committed change of the reading.
      await page.keyboard.press(i % 2 === 0 ? String((i / 2) % 10) : 'Backspace');
      await page.waitForFunction((n) => (window as unknown as { __dt: number[] }).__dt.length >= n, i + 1, { timeout: 10_000 });
    }
    const { dt, committed } = await page.evaluate(() => {
      const w = window as unknown as { __dt: number[]; __committed: number[] };
      return { dt: w.__dt, committed: w.__committed };
    });
    const stats = (xs: number[]) => {
      const sorted = [...xs].sort((a, b) => a - b);
      return { median: sorted[Math.floor(sorted.length / 2)], p95: sorted[Math.floor(sorted.length * 0.95)] };
    };
    const done = stats(committed);
    const told = stats(dt);
    return [
      {
        section: 'client',
        measure: `keystroke → reading committed in IndexedDB (Chromium, ${committed.length} keystrokes)`,
        value: `median ${done.median.toFixed(1)} ms, p95 ${done.p95.toFixed(1)} ms`,
        goal: `median ≤ 10 ms: ${done.median <= 10 ? 'met' : 'NOT met'}`,
      },
      {
        section: 'client',
        measure: `… keystroke → the commit announced to the page ('twistlog:saved' on its main thread)`,
        value: `median ${told.median.toFixed(1)} ms, p95 ${told.p95.toFixed(1)} ms`,
      },
    ];
  } finally {
    await browser.close();
  }
}
