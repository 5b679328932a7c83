// Review of readings through HTTP: exclusion needs a reason, stale edits are refused, nothing is
// deleted, every change is in the history, and only engineers and admins may review.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { ReadingModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('reviewing readings', () => {
  it('excludes a reading only with a reason, keeps the row and records the change in the history', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const readingId = s.readingIds.get('2:P01:lateral')!;

    const noReason = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, excluded: true });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields.map((f: { field: string }) => f.field)).toContain('body.excludeReason');

    const ok = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, excluded: true, excludeReason: 'gauge knocked' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ excluded: true, excludeReason: 'gauge knocked', version: 2 });

    const row = await ReadingModel.findByPk(readingId);
    expect(row?.deletedAt).toBeNull();
    expect(row?.excluded).toBe(true);

    const review = await engineer.get(`/api/sessions/${s.sessionId}/review`);
    expect(review.status).toBe(200);
    expect(review.body.readings).toHaveLength(s.readingIdList.length);
    expect(review.body.history[0]).toMatchObject({ entity: 'reading', entityId: readingId, action: 'reading.exclude' });
    expect(review.body.history[0].detail.excludeReason.after).toBe('gauge knocked');
    expect(Object.values(review.body.people)).toContain(`tester ${team.members.tester.userId.slice(0, 4)}`);
  });

  it('refuses a stale edit with 409 and keeps the saved value', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const readingId = s.readingIds.get('1:P02:foreAft')!;
    const first = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, flagNote: 'looks high' });
    expect(first.status).toBe(200);
    const stale = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, flagNote: 'overwrite' });
    expect(stale.status).toBe(409);
    expect((await ReadingModel.findByPk(readingId))?.flagNote).toBe('looks high');
  });

  it('lets neither testers nor viewers review, and hides the review from viewers', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const readingId = s.readingIdList[20];
    for (const role of ['tester', 'viewer'] as const) {
      const agent = await signedInAgent(ts, team.members[role].email);
      const edit = await agent.patch(`/api/readings/${readingId}/review`).send({ version: 1, flagNote: 'x' });
      expect(edit.status).toBe(403);
      // The refusal is said in words from the permission table, not as a role and an action code.
      expect(edit.body.error.message).toBe('Reviewing readings is for engineers and admins.');
    }
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    expect((await viewer.get(`/api/sessions/${s.sessionId}/review`)).status).toBe(403);
    expect((await viewer.get(`/api/sessions/${s.sessionId}`)).status).toBe(403);
  });

  it('keeps another team out', async () => {
    const team = await createTeam();
    const other = await createTeam('Other workshop');
    const s = await createDeskSession(team);
    const outsider = await signedInAgent(ts, other.members.engineer.email);
    expect((await outsider.get(`/api/sessions/${s.sessionId}/review`)).status).toBe(404);
    expect((await outsider.patch(`/api/readings/${s.readingIdList[3]}/review`).send({ version: 1, flagNote: 'x' })).status).toBe(404);
  });
});
