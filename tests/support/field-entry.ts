// A tester on a phone (390 × 844, touch) in a session the phone pulls at once: the start of the
// field-entry browser tests. The session, its level pose and a second pose are pushed as a phone
// would push them, then the browser signs in and opens the second pose.
import type { Page } from 'playwright-core';
import { createTeam, signedInAgent, type Agent } from './test-app';
import type { BrowserHarness } from './browser';
import { batchKey, change, poseRecord, sessionRecord, vehicleWithPoints } from './sync';

/** A session with a level pose and one pose with wheels, pushed as a phone would, for the browser to pull. */
export async function sessionWithPoses(agent: Agent, readingMode: 'gap' | 'displacement' = 'gap') {
  const { vehicleId, pointIds } = await vehicleWithPoints(agent, ['A', 'B', 'C', 'D']);
  const session = sessionRecord(vehicleId, { readingMode });
  const level = poseRecord(session.id, 0);
  const pose = poseRecord(session.id, 1, { liftFlMm: 0 });
  const res = await agent
    .post('/api/sync/push')
    .send({ idempotencyKey: batchKey(), changes: [change('testSession', session), change('pose', level), change('pose', pose)] });
  if (res.status !== 200) throw new Error(`push: ${res.status} ${JSON.stringify(res.body)}`);
  return { sessionId: session.id, poseId: pose.id, pointIds };
}

/** A tester of a new team on a phone, on the second pose of a session the phone pulls at once. */
export async function testerOnPose(h: BrowserHarness, teamName: string) {
  const team = await createTeam(teamName);
  const agent = await signedInAgent(h.ts, team.members.tester.email);
  const ids = await sessionWithPoses(agent);
  const { context, page } = await h.open(team.members.tester.email);
  await page.goto(`${h.ts.baseUrl}/field/sessions/${ids.sessionId}/poses/${ids.poseId}`);
  await page.getByLabel('Pose name').waitFor();
  return { ...ids, team, agent, context, page };
}

/** As a thumb does it: tap the field (which selects what is in it), then type at a human pace. */
export async function typeInto(page: Page, label: string, text: string) {
  await page.getByLabel(label).tap();
  await page.keyboard.type(text, { delay: 40 });
}

/** The pose screen says every keystroke is committed on the phone. */
export const settled = (page: Page) => page.getByTestId('local-save-state').getByText('Everything typed is saved on this phone.').waitFor();
