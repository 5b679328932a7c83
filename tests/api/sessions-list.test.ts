// The team's session list carries each session's latest signed-off envelope revision: what the
// field's session list shows as "signed off". Drafts and other workshops' envelopes do not count.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

describe('GET /api/sessions', () => {
  it('names the latest signed-off revision of each session, and null before any sign-off', async () => {
    const team = await createTeam('List workshop');
    const signedSession = await createDeskSession(team, { name: 'Signed truck' });
    const draftOnly = await createDeskSession(team, { name: 'Draft truck', seed: 8 });
    const engineer = await signedInAgent(ts, team.members.engineer.email);
    const tester = await signedInAgent(ts, team.members.tester.email);

    const list = async () => (await tester.get('/api/sessions').expect(200)).body as { id: string; signed: { revision: number; signedAt: string } | null }[];
    expect((await list()).map((s) => s.signed)).toEqual([null, null]);

    const d1 = (await engineer.post(`/api/sessions/${signedSession.sessionId}/envelopes`).send({}).expect(201)).body;
    await engineer.post(`/api/envelopes/${d1.id}/sign`).send({ version: d1.version }).expect(200);
    const r2 = (await engineer.post(`/api/envelopes/${d1.id}/reopen`).expect(201)).body;
    await engineer.post(`/api/envelopes/${r2.id}/sign`).send({ version: r2.version }).expect(200);
    // A third revision left as a draft does not undo the sign-off of the second.
    await engineer.post(`/api/envelopes/${r2.id}/reopen`).expect(201);
    await engineer.post(`/api/sessions/${draftOnly.sessionId}/envelopes`).send({}).expect(201);

    const after = await list();
    const signed = after.find((s) => s.id === signedSession.sessionId)!.signed;
    expect(signed?.revision).toBe(2);
    expect(Date.parse(signed!.signedAt)).toBeGreaterThan(Date.now() - 60_000);
    expect(after.find((s) => s.id === draftOnly.sessionId)!.signed).toBeNull();

    // Another workshop sees none of it.
    const other = await createTeam('Other workshop');
    const stranger = await signedInAgent(ts, other.members.tester.email);
    expect((await stranger.get('/api/sessions').expect(200)).body).toEqual([]);
  });
});
