// Text a person types at the desk or on the account pages goes through the same text rule as the
// synced records: a NUL byte (which PostgreSQL cannot store in text) or half a surrogate pair is
// refused with a 400 naming the field, never a 500, and nothing already saved changes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, createTeam, signedInAgent, startTestServer, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { ReadingModel, UserModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const fieldsOf = (res: { body: { error?: { fields?: { field: string }[] } } }) => (res.body.error?.fields ?? []).map((f) => f.field);

describe('text a person types', () => {
  it.each([
    ['a NUL byte', 'Ann\u0000Marsh'],
    ['half a surrogate pair', 'Ann \ud800Marsh'],
  ])('refuses %s in a name, an exclusion reason and a flag note, naming the field', async (_what, bad) => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const engineer = await signedInAgent(ts, team.members.engineer.email);

    const renamed = await engineer.patch('/api/me').send({ name: bad });
    expect(renamed.status).toBe(400);
    expect(fieldsOf(renamed)).toContain('body.name');
    expect((await UserModel.findByPk(team.members.engineer.userId))?.name).not.toContain('Marsh');

    const readingId = s.readingIds.get('2:P01:lateral')!;
    const excluded = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, excluded: true, excludeReason: bad });
    expect(excluded.status).toBe(400);
    expect(fieldsOf(excluded)).toContain('body.excludeReason');
    const noted = await engineer.patch(`/api/readings/${readingId}/review`).send({ version: 1, flagNote: bad });
    expect(noted.status).toBe(400);
    expect(fieldsOf(noted)).toContain('body.flagNote');
    expect(await ReadingModel.findByPk(readingId)).toMatchObject({ version: 1, excluded: false, flagNote: null });

    const signUp = await agentFor(ts)
      .post('/api/auth/sign-up')
      .send({ teamName: bad, name: 'Ann', email: 'ann@example.test', password: 'long enough password' });
    expect(signUp.status).toBe(400);
    expect(fieldsOf(signUp)).toContain('body.teamName');
  });
});
