// Sync as a tester meets it on one phone, online: edits between syncs never conflict with the
// phone's own earlier edits, and the bar says "All saved on the server" only when it is true.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { clientDir, createTeam, startTestServer, type TestServer } from '../support/test-app';
import { launchBrowser } from '../support/browser';
import { allSaved, barText, fieldSession, openConflicts, openPhone } from '../support/field-phone';
import { PoseModel } from '../../server/models';

let ts: TestServer;
let browser: Browser;
beforeAll(async () => {
  ts = await startTestServer({ clientDir });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await ts?.close();
});

describe('one phone, online', () => {
  it('names a pose, syncs, types a note, syncs, renames it, syncs: no conflict with itself', async () => {
    const team = await createTeam('One-phone workshop');
    const f = await fieldSession(ts, team);
    const { context, page } = await openPhone(browser, ts, team.members.tester.email);
    await page.goto(f.poseUrl(f.levelPoseId));
    const stored = async () => (await PoseModel.findByPk(f.levelPoseId))?.get({ plain: true });

    await page.getByLabel('Pose name').fill('Level, tyres cold');
    await expect.poll(async () => (await stored())?.label, { timeout: 20_000 }).toBe('Level, tyres cold');
    await allSaved(page);

    await page.getByLabel('Notes', { exact: true }).fill('Chocks at the rear wheels');
    await expect.poll(async () => (await stored())?.notes, { timeout: 20_000 }).toBe('Chocks at the rear wheels');
    await allSaved(page);

    await page.getByLabel('Pose name').fill('Level, tyres warm');
    await expect.poll(async () => (await stored())?.label, { timeout: 20_000 }).toBe('Level, tyres warm');
    await allSaved(page);

    expect(await stored()).toMatchObject({ label: 'Level, tyres warm', notes: 'Chocks at the rear wheels' });
    expect(await openConflicts(ts, team.teamId)).toBe(0);
    expect(await barText(page)).toBe('All saved on the server');
    expect(await page.getByText(/conflict/).count()).toBe(0);
    await context.close();
  });
});
