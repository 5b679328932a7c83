// On a phone (390 × 844) the app's header and the sync state take at most about 15 % of the first
// screen, so the pose in hand gets the rest; everything the sync bar says stays one tap away.
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createTeam, signedInAgent } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { sessionWithPoses } from '../support/field-entry';

const h = browserHarness();

/** Share of the first screen above the page's own content: the header and the sync state. */
const chromeShare = (page: Page) =>
  page.evaluate(() => {
    const main = document.querySelector('main')!;
    return (main.getBoundingClientRect().top + window.scrollY) / window.innerHeight;
  });

describe('header on a phone', () => {
  it('takes at most 15 % of the first screen, for every role that records, and keeps the sync details a tap away', async () => {
    const team = await createTeam('Header workshop with a long name for a small screen');
    const { sessionId, poseId } = await sessionWithPoses(await signedInAgent(h.ts, team.members.tester.email));
    for (const role of ['tester', 'admin'] as const) {
      const { context, page } = await h.open(team.members[role].email);
      await page.goto(`${h.ts.baseUrl}/field/sessions/${sessionId}/poses/${poseId}`);
      await page.getByLabel('Pose name').waitFor();
      await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
      const share = await chromeShare(page);
      expect(share, `${role}: header and sync state take ${(share * 100).toFixed(1)} % of 844 px`).toBeLessThanOrEqual(0.15);
      if (role === 'tester') {
        // The details: last sync, storage, sync now; they open from the compact line and close again.
        await page.getByRole('button', { name: /Sync details/ }).tap();
        await page.getByText(/Last sync: just now/).waitFor();
        await page.getByText(/Storage:/).waitFor();
        await page.getByRole('button', { name: 'Sync now' }).waitFor();
        await page.getByRole('button', { name: /Sync details/ }).tap();
        expect(await page.getByText(/Last sync:/).isVisible()).toBe(false);
      }
      await context.close();
    }
  });
});
