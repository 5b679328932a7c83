// A whole field session offline on a phone-sized screen, then sync: everything typed survives a
// reload while offline (served by the service worker), and arrives intact in PostgreSQL and on disk.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import sharp from 'sharp';
import { createTeam, signedInAgent } from '../support/test-app';
import { screenshotDir, browserHarness } from '../support/browser';
import { vehicleWithPoints } from '../support/sync';
import { PhotoModel, PoseModel, ReadingModel, TestSessionModel } from '../../server/models';
import { storedPhotoBytes } from '../support/photos';

const h = browserHarness();

describe('field recorder offline', () => {
  it('records a session offline, keeps it through a reload, and syncs it all when back online', async () => {
    const team = await createTeam('Offline workshop');
    const setup = await signedInAgent(h.ts, team.members.tester.email);
    const { pointIds } = await vehicleWithPoints(setup, ['A', 'B', 'C', 'D']);
    const vehicleName = 'Test truck';

    const { context, page } = await h.open();
    await page.goto(h.ts.baseUrl + '/');
    await page.waitForURL('**/sign-in');
    await h.signIn(page, team.members.tester.email);
    await page.waitForURL('**/field');
    // The service worker installs on this first load and controls the page after a reload.
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
    await page.reload();
    await page.waitForFunction(() => !!navigator.serviceWorker.controller);
    // The vehicle and its gauge points came down with the first pull.
    await page.getByText('All saved on the server').waitFor();
    await page.getByRole('link', { name: 'Vehicles' }).click();
    await page.getByRole('link', { name: new RegExp(vehicleName) }).waitFor();

    await context.setOffline(true);
    await page.getByRole('link', { name: 'Field' }).click();
    await page.getByText('Offline', { exact: true }).waitFor();
    await page.getByRole('link', { name: 'Start a session' }).click();
    await page.getByLabel('Vehicle', { exact: true }).selectOption({ label: vehicleName });
    await page.getByLabel('Title', { exact: true }).fill('Offline yard flex');
    await page.getByLabel('Conditions', { exact: true }).fill('wet grass, no signal');
    for (const box of await page.getByRole('checkbox').all()) await box.check();
    await page.getByRole('button', { name: 'Start session' }).click();
    await page.waitForURL(/\/field\/sessions\/[0-9a-f-]{36}$/);
    const sessionUrl = page.url();
    const sessionId = sessionUrl.split('/').pop()!;

    // Level pose: the baseline gaps.
    await page.getByRole('button', { name: 'Record the level pose' }).click();
    await page.waitForURL(/poses\//);
    const baseline: Record<string, [number, number]> = { A: [90, 40], B: [91, 41], C: [92, 42], D: [93, 43] };
    for (const [label, [lat, vert]] of Object.entries(baseline)) {
      await page.getByLabel(`${label} lateral`).fill(String(lat));
      await page.getByLabel(`${label} vertical`).fill(String(vert));
    }
    await page.getByText('Level pose: these gaps are the baseline').waitFor();

    // Second pose: front left wheel on a 300 mm block, readings and a photo.
    await page.getByRole('link', { name: /all poses/ }).click();
    await page.getByRole('button', { name: 'Record the next pose' }).click();
    await page.waitForURL(/poses\//);
    const poseUrl = page.url();
    await page.getByRole('button', { name: /wheel front left/ }).click();
    await page.getByLabel('Lift front left').fill('300');
    // Twist imposed: atan(300 / 1900) = 8.97° (front track of the test truck; arctangent by hand).
    await expect.poll(() => page.getByTestId('pose-twist').textContent()).toMatch(/Twist 9\.0°/);
    // A lateral shear of 12 mm with no roll: every lateral gap grows by 12.
    for (const [label, [lat, vert]] of Object.entries(baseline)) {
      await page.getByLabel(`${label} lateral`).fill(String(lat + 12));
      await page.getByLabel(`${label} vertical`).fill(String(vert + 1.5));
    }
    const jpeg = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 40, g: 90, b: 120 } } })
      .jpeg()
      .toBuffer();
    await page.locator('input[type=file]').setInputFiles({ name: 'gap-a.jpg', mimeType: 'image/jpeg', buffer: jpeg });
    await page.getByText('waiting to upload').waitFor();
    await page.getByText('Waiting to send:').waitFor();
    // The note is typed key by key, as fast as a thumb, and the page reloads right after the last key.
    await page.getByLabel('Notes', { exact: true }).click();
    await page.keyboard.type('Front left on the 300 block, spotter at the rear', { delay: 30 });

    // Reload at once, offline, while the last keystrokes may still be on their way to storage:
    // the service worker serves the app and every value typed is still there.
    await page.reload();
    await page.getByLabel('A lateral').waitFor();
    expect(await page.getByLabel('A lateral').inputValue()).toBe('102');
    expect(await page.getByLabel('D vertical').inputValue()).toBe('44.5');
    expect(await page.getByLabel('Lift front left').inputValue()).toBe('300');
    expect(await page.getByLabel('Notes', { exact: true }).inputValue()).toBe('Front left on the 300 block, spotter at the rear');
    await page.getByText('waiting to upload').waitFor();
    await page.goto(sessionUrl).catch(() => undefined);
    await page.getByRole('link', { name: /Level/ }).waitFor();
    await page.screenshot({ path: path.join(screenshotDir(), 'field-offline-session.png'), fullPage: true });

    // Each reload asks the server who is signed in, and offline that fails. Once the failure has
    // been stored with the rest of the app's cache, a further reload must still open the field
    // pages from the identity kept on the phone, not send the tester to sign in.
    await expect
      .poll(
        () =>
          page.evaluate(() => {
            const cache = JSON.parse(localStorage.getItem('twistlog-query-cache') ?? '{}');
            const me = cache.clientState?.queries?.find((q: { queryKey: unknown[] }) => q.queryKey[0] === 'me');
            return !me || me.state.status === 'error';
          }),
        { timeout: 30_000 },
      )
      .toBe(true);
    await page.reload();
    await page.getByRole('link', { name: /Level/ }).waitFor();
    expect(page.url()).toBe(sessionUrl);
    expect(await TestSessionModel.count({ where: { id: sessionId } })).toBe(0);

    // Back online: sync starts by itself.
    await context.setOffline(false);
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });

    const session = await TestSessionModel.findByPk(sessionId);
    expect(session).toMatchObject({
      title: 'Offline yard flex',
      conditions: 'wet grass, no signal',
      teamId: team.teamId,
      createdBy: team.members.tester.userId,
    });
    expect(session?.safetyAckAt).not.toBeNull();
    const poses = await PoseModel.findAll({ where: { sessionId }, order: [['seq', 'ASC']] });
    expect(poses.map((p) => [p.kind, p.liftFlMm])).toEqual([
      ['level', 0],
      ['wheels', 300],
    ]);
    expect(poses[1].notes).toBe('Front left on the 300 block, spotter at the rear');
    const readings = await ReadingModel.findAll({ where: { poseId: poses.map((p) => p.id), deletedAt: null } });
    expect(readings).toHaveLength(16);
    const a = readings.find((r) => r.poseId === poses[1].id && r.gaugePointId === pointIds[0] && r.axis === 'lateral');
    expect(a?.valueMm).toBe(102);
    const photos = await PhotoModel.findAll({ where: { sessionId } });
    expect(photos).toHaveLength(1);
    expect(photos[0].poseId).toBe(poses[1].id);
    expect((await storedPhotoBytes(photos[0].storedName))?.length).toBeGreaterThan(0);
    expect(await storedPhotoBytes(photos[0].thumbName)).not.toBeNull();
    await page.goto(poseUrl);
    await page.getByTestId('pose-photos').getByText('on the server', { exact: true }).waitFor();
    await context.close();
  });
});
