// A re-test request as the engineer and the tester meet it: the engineer, at the desk, opens a
// reading and asks for it to be measured again; the tester's phone syncs and shows the request in
// the session list, on the session and on the pose; the tester measures again (the reading is
// edited as usual), answers and syncs; the engineer's desk syncs and shows the answer, closes the
// request, and the history names each step with its before and after values.
import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createTeam, signedInAgent } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { allSaved, fieldSession, openPhone } from '../support/field-phone';
import { change, pushAccepted, readingRecord } from '../support/sync';

const h = browserHarness();

const WIDE = { viewport: { width: 1280, height: 900 } };

describe('a re-test request', () => {
  it('goes from the desk to the phone and back, and each step is in the history', async () => {
    const team = await createTeam('Re-test yard');
    const f = await fieldSession(h.ts, team);
    const tester = await signedInAgent(h.ts, team.members.tester.email);
    await pushAccepted(tester, [change('reading', readingRecord(f.levelPoseId, f.pointIds[0], 'lateral', 41.5))]);
    const stored = async () =>
      (
        await h.ts.sequelize.query<{ state: string; answer: string; comment: string }>(
          'SELECT state, answer, comment FROM retest_requests WHERE session_id = $1',
          {
            bind: [f.sessionId],
            type: QueryTypes.SELECT,
          },
        )
      )[0];

    // The engineer opens the reading where it is shown and asks for a re-test of it.
    const desk = await h.open(team.members.engineer.email, WIDE);
    await desk.page.goto(`${h.ts.baseUrl}/desk/sessions/${f.sessionId}`);
    await desk.page.getByRole('button', { name: /^Reading Pose 1 A lateral: 41\.5/ }).click();
    const editor = desk.page.getByRole('dialog', { name: 'Review reading' });
    await editor.getByRole('button', { name: 'Ask for a re-test of point A lateral in Pose 1' }).click();
    const ask = editor.getByRole('group', { name: 'Ask for a re-test of point A lateral in Pose 1' });
    await ask.getByRole('textbox').fill('A lateral looks 3 mm low against B: read it again');
    await ask.getByRole('button', { name: 'Send request' }).click();
    await editor.getByRole('status').getByText('it reaches the crew with the next sync').waitFor();
    await allSaved(desk.page);
    await expect.poll(stored, { timeout: 20_000 }).toMatchObject({ state: 'open', comment: 'A lateral looks 3 mm low against B: read it again' });
    const deskList = desk.page.getByRole('region', { name: 'Re-test requests of this session' });
    await deskList.getByText('waiting for the crew').waitFor();

    // The tester's phone pulls it: a count in the session list, the request on the session and on the pose.
    const phone = await openPhone(h, team.members.tester.email);
    await phone.page.goto(`${h.ts.baseUrl}/field`);
    await phone.page.getByTestId('session-state').getByText('1 re-test request to answer').waitFor();
    await phone.page.goto(f.sessionUrl);
    await phone.page.getByRole('region', { name: 'Re-test requests' }).getByText('1 open request').waitFor();
    await phone.page.goto(f.poseUrl(f.levelPoseId));
    const request = phone.page.getByRole('listitem', { name: 'Re-test request on point A lateral in Pose 1' });
    await request.getByText('“A lateral looks 3 mm low against B: read it again”').waitFor();

    // The tester measures again, types the new value as usual, and answers.
    await phone.page.getByRole('textbox', { name: 'A lateral (mm)' }).fill('44.5');
    await request.getByLabel('Your answer').fill('Read twice more: 44.5 mm, the tape had slipped off the mark');
    await request.getByRole('button', { name: 'Send answer' }).click();
    await request.getByText('answered', { exact: true }).waitFor();
    await allSaved(phone.page);
    await expect.poll(stored, { timeout: 20_000 }).toMatchObject({ state: 'answered', answer: 'Read twice more: 44.5 mm, the tape had slipped off the mark' });

    // The engineer's desk syncs: the answer shows, and the engineer closes the request.
    await desk.page.getByRole('button', { name: /^Sync details/ }).click();
    await desk.page.getByRole('button', { name: 'Sync now' }).click();
    const answered = deskList.getByRole('listitem', { name: 'Re-test request on point A lateral in Pose 1' });
    await answered.getByText('“Read twice more: 44.5 mm, the tape had slipped off the mark”').waitFor({ timeout: 20_000 });
    await answered.getByText(/by tester/).waitFor();
    await desk.page.getByRole('button', { name: /^Reading Pose 1 A lateral: 44\.5/ }).waitFor({ timeout: 20_000 });
    await answered.getByRole('button', { name: 'Close request' }).click();
    await answered.getByText('closed', { exact: true }).waitFor();
    await allSaved(desk.page);
    await expect.poll(stored, { timeout: 20_000 }).toMatchObject({ state: 'closed' });

    // The history: asked, answered and closed, with what changed.
    await desk.page.getByRole('button', { name: 'History' }).click();
    const history = desk.page.getByRole('list', { name: 'Session history' });
    await history.getByText(/closed a re-test request — on point A lateral in Pose 1 · state: answered → closed/).waitFor({ timeout: 20_000 });
    await history
      .getByText(/answered a re-test request — on point A lateral in Pose 1 · state: waiting for the crew → answered · answer: — → “Read twice more/)
      .waitFor();
    await history.getByText(/asked for a re-test — on point A lateral in Pose 1 · comment: — → “A lateral looks 3 mm low against B/).waitFor();
    await history
      .getByText(/corrected a reading|sent records from the field/)
      .first()
      .waitFor();
    await phone.context.close();
    await desk.context.close();
  });
});
