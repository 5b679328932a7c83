// Poses on a phone: a ramp pose asks for the wheel on the ramp and derives its lift; Next pose,
// Repeat this pose and Delete pose (with Undo) sit at the bottom of a pose; the session's details
// can be changed after the start. Everything ends up in PostgreSQL as the screens showed it.
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createTeam } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { settled, testerOnPose, typeInto } from '../support/field-entry';
import { GaugePointModel, PoseModel, TestSessionModel, VehicleModel } from '../../server/models';

const h = browserHarness();

/** Everything typed has reached the server: the bar shows something waiting, then nothing. */
async function synced(page: Page) {
  await settled(page);
  await page.getByText(/Waiting to send/).waitFor();
  await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
}

describe('poses', () => {
  it('derives the lift of the wheel on a ramp from the distance and the angle', async () => {
    const { poseId, context, page } = await testerOnPose(h, 'Ramp workshop');
    await page.getByRole('button', { name: 'Ramp', exact: true }).tap();
    await page.getByText('Which wheel is on the ramp?').waitFor();
    await page.getByRole('button', { name: 'Front right', exact: true }).tap();
    await typeInto(page, 'Distance up the ramp', '1500');
    const lift = page.getByTestId('ramp-lift');
    // 1500 × sin 20° = 513.03 mm (Python: 1500 * math.sin(math.radians(20))); the usual ramp is 20°.
    await expect.poll(() => lift.textContent()).toMatch(/Lift front right: 513 mm/);
    // RTI = 1000 × 1500 / 3800 = 394.7 (the test truck's wheelbase is 3800 mm).
    await expect.poll(() => page.getByTestId('pose-twist').textContent()).toMatch(/RTI 394\.7/);

    await typeInto(page, 'Ramp angle', '23');
    // 1500 × sin 23° = 586.097 mm (Python: 1500 * math.sin(math.radians(23))).
    await expect.poll(() => lift.textContent()).toMatch(/Lift front right: 586\.1 mm/);
    // Twist from the lifts: front roll atan(−586.097 / 1900) = −17.14°, no rear roll (Python: math.atan).
    await expect.poll(() => page.getByTestId('pose-twist').textContent()).toMatch(/Twist -17\.1°/);

    // The ramp moves to the rear left: the front right wheel is back on the ground.
    await page.getByRole('button', { name: 'Rear left', exact: true }).tap();
    await expect.poll(() => lift.textContent()).toMatch(/Lift rear left: 586\.1 mm/);
    expect(await page.getByLabel('Lift front right').inputValue()).toBe('0');
    await synced(page);
    const stored = await PoseModel.findByPk(poseId);
    expect(stored).toMatchObject({ kind: 'ramp', rampWheel: 'rl', rampAngleDeg: 23, rampDistanceMm: 1500, liftFrMm: 0, liftFlMm: 0 });
    // Python: 1500 * math.sin(math.radians(23)) = 586.0966927339107
    expect(stored!.liftRlMm).toBeCloseTo(586.0966927339107, 6);
    await context.close();
  });

  it('goes on to the next pose, repeats one, and deletes one with an undo', async () => {
    const { sessionId, poseId, context, page } = await testerOnPose(h, 'Pose list workshop');
    await typeInto(page, 'Lift front left', '300');
    await settled(page);

    // At the last pose, Next pose records a new one.
    const next = page.getByRole('button', { name: /^Next pose/ });
    await next.scrollIntoViewIfNeeded();
    expect((await next.boundingBox())!.height).toBeGreaterThanOrEqual(48);
    await next.tap();
    await page.getByRole('heading', { name: 'Pose 2' }).waitFor();
    const secondUrl = page.url();

    // Repeat this pose: the same wheels, a new run, readings of its own to come.
    await page.goBack();
    await page.getByRole('heading', { name: 'Pose 1' }).waitFor();
    await page.getByRole('button', { name: 'Repeat this pose' }).tap();
    await page.getByRole('heading', { name: 'Pose 1 · run 2' }).waitFor();
    expect(await page.getByLabel('Lift front left').inputValue()).toBe('300');

    // Delete it, undo, delete again.
    await page.getByRole('button', { name: 'Delete pose' }).tap();
    await page.waitForURL(`**/field/sessions/${sessionId}`);
    await page.getByText('Pose “Pose 1 · run 2” deleted.').waitFor();
    expect(await page.getByRole('link', { name: /Pose 1 · run 2/ }).count()).toBe(0);
    await page.getByRole('button', { name: 'Undo' }).tap();
    await page.getByRole('link', { name: /Pose 1 · run 2/ }).waitFor();
    await page.getByRole('link', { name: /Pose 1 · run 2/ }).tap();
    await page.getByRole('button', { name: 'Delete pose' }).tap();
    await page.getByText('Pose “Pose 1 · run 2” deleted.').waitFor();

    // From the first pose, Next pose goes to the pose after it rather than making another.
    await page.getByRole('link', { name: /^Pose 1 / }).tap();
    await page.getByRole('button', { name: /^Next pose/ }).tap();
    await page.waitForURL(secondUrl);
    await synced(page);

    const poses = await PoseModel.findAll({ where: { sessionId }, order: [['seq', 'ASC']] });
    expect(poses.map((p) => [p.label, p.liftFlMm, p.deletedAt === null])).toEqual([
      ['Level', 0, true],
      ['Pose 1', 300, true],
      ['Pose 2', 0, true],
      ['Pose 1 · run 2', 300, false],
    ]);
    expect(poses[1].id).toBe(poseId);
    await context.close();
  });

  it('changes the session details after the start', async () => {
    const { sessionId, context, page } = await testerOnPose(h, 'Details workshop');
    await page.getByRole('link', { name: /all poses/ }).tap();
    await page.getByRole('button', { name: 'Edit details' }).tap();
    await page.getByLabel('Title').fill('Yard flex, second run');
    await page.getByLabel('Conditions').fill('wet gravel after rain');
    await page.getByLabel('Tyre pressures').fill('3.2 bar all round');
    await page.getByLabel('Who').fill('tester, spotter, photographer');
    await page.getByLabel('Session notes').fill('Rear right chock slipped once; re-set before pose 2.');
    await page.getByRole('button', { name: 'Done' }).tap();
    await page.getByText(/Yard flex, second run · wet gravel after rain/).waitFor();
    await page.getByText(/Waiting to send/).waitFor();
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    expect(await TestSessionModel.findByPk(sessionId)).toMatchObject({
      title: 'Yard flex, second run',
      conditions: 'wet gravel after rain',
      tyrePressures: '3.2 bar all round',
      crew: 'tester, spotter, photographer',
      notes: 'Rear right chock slipped once; re-set before pose 2.',
      version: 2,
    });
    await context.close();
  });

  it('sets up a vehicle with the same entry: refused text is named, a minus comes from ±, and later edits are saved', async () => {
    const team = await createTeam('Vehicle workshop');
    const { context, page } = await h.open(team.members.tester.email);
    await page.goto(`${h.ts.baseUrl}/field/vehicles/new`);
    await page.getByLabel('Name').fill('Alder rig');
    await typeInto(page, 'Wheelbase', '4200');
    await typeInto(page, 'Nominal gap', '3 5/8');
    await page.getByText(/fractions are inch readings/).waitFor();
    // Tapping into the field already being typed in places the caret, as on a phone: clear it first.
    await page.getByLabel('Nominal gap').fill('95');
    await page.getByRole('button', { name: 'Save vehicle' }).tap();
    await page.waitForURL(/vehicles\/[0-9a-f-]{36}$/);
    const vehicleId = page.url().split('/').pop()!;

    // A gauge point tapped onto the drawing, then moved to the right of the centreline with ±.
    await page.getByRole('img', { name: /Opening drawing/ }).tap();
    await page.getByLabel('A y').waitFor();
    await typeInto(page, 'A y', '250');
    await page
      .getByRole('button', { name: 'Change sign' })
      .and(page.locator(`[aria-describedby="${await page.getByLabel('A y').getAttribute('id')}-label"]`))
      .tap();
    expect(await page.getByLabel('A y').inputValue()).toBe('-250');
    await typeInto(page, 'Track front', '1950');
    await page.getByRole('button', { name: 'Save vehicle' }).tap();
    await page.getByText(/Waiting to send/).waitFor();
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    expect(await VehicleModel.findByPk(vehicleId)).toMatchObject({ name: 'Alder rig', wheelbaseMm: 4200, nominalGapMm: 95, trackFrontMm: 1950 });
    expect((await GaugePointModel.findAll({ where: { vehicleId } })).map((g) => [g.label, g.yMm])).toEqual([['A', -250]]);
    await context.close();
  });
});
