// The README's "Roles and permissions" table is the permission table: kept equal here.
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { actionDescriptions, allRoles, can, permissions, permissionsMarkdown } from './permissions';
import { BEGIN, END, withTable } from './print-permissions';

const readme = fs.readFileSync(path.resolve(import.meta.dirname, '../../README.md'), 'utf8');

describe('the permission table', () => {
  it('is printed in the README as it is (regenerate: npx tsx server/auth/print-permissions.ts --write)', () => {
    expect(readme).toContain(BEGIN);
    expect(readme).toContain(END);
    expect(withTable(readme)).toBe(readme);
  });

  it('describes every action and names only known roles', () => {
    for (const [action, roles] of Object.entries(permissions)) {
      expect(actionDescriptions[action as keyof typeof permissions]).toBeTruthy();
      for (const r of roles) expect(allRoles).toContain(r);
    }
    expect(permissionsMarkdown().split('\n')).toHaveLength(Object.keys(permissions).length + 2);
  });

  it('says what the roles are for', () => {
    // admin can do all an engineer can; viewer reads signed-off envelopes only.
    for (const a of Object.keys(permissions) as (keyof typeof permissions)[]) {
      if (can('engineer', a)) expect(can('admin', a), a).toBe(true);
      if (can('viewer', a)) expect(['team.read', 'envelope.readSigned']).toContain(a);
    }
    expect(can('admin', 'team.manage')).toBe(true);
    expect(['engineer', 'tester', 'viewer'].some((r) => can(r as 'engineer', 'team.manage'))).toBe(false);
    expect(can('tester', 'session.record')).toBe(true);
    expect(can('tester', 'envelope.signOff')).toBe(false);
  });
});

describe('refusals in words', () => {
  it('says who may do an action, from the same table', async () => {
    const { refusal } = await import('./permissions');
    expect(refusal('session.review')).toBe('Reviewing readings is for engineers and admins.');
    expect(refusal('team.manage')).toBe('Managing members and invitations is for admins.');
    expect(refusal('session.record')).toBe('Recording sessions in the field is for testers, engineers and admins.');
    expect(refusal('envelope.readSigned')).toBe('Seeing signed-off envelopes is for everyone in the workshop.');
  });
});
