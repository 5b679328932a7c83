// A role is declared once, in shared/permissions.ts; the database refuses any other role through
// CHECK constraints written by hand in migrations. This keeps the two equal: a new role needs its
// migration, and a migration cannot add a role the table does not describe.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestServer, type TestServer } from '../support/test-app';
import { roles } from '../../shared/permissions';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

describe('the roles the database accepts', () => {
  it.each(['memberships', 'invitations'])('%s.role allows exactly the roles of shared/permissions.ts', async (table) => {
    const checks = await ts.sequelize.query<{ def: string }>(
      `SELECT pg_get_constraintdef(c.oid) AS def FROM pg_constraint c
       JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = ANY (c.conkey)
       WHERE c.contype = 'c' AND c.conrelid = $1::regclass AND a.attname = 'role'`,
      { bind: [table], type: QueryTypes.SELECT },
    );
    expect(checks).toHaveLength(1);
    const allowed = [...checks[0].def.matchAll(/'([^']+)'::text/g)].map((m) => m[1]);
    expect(allowed.sort()).toEqual([...roles].sort());
  });
});
