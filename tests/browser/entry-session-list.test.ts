// The field's session list on a phone says each session's state: its poses, what still waits to be
// sent, and whether its envelope is signed off; offline it says since when the sign-off is known.
import { describe, expect, it } from 'vitest';
import { createTeam, signedInAgent } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { createDeskSession } from '../support/desk';
import { sessionWithPoses, settled, typeInto } from '../support/field-entry';

const h = browserHarness();

describe('session list', () => {
  it('shows poses, unsent records and sign-off per session, and what it knows offline', async () => {
    const team = await createTeam('State workshop');
    const desk = await createDeskSession(team, { name: 'Signed truck' });
    const engineer = await signedInAgent(h.ts, team.members.engineer.email);
    const draft = (await engineer.post(`/api/sessions/${desk.sessionId}/envelopes`).send({}).expect(201)).body;
    await engineer.post(`/api/envelopes/${draft.id}/sign`).send({ version: draft.version }).expect(200);
    await sessionWithPoses(await signedInAgent(h.ts, team.members.tester.email));

    const { context, page } = await h.open(team.members.tester.email);
    // The service worker serves the pages offline once it controls the page (after a reload).
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
    await page.reload();
    await page.waitForFunction(() => !!navigator.serviceWorker.controller);
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    const card = (vehicle: string) => page.getByRole('link', { name: new RegExp(vehicle) }).getByTestId('session-state');
    await expect.poll(() => card('Signed truck').textContent()).toBe(`${desk.poseIds.length} poses` + 'all sent' + 'signed off, revision 1');
    expect(await card('Test truck').textContent()).toBe('2 poses' + 'all sent' + 'not signed off');

    // Offline, a reading typed in the field session waits; the sign-off shown is the one last heard.
    await context.setOffline(true);
    await page.getByRole('link', { name: /Test truck/ }).tap();
    await page.getByRole('link', { name: /^Pose 1 / }).tap();
    await typeInto(page, 'A lateral', '12');
    await settled(page);
    await page.getByRole('link', { name: 'Field' }).tap();
    await expect.poll(() => card('Test truck').textContent()).toBe('2 poses' + '1 not yet sent' + 'not signed off');
    expect(await card('Signed truck').textContent()).toMatch(/signed off, revision 1/);
    await page
      .getByTestId('signed-state-note')
      .getByText(/Sign-off as last heard from the server/)
      .waitFor();

    await context.setOffline(false);
    await expect.poll(() => card('Test truck').textContent(), { timeout: 30_000 }).toBe('2 poses' + 'all sent' + 'not signed off');
    await context.close();
  });
});
