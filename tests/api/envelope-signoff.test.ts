// Envelope revisions through HTTP: who may sign, what a signature freezes, how re-opening works,
// and what a viewer may see.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { contentHash } from '../../server/services/envelope-hash';
import { EnvelopeModel } from '../../server/models';
import { DEFAULT_DRAFT_PARAMS } from '../../shared/schemas/envelope';
import { computeDeskEnvelope } from '../../shared/desk-envelope';
import { ENVELOPE_MEASURES } from '../../shared/flex';

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
    for (const measure of ENVELOPE_MEASURES) {
      expect(signed.snapshot.result.measures[measure].envelopeMm).toBe(expected.result.measures[measure].envelopeMm);
      expect(signed.snapshot.result.measures[measure].upperBoundMm).toBeCloseTo(expected.result.measures[measure].upperBoundMm!, 9);
    }
    expect(signed.snapshot.format).toBe(2);
    expect(signed.snapshot.acknowledgedFlags).toEqual([]);
    expect(signed.contentHash).toBe(contentHash(signed.snapshot));
  });

  it('freezes the chosen pass-through option and its figures with the sign-off', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const d = await draft(engineer, s.sessionId);
    const design = { ...params.design, option: 'boot' as const, driverSide: 'left' as const, slackPercent: 12, fastening: 'snaps' as const };
    const saved = await engineer.put(`/api/envelopes/${d.id}/params`).send({ version: d.version, params: { ...params, design } });
    expect(saved.status).toBe(200);
    // A design the schema refuses names the field, in the engineer's terms.
    const bad = await engineer
      .put(`/api/envelopes/${d.id}/params`)
      .send({ version: saved.body.version, params: { ...params, design: { ...design, slackPercent: 300 } } });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toContain('body.params.design.slackPercent');
    const signed = (await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: saved.body.version })).body;
    expect(signed.snapshot.params.design).toMatchObject({ option: 'boot', slackPercent: 12, fastening: 'snaps', driverSide: 'left' });
    const detail = (await engineer.get(`/api/sessions/${s.sessionId}`)).body;
    const expected = computeDeskEnvelope(detail, { ...params, design });
    expect(signed.snapshot.passThrough.boot.panels.top.flatLengthMm).toBeCloseTo(expected.passThrough!.boot.panels.top.flatLengthMm, 9);
    expect(signed.snapshot.passThrough.frames.clear.widthMm).toBeCloseTo(expected.passThrough!.frames.clear.widthMm, 9);
    // Frozen: the design cannot change on a signed revision.
    const late = await engineer
      .put(`/api/envelopes/${d.id}/params`)
      .send({ version: signed.version, params: { ...params, design: { ...design, option: 'frames' } } });
    expect(late.status).toBe(409);
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.snapshot.params.design.option).toBe('boot');
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
    expect(
      (await engineer.patch(`/api/readings/${s.readingIds.get('5:P02:foreAft')}/review`).send({ version: 1, excluded: true, excludeReason: 'retest' })).status,
    ).toBe(200);

    const after = (await engineer.get(`/api/envelopes/${d.id}`)).body;
    expect(after.snapshot).toEqual(signed.snapshot);
    expect(after.contentHash).toBe(signed.contentHash);
    expect(after.hashVerifies).toBe(true);
    expect(contentHash(after.snapshot)).toBe(after.contentHash);

    // Tampering with the stored snapshot is detected.
    const row = await EnvelopeModel.findByPk(d.id);
    const tampered = structuredClone(row!.snapshot) as { result: { measures: { lateral: { envelopeMm: number } } } };
    tampered.result.measures.lateral.envelopeMm += 5;
    await EnvelopeModel.update({ snapshot: tampered }, { where: { id: d.id } });
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.hashVerifies).toBe(false);
  });

  it('asks the engineer to acknowledge each flagged reading kept in, and freezes the acknowledgements', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    // Two misreads, 18 mm and 25 mm off what the other readings explain.
    const misreads = [s.readingIds.get('2:P03:lateral')!, s.readingIds.get('4:P01:foreAft')!];
    const review = (await engineer.get(`/api/sessions/${s.sessionId}/review`)).body;
    for (const [i, id] of misreads.entries()) {
      const value = review.readings.find((r: { id: string }) => r.id === id).valueMm;
      await engineer
        .patch(`/api/readings/${id}/review`)
        .send({ version: 1, valueMm: value + (i === 0 ? 18 : -25) })
        .expect(200);
    }
    const d = await draft(engineer, s.sessionId);

    const none = await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version });
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(
      /^2 flagged readings are still in the computation: acknowledge each one, or exclude it, before signing off: Diagonal 2 P03 lateral \(residual .*\); Diagonal 4 P01 fore-aft/,
    );
    expect(none.body.error.fields.map((f: { field: string }) => f.field).sort()).toEqual(misreads.map((id) => `acknowledgements.${id}`).sort());
    const one = await engineer
      .post(`/api/envelopes/${d.id}/sign`)
      .send({ version: d.version, acknowledgements: [{ readingId: misreads[0], note: 'tape checked' }] });
    expect(one.status).toBe(400);
    expect(one.body.error.fields.map((f: { field: string }) => f.field)).toEqual([`acknowledgements.${misreads[1]}`]);
    expect((await EnvelopeModel.findByPk(d.id))?.status).toBe('draft');

    const signed = await engineer
      .post(`/api/envelopes/${d.id}/sign`)
      .send({ version: d.version, acknowledgements: [{ readingId: misreads[0], note: 'tape checked' }, { readingId: misreads[1] }] });
    expect(signed.status).toBe(200);
    expect(signed.body.hashVerifies).toBe(true);
    expect(signed.body.snapshot.acknowledgedFlags).toEqual([
      expect.objectContaining({ readingId: misreads[0], poseLabel: 'Diagonal 2', pointLabel: 'P03', axis: 'lateral', kind: 'outlier', note: 'tape checked' }),
      expect.objectContaining({ readingId: misreads[1], poseLabel: 'Diagonal 4', pointLabel: 'P01', axis: 'foreAft', kind: 'outlier', note: '' }),
    ]);
    expect(signed.body.contentHash).toBe(contentHash(signed.body.snapshot));
    // The acknowledgement is part of what the hash covers: changing it is detected.
    const row = await EnvelopeModel.findByPk(d.id);
    const tampered = structuredClone(row!.snapshot) as { acknowledgedFlags: { note: string }[] };
    tampered.acknowledgedFlags[1].note = 'never looked';
    await EnvelopeModel.update({ snapshot: tampered }, { where: { id: d.id } });
    expect((await engineer.get(`/api/envelopes/${d.id}`)).body.hashVerifies).toBe(false);
  });

  it('needs no acknowledgement once the flagged reading is excluded', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const misread = s.readingIds.get('3:P04:vertical')!;
    const value = (await engineer.get(`/api/sessions/${s.sessionId}/review`)).body.readings.find((r: { id: string }) => r.id === misread).valueMm;
    await engineer
      .patch(`/api/readings/${misread}/review`)
      .send({ version: 1, valueMm: value + 30 })
      .expect(200);
    await engineer.patch(`/api/readings/${misread}/review`).send({ version: 2, excluded: true, excludeReason: 'misread, 30 mm out' }).expect(200);
    const d = await draft(engineer, s.sessionId);
    const signed = await engineer.post(`/api/envelopes/${d.id}/sign`).send({ version: d.version });
    expect(signed.status).toBe(200);
    expect(signed.body.snapshot.acknowledgedFlags).toEqual([]);
    expect(signed.body.snapshot.excludedReadings).toEqual([{ id: misread, reason: 'misread, 30 mm out' }]);
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
