// The permission table: one place that says which role may do what, and says it in words. Routes
// name an action; the access middleware looks the action up here, and a refusal is the action's
// sentence from here (`refusal`). The README prints this table (its section "Roles and
// permissions" is generated from here by `npx tsx server/auth/print-permissions.ts --write`, and a
// unit test keeps the two equal). The client reads the same table to hide what a role cannot do
// and to say why a button is off.
import type { Role } from '../../shared/schemas/common';
import { listInWords } from '../../shared/plural';

interface Entry {
  roles: readonly Role[];
  /** What the action lets a person do (the README's column). */
  lets: string;
  /** The action as the subject of a sentence: "Reviewing readings" (is for engineers and admins). */
  doing: string;
}

export const permissionTable = {
  'team.read': { roles: ['admin', 'engineer', 'tester', 'viewer'], lets: 'see the workshop and its members', doing: 'Seeing the workshop and its members' },
  'team.manage': { roles: ['admin'], lets: 'invite members, change roles, remove members, revoke invitations', doing: 'Managing members and invitations' },
  'vehicle.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see vehicles and their gauge points', doing: 'Seeing vehicles' },
  'vehicle.write': { roles: ['admin', 'engineer', 'tester'], lets: 'add and edit vehicles and gauge points', doing: 'Adding and editing vehicles' },
  'vehicle.delete': { roles: ['admin', 'engineer'], lets: 'delete a vehicle', doing: 'Deleting a vehicle' },
  'session.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see test sessions, poses, readings and photos', doing: 'Seeing test sessions' },
  'session.record': {
    roles: ['admin', 'engineer', 'tester'],
    lets: 'record sessions in the field: poses, readings, photos, sync and its conflicts',
    doing: 'Recording sessions in the field',
  },
  'session.review': {
    roles: ['admin', 'engineer'],
    lets: 'review a session: exclude and flag readings, export them, change a session whose envelope is signed',
    doing: 'Reviewing readings',
  },
  'session.delete': { roles: ['admin', 'engineer'], lets: 'delete a test session', doing: 'Deleting a test session' },
  'envelope.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see draft and signed envelopes, compare trucks', doing: 'Seeing draft envelopes and comparisons' },
  'envelope.readSigned': { roles: ['admin', 'engineer', 'tester', 'viewer'], lets: 'see signed-off envelopes', doing: 'Seeing signed-off envelopes' },
  'envelope.design': { roles: ['admin', 'engineer'], lets: 'set design parameters of an envelope', doing: 'Setting envelope design parameters' },
  'envelope.signOff': { roles: ['admin', 'engineer'], lets: 'sign off an envelope', doing: 'Signing off an envelope' },
  'envelope.send': { roles: ['admin', 'engineer'], lets: 'send a fabrication sheet (PDF) by e-mail', doing: 'Sending a fabrication sheet' },
} as const satisfies Record<string, Entry>;

export type Action = keyof typeof permissionTable;

/** The roles of each action. */
export const permissions = Object.fromEntries(Object.entries(permissionTable).map(([a, e]) => [a, e.roles])) as {
  [A in Action]: (typeof permissionTable)[A]['roles'];
};

/** What each action lets a person do, in the words of the README. */
export const actionDescriptions = Object.fromEntries(Object.entries(permissionTable).map(([a, e]) => [a, e.lets])) as Record<Action, string>;

export const allRoles: readonly Role[] = ['admin', 'engineer', 'tester', 'viewer'];

/** Roles as a sentence names them, the narrowest role first: "engineers and admins". */
const ROLE_PLURALS: Record<Role, string> = { viewer: 'viewers', tester: 'testers', engineer: 'engineers', admin: 'admins' };

export function can(role: Role, action: Action): boolean {
  return (permissions[action] as readonly Role[]).includes(role);
}

export function isAction(name: string): name is Action {
  return Object.prototype.hasOwnProperty.call(permissions, name);
}

/** Who may do an action, in words: "engineers and admins", or "everyone in the workshop". */
export function whoMay(action: Action): string {
  const roles = [...allRoles].reverse().filter((r) => can(r, action));
  return roles.length === allRoles.length ? 'everyone in the workshop' : listInWords(roles.map((r) => ROLE_PLURALS[r]));
}

/** The sentence a refusal gives: `refusal('session.review') // => 'Reviewing readings is for engineers and admins.'` */
export function refusal(action: Action): string {
  return `${permissionTable[action].doing} is for ${whoMay(action)}.`;
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
