// Envelope revisions through HTTP: who may sign, what a signature freezes, how re-opening works,
// and what a viewer may see.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { contentHash } from '../../server/services/envelope-hash';
import { EnvelopeModel } from '../../server/models';
import { DEFAULT_DRAFT_PARAMS } from '../../shared/schemas/envelope';
import { computeDeskEnvelope } from '../../shared/desk-envelope';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const params = { ...DEFAULT_DRAFT_PARAMS, designTwistDeg: 20, seal: { freeHeightMm: 150, minCompressionPercent: 25, maxCompressionPercent: 50 } };

async function draft(agent: Agent, sessionId: string) {
  const res = await agent.post(`/api/sessions/${sessionId}/envelopes`).send({ params });
  expect(res.status).toBe(201);
  return res.body as { id: string; version: number; revision: number };
}

describe('sign-off', () => {
  it('is refused to testers and viewers, and allowed to engineers', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const d = await draft(engineer, s.sessionId);
    for (const role of ['tester', 'viewer'] as const) {
      const agent = await signedInAgent(ts, team.members[role].email);
      const res = await agent.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version });
      expect(res.status).toBe(403);
    }
    expect((await EnvelopeModel.findByPk(d.id))?.status).toBe('draft');
    const signed = await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version });
    expect(signed.status).toBe(200);
    expect(signed.body).toMatchObject({ status: 'signed', hashVerifies: true, signedBy: { id: team.members.engineer.userId } });
  });

  it('computes the snapshot on the server from the database readings, with excluded readings left out', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const excluded = s.readingIds.get('3:P04:lateral')!;
    expect((await engineer.patch(`/api/readings/${excluded}/review`).send({ version: 1, excluded: true, excludeReason: 'tape slipped' })).status).toBe(200);
    const d = await draft(engineer, s.sessionId);
    const signed = (await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version })).body;
    expect(signed.snapshot.excludedReadings).toEqual([{ id: excluded, reason: 'tape slipped' }]);
    expect(signed.snapshot.readings.map((r: { id: string }) => r.id)).not.toContain(excluded);

    // The same shared computation on the session as the API returns it gives the same envelope.
    const detail = (await engineer.get(`/api/sessions/${s.sessionId}`)).body;
    const expected = computeDeskEnvelope(detail, params);
    for (const axis of ['foreAft', 'lateral', 'vertical'] as const) {
      expect(signed.snapshot.result.axes[axis].envelopeMm).toBe(expected.result.axes[axis].envelopeMm);
      expect(signed.snapshot.result.axes[axis].upperBoundMm).toBeCloseTo(expected.result.axes[axis].upperBoundMm!, 9);
    }
    expect(signed.contentHash).toBe(contentHash(signed.snapshot));
  });

  it('keeps a signed snapshot unchanged after its readings change, and its hash still verifies', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const d = await draft(engineer, s.sessionId);
    const signed = (await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version })).body;

    // Move the worst lateral reading far out and exclude another one.
    const lateral = s.readingIds.get('6:P01:lateral')!;
    expect((await engineer.patch(`/api/readings/${lateral}/review`).send({ version: 1, valueMm: 400 })).status).toBe(200);
    expect((await engineer.patch(`/api/readings/${s.readingIds.get('5:P02:foreAft')}/review`).send({ version: 1, excluded: true, excludeReason: 'retest' })).status).toBe(200);

    const after = (await engineer.get(`/api/envelopes/${d.id}`)).body;
    expect(after.snapshot).toEqual(signed.snapshot);
    expect(after.contentHash).toBe(signed.contentHash);
    expect(after.hashVerifies).toBe(true);
    expect(contentHash(after.snapshot)).toBe(after.contentHash);

    // Tampering with the stored snapshot is detected.
    const row = await EnvelopeModel.findByPk(d.id);
    const tampered = structuredClone(row!.snapshot) as { result: { axes: { lateral: { envelopeMm: number } } } };
    tampered.result.axes.lateral.envelopeMm += 5;
    await EnvelopeModel.update({ snapshot: tampered }, { where: { id: d.id } });
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.hashVerifies).toBe(false);
  });

  it('refuses a stale draft edit and freezes parameters once signed', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const d = await draft(engineer, s.sessionId);
    const saved = await engineer.put(`/api/envelopes/${d.id}/params`).send({ version: d.version, params: { ...params, margin: 0.2 } });
    expect(saved.status).toBe(200);
    expect(saved.body.params.margin).toBe(0.2);
    const stale = await engineer.put(`/api/envelopes/${d.id}/params`).send({ version: d.version, params: { ...params, margin: 0.3 } });
    expect(stale.status).toBe(409);
    const bad = await engineer.put(`/api/envelopes/${d.id}/params`).send({ version: saved.body.version, params: { ...params, designTwistDeg: -3 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/designTwistDeg/);
    await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: saved.body.version }).expect(200);
    const frozen = await engineer.put(`/api/envelopes/${d.id}/params`).send({ version: saved.body.version + 1, params });
    expect(frozen.status).toBe(409);
  });

  it('re-opens into a new draft revision; signing it supersedes the old one', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const d = await draft(engineer, s.sessionId);
    await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version }).expect(200);
    const reopened = await engineer.post(`/api/envelopes/${d.id}/reopen`);
    expect(reopened.status).toBe(201);
    expect(reopened.body).toMatchObject({ revision: 2, status: 'draft', params });
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.status).toBe('signed');
    expect((await engineer.post(`/api/envelopes/${d.id}/reopen`)).status).toBe(409);
    await engineer.post(`/api/envelopes/${reopened.body.id}/sign`).send({ version: reopened.body.version }).expect(200);
    const list = (await engineer.get(`/api/sessions/${s.sessionId}/envelopes`)).body;
    expect(list.map((e: { revision: number; status: string }) => [e.revision, e.status])).toEqual([
      [2, 'signed'],
      [1, 'superseded'],
    ]);
  });

  it('shows viewers signed envelopes only', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    const d = await draft(engineer, s.sessionId);
    expect((await viewer.get(`/api/envelopes/${d.id}`)).status).toBe(404);
    expect((await viewer.get(`/api/sessions/${s.sessionId}/envelopes`)).status).toBe(403);
    expect((await viewer.get(`/api/envelopes/signed`)).body).toEqual([]);
    await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version }).expect(200);
    await engineer.post(`/api/envelopes/${d.id}/send`).send({ to: 'first-cutter@bootmakers.test' }).expect(201);
    const seen = await viewer.get(`/api/envelopes/${d.id}`);
    expect(seen.status).toBe(200);
    expect(seen.body.status).toBe('signed');
    expect(seen.body.sends).toEqual([]);
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.sends).toHaveLength(1);
    const listed = (await viewer.get('/api/envelopes/signed')).body;
    expect(listed.map((e: { id: string }) => e.id)).toEqual([d.id]);
  });

  it('names what is missing when the session cannot give an envelope', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    // Exclude every reading of every twisted pose: nothing is left to fit.
    for (const [key, readingId] of s.readingIds) {
      if (key.startsWith('0:')) continue;
      await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, excluded: true, excludeReason: 'whole run void' }).expect(200);
    }
    const d = await draft(engineer, s.sessionId);
    const res = await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/poses/);
    expect((await EnvelopeModel.findByPk(d.id))?.status).toBe('draft');
  });
});
