// Sync as a tester meets it on one phone, online: edits between syncs never conflict with the
// phone's own earlier edits, and the bar says "All saved on the server" only when it is true.
import { describe, expect, it } from 'vitest';
import { createTeam } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { allSaved, barText, fieldSession, openConflicts, openPhone } from '../support/field-phone';
import { signedInAgent } from '../support/test-app';
import { batchKey, change, pushAccepted } from '../support/sync';
import { newGaugePoint } from '../../shared/records';
import { GaugePointModel, PoseModel, ReadingModel } from '../../server/models';

const h = browserHarness();

describe('one phone, online', () => {
  it('names a pose, syncs, types a note, syncs, renames it, syncs: no conflict with itself', async () => {
    const team = await createTeam('One-phone workshop');
    const f = await fieldSession(h.ts, team);
    const { context, page } = await openPhone(h, team.members.tester.email);
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
    expect(await openConflicts(h.ts, team.teamId)).toBe(0);
    expect(await barText(page)).toBe('All saved on the server');
    expect(await page.getByText(/conflict/).count()).toBe(0);
    await context.close();
  });

  it("shows a real conflict with another device in the trade's words, and keeps this phone's value once", async () => {
    const team = await createTeam('Conflict workshop');
    const f = await fieldSession(h.ts, team);
    const { context, page } = await openPhone(h, team.members.tester.email);
    await page.goto(f.poseUrl(f.levelPoseId));
    await page.getByLabel('Pose name').waitFor();

    // Offline, the tester lifts the front right wheel 410 mm…
    await context.setOffline(true);
    await page.getByRole('button', { name: /wheel front right$/ }).click();
    await page.keyboard.type('410', { delay: 60 });
    // …while the engineer renames the same pose at the desk.
    const desk = await signedInAgent(h.ts, team.members.engineer.email);
    const p = (await PoseModel.findByPk(f.levelPoseId))!;
    const deskRecord = {
      id: p.id,
      version: p.version,
      sessionId: p.sessionId,
      seq: p.seq,
      label: 'Level (desk)',
      kind: p.kind,
      liftFlMm: p.liftFlMm,
      liftFrMm: p.liftFrMm,
      liftRlMm: p.liftRlMm,
      liftRrMm: p.liftRrMm,
      rampAngleDeg: p.rampAngleDeg,
      rampDistanceMm: p.rampDistanceMm,
      notes: p.notes,
      recordedAt: new Date(p.recordedAt).toISOString(),
    };
    expect((await desk.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('pose', deskRecord)] })).status).toBe(200);

    await context.setOffline(false);
    await page.getByRole('link', { name: '1 conflict to resolve' }).waitFor({ timeout: 30_000 });
    expect(await barText(page)).not.toContain('All saved on the server');
    await page.getByRole('link', { name: '1 conflict to resolve' }).click();
    await page.getByText('Lift front right: 410 mm on this phone, 0 mm on the server').waitFor();
    await page.getByText('Pose name: Pose 1 on this phone, Level (desk) on the server').waitFor();
    await page.getByRole('button', { name: "Keep this phone's" }).click();
    await page.getByText('No conflicts.').waitFor();
    await allSaved(page);
    expect(await PoseModel.findByPk(f.levelPoseId)).toMatchObject({ liftFrMm: 410, label: 'Pose 1', version: 3 });
    expect(await openConflicts(h.ts, team.teamId)).toBe(0);
    await context.close();
  });

  it('holds back a gauge point the server refuses, sends everything else, and sends the point once the tester renames it', async () => {
    const team = await createTeam('Held workshop');
    const f = await fieldSession(h.ts, team, ['A', 'B']);
    const { context, page } = await openPhone(h, team.members.tester.email);
    await page.goto(`${h.ts.baseUrl}/field/vehicles/${f.vehicleId}`);
    await page.getByLabel('Opening drawing: tap to place a gauge point').waitFor();

    // Offline, the tester places a third point (it gets the next free label, C)…
    await context.setOffline(true);
    await page.getByLabel('Opening drawing: tap to place a gauge point').click({ position: { x: 60, y: 60 } });
    await page.getByRole('button', { name: 'Remove point C' }).waitFor();
    // …while the desk places its own point C on the same vehicle.
    const desk = await signedInAgent(h.ts, team.members.engineer.email);
    await pushAccepted(desk, [change('gaugePoint', newGaugePoint({ vehicleId: f.vehicleId, label: 'C', yMm: 0, zMm: 600 }))]);

    await context.setOffline(false);
    await page.getByRole('link', { name: 'See the held records' }).waitFor({ timeout: 30_000 });
    expect(await barText(page)).toContain('1 record held back');

    // The held point stops nothing else: a reading typed now reaches the server.
    await page.goto(f.poseUrl(f.levelPoseId));
    await page.getByLabel('A lateral').click();
    await page.keyboard.type('93', { delay: 60 });
    await expect.poll(async () => (await ReadingModel.findAll({ where: { poseId: f.levelPoseId } })).map((r) => r.valueMm), { timeout: 20_000 }).toEqual([93]);

    await page.getByRole('link', { name: 'See the held records' }).click();
    await page.getByText(/Gauge point C on Test truck/).waitFor();
    await page.getByText(/Refused: .*label 'C' is already used on this vehicle/).waitFor();
    // Renamed on the vehicle page (the desk's C sits at y = 0, this phone's elsewhere), it goes with the next sync.
    await page.getByRole('link', { name: /Gauge point C on Test truck/ }).click();
    const both = page.getByRole('listitem').filter({ has: page.getByRole('button', { name: 'Remove point C' }) });
    await expect.poll(() => both.count()).toBe(2);
    const [phonesPoint] = (
      await Promise.all((await both.all()).map(async (item) => ((await item.getByLabel('C y').inputValue()) === '0' ? [] : [item])))
    ).flat();
    await phonesPoint.getByLabel('Label').fill('D');
    await phonesPoint.getByLabel('Label').blur();
    await allSaved(page);
    expect((await GaugePointModel.findAll({ where: { vehicleId: f.vehicleId, deletedAt: null } })).map((p) => p.label).sort()).toEqual(['A', 'B', 'C', 'D']);
    await context.close();
  });
});
