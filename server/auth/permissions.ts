// The permission table: one place that says which role may do what. Routes name an action;
// the access middleware looks the action up here. The README prints this table (its section
// "Roles and permissions" is generated from here by `npx tsx server/auth/print-permissions.ts
// --write`, and a unit test keeps the two equal).
import type { Role } from '../../shared/schemas/common';

export const permissions = {
  'team.read': ['admin', 'engineer', 'tester', 'viewer'],
  'team.manage': ['admin'],
  'vehicle.read': ['admin', 'engineer', 'tester'],
  'vehicle.write': ['admin', 'engineer', 'tester'],
  'vehicle.delete': ['admin', 'engineer'],
  'session.read': ['admin', 'engineer', 'tester'],
  'session.record': ['admin', 'engineer', 'tester'],
  'session.review': ['admin', 'engineer'],
  'session.delete': ['admin', 'engineer'],
  'envelope.read': ['admin', 'engineer', 'tester'],
  'envelope.readSigned': ['admin', 'engineer', 'tester', 'viewer'],
  'envelope.design': ['admin', 'engineer'],
  'envelope.signOff': ['admin', 'engineer'],
  'envelope.send': ['admin', 'engineer'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof permissions;

/** What each action lets a person do, in the words of the README. */
export const actionDescriptions: Record<Action, string> = {
  'team.read': 'see the workshop and its members',
  'team.manage': 'invite members, change roles, remove members, revoke invitations',
  'vehicle.read': 'see vehicles and their gauge points',
  'vehicle.write': 'add and edit vehicles and gauge points',
  'vehicle.delete': 'delete a vehicle',
  'session.read': 'see test sessions, poses, readings and photos',
  'session.record': 'record sessions in the field: poses, readings, photos, sync and its conflicts',
  'session.review': 'review a session: exclude and flag readings, export them, change a session whose envelope is signed',
  'session.delete': 'delete a test session',
  'envelope.read': 'see draft and signed envelopes, compare trucks',
  'envelope.readSigned': 'see signed-off envelopes',
  'envelope.design': 'set design parameters of an envelope',
  'envelope.signOff': 'sign off an envelope',
  'envelope.send': 'send a fabrication sheet (PDF) by e-mail',
};

export const allRoles: readonly Role[] = ['admin', 'engineer', 'tester', 'viewer'];

export function can(role: Role, action: Action): boolean {
  return (permissions[action] as readonly Role[]).includes(role);
}

export function isAction(name: string): name is Action {
  return Object.prototype.hasOwnProperty.call(permissions, name);
}

/** The README's table: one row per action, one column per role. */
export function permissionsMarkdown(): string {
  const head = `| action | lets a person | ${allRoles.join(' | ')} |`;
  const rule = `| --- | --- | ${allRoles.map(() => ':---:').join(' | ')} |`;
  const rows = (Object.keys(permissions) as Action[]).map(
    (a) => `| \`${a}\` | ${actionDescriptions[a]} | ${allRoles.map((r) => (can(r, a) ? '✓' : '—')).join(' | ')} |`,
  );
  return [head, rule, ...rows].join('\n');
}
