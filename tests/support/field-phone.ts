// A tester's phone in a real browser: a phone-sized, touch context signed in as a team member,
// with the app's service worker installed (so it reloads offline), and a session with its level
// pose already on the server (pushed by the same tester, as another of their phones would), so a
// test starts in the pose recorder without depending on the start-a-session screens.
import type { BrowserContext, Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import type { BrowserHarness } from './browser';
import { batchKey, change, poseRecord, sessionRecord, vehicleWithPoints } from './sync';
import { signedInAgent, type TestServer, type TestTeam } from './test-app';

export interface Phone {
  context: BrowserContext;
  page: Page;
}

/** A phone signed in as `email`, its first pull done and the service worker in control. */
export async function openPhone(h: BrowserHarness, email: string): Promise<Phone> {
  const { context, page } = await h.open(email);
  await page.evaluate(() => navigator.serviceWorker.ready.then(() => true));
  await page.reload();
  await page.waitForFunction(() => !!navigator.serviceWorker.controller);
  await allSaved(page);
  return { context, page };
}

/** The sync bar's summary line. */
export const barText = async (page: Page) => (await page.getByTestId('sync-pending').textContent()) ?? '';

/** Waits until the bar says everything is on the server. */
export async function allSaved(page: Page, timeout = 30_000) {
  await page.getByTestId('sync-pending').getByText('All saved on the server').waitFor({ timeout });
}

export interface FieldSession {
  vehicleId: string;
  pointIds: string[];
  labels: string[];
  sessionId: string;
  levelPoseId: string;
  sessionUrl: string;
  poseUrl: (poseId: string) => string;
}

/** A vehicle with gauge points, a session and its level pose, on the server for this team's tester. */
export async function fieldSession(ts: TestServer, team: TestTeam, labels = ['A', 'B', 'C', 'D', 'E', 'F']): Promise<FieldSession> {
  const agent = await signedInAgent(ts, team.members.tester.email);
  const { vehicleId, pointIds } = await vehicleWithPoints(agent, labels);
  const session = sessionRecord(vehicleId, { title: 'Yard flex test' });
  const level = poseRecord(session.id, 0, { label: 'Pose 1', notes: '' });
  const res = await agent.post('/api/sync/push').send({ idempotencyKey: batchKey(), changes: [change('testSession', session), change('pose', level)] });
  if (res.status !== 200) throw new Error(`session: ${res.status} ${JSON.stringify(res.body)}`);
  const sessionUrl = `${ts.baseUrl}/field/sessions/${session.id}`;
  return { vehicleId, pointIds, labels, sessionId: session.id, levelPoseId: level.id, sessionUrl, poseUrl: (poseId) => `${sessionUrl}/poses/${poseId}` };
}

/** Open conflicts the server keeps for a team. */
export async function openConflicts(ts: TestServer, teamId: string): Promise<number> {
  const [row] = await ts.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM sync_conflicts WHERE team_id = $1 AND resolved_at IS NULL', {
    bind: [teamId],
    type: QueryTypes.SELECT,
  });
  return row.n;
}
