import { describe, expect, it } from 'vitest';
import { actions, can, permissionTable, roles, roleTable } from './permissions';

describe('the permission table', () => {
  it('describes every action and every role, and names only known roles', () => {
    for (const a of actions) {
      expect(permissionTable[a].lets).toBeTruthy();
      for (const r of permissionTable[a].roles) expect(roles).toContain(r);
    }
    for (const r of roles) expect(roleTable[r].summary).toBeTruthy();
  });

  it('says what the roles are for', () => {
    // admin can do all an engineer can; viewer reads signed-off envelopes only.
    for (const a of actions) {
      if (can('engineer', a)) expect(can('admin', a), a).toBe(true);
      if (can('viewer', a)) expect(['team.read', 'envelope.readSigned']).toContain(a);
    }
    expect(can('admin', 'team.manage')).toBe(true);
    expect(['engineer', 'tester', 'viewer'].some((r) => can(r as 'engineer', 'team.manage'))).toBe(false);
    expect(can('tester', 'session.record')).toBe(true);
    expect(can('tester', 'envelope.signOff')).toBe(false);
  });
});
