import { describe, expect, it } from 'vitest';
import { actions, can, permissionTable, refusal, roles, roleTable } from './permissions';

describe('the permission table', () => {
  it('describes every action and every role, and names only known roles', () => {
    for (const a of actions) {
      expect(permissionTable[a].lets).toBeTruthy();
      for (const r of permissionTable[a].roles) expect(roles).toContain(r);
    }
    for (const r of roles) expect(roleTable[r].summary).toBeTruthy();
  });

  it('names one person of each role with its article, so a sentence such as the Team page\'s "is now an engineer" reads right', () => {
    for (const r of roles) expect(roleTable[r].singular, r).toMatch(new RegExp(`^an? ${r}$`));
    expect(roles.map((r) => roleTable[r].singular)).toEqual(['an admin', 'an engineer', 'a tester', 'a viewer']);
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

describe('refusals in words', () => {
  it('says who may do an action, from the same table', () => {
    expect(refusal('session.review')).toBe('Reviewing readings is for engineers and admins.');
    expect(refusal('team.manage')).toBe('Managing members and invitations is for admins.');
    expect(refusal('session.record')).toBe('Recording sessions in the field is for testers, engineers and admins.');
    expect(refusal('envelope.readSigned')).toBe('Seeing signed-off envelopes is for everyone in the workshop.');
  });
});
