// A vehicle's own desk page, in a real browser: the desk's vehicle card opens it (not the field's
// setup page); it shows the vehicle's details and gauge points, each session with its state and its
// envelope revisions (current, draft, superseded), and leads to the review, the envelope, Compare
// and, for those who may edit vehicles, the setup page. A viewer, who may not see vehicles, is told so.
import { describe, expect, it } from 'vitest';
import { browserHarness } from '../support/browser';
import { createTeam, signedInAgent } from '../support/test-app';
import { createDeskSession } from '../support/desk';

const h = browserHarness();
const DESK = { viewport: { width: 1280, height: 900 } };

describe('the desk page of a vehicle', () => {
  it('shows the vehicle, its gauge points and its sessions with their envelopes, and links onward', async () => {
    const team = await createTeam('Vehicle page workshop');
    const desk = await createDeskSession(team, { name: 'Page truck', poses: 4 });
    const engineer = await signedInAgent(h.ts, team.members.engineer.email);
    const r1 = (await engineer.post(`/api/sessions/${desk.sessionId}/envelopes`).send({}).expect(201)).body;
    await engineer.post(`/api/envelopes/${r1.id}/sign`).send({ version: r1.version }).expect(200);
    const r2 = (await engineer.post(`/api/envelopes/${r1.id}/reopen`).expect(201)).body;
    await engineer.post(`/api/envelopes/${r2.id}/sign`).send({ version: r2.version }).expect(200);
    await engineer.post(`/api/envelopes/${r2.id}/reopen`).expect(201);

    const { page } = await h.open(team.members.engineer.email, DESK);
    await page.waitForURL('**/desk');
    await page.getByRole('link', { name: 'Page truck', exact: true }).click();
    await page.waitForURL(`**/desk/vehicles/${desk.vehicleId}`);
    await page.getByRole('heading', { name: 'Page truck', level: 1 }).waitFor();
    await page.getByText('Wheelbase').waitFor();
    await page.getByText('3800.0 mm').waitFor();
    const points = page.getByRole('table', { name: 'Gauge points' });
    await expect.poll(() => points.locator('tbody tr').count()).toBe(6);

    const session = page.getByRole('listitem').filter({ has: page.getByText('Signed off: revision 2 is current, revision 3 in draft') });
    // The level baseline and four twisted poses.
    await session.getByText('5 poses').waitFor();
    const revisions = session.getByRole('list', { name: 'Envelope revisions' }).getByRole('listitem');
    expect(await revisions.allInnerTexts()).toEqual(['Envelope revision 3 draft', 'Envelope revision 2 current', 'Envelope revision 1 superseded']);

    // Onward: the current revision, the review, Compare with this vehicle's session ticked, the setup page.
    await revisions.nth(1).getByRole('link').click();
    await page.waitForURL(`**/desk/envelopes/${r2.id}`);
    await page.goBack();
    await session.getByRole('link', { name: 'Review this session' }).click();
    await page.waitForURL(`**/desk/sessions/${desk.sessionId}`);
    await page.goBack();
    await page.getByRole('link', { name: "Compare this vehicle's sessions" }).click();
    await page.waitForURL('**/desk/compare?sessions=*');
    await expect.poll(() => page.getByRole('checkbox', { name: /Page truck/ }).isChecked()).toBe(true);
    await page.goBack();
    await page.getByRole('link', { name: 'Edit vehicle and gauge points' }).click();
    await page.waitForURL(`**/field/vehicles/${desk.vehicleId}`);
  });

  it('tells a viewer that vehicles are not theirs to see, with no edit link', async () => {
    const team = await createTeam('Viewer workshop');
    const desk = await createDeskSession(team, { name: 'Hidden truck' });
    const { page } = await h.open(team.members.viewer.email, DESK);
    await page.goto(`${h.ts.baseUrl}/desk/vehicles/${desk.vehicleId}`);
    await page.getByRole('alert').filter({ hasText: 'Seeing vehicles is for' }).waitFor();
    expect(await page.getByText('Hidden truck').count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Edit vehicle and gauge points' }).count()).toBe(0);
  });
});
