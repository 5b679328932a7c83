// Who may do what: the one table of roles and the one table of actions, read by the server's
// access checks (routes name an action, `server/routes/route.ts` looks it up), by sync push's
// field rules (`server/services/sync-access.ts`) and by the client, which hides what a role
// cannot use (`src/lib/auth/can.tsx`; the server still checks every request). A refusal is the
// action's sentence from here (`refusal`): "Reviewing readings is for engineers and admins.". The README's
// "Roles and permissions" table is printed from here (`npx tsx server/auth/print-permissions.ts
// --write`; a unit test keeps the two equal).
//
// A new role is a row in `roleTable` (with how a sentence names its people), its roles in the `permissionTable` rows it may use, and a
// migration widening the CHECK constraints on memberships.role and invitations.role (a test
// compares those constraints with `roles`).
import { listInWords } from './plural';

interface RoleEntry {
  /** One line that says what the role is for, as the Team page and the invitation page explain it. */
  summary: string;
  /** The role as a sentence names its people: "engineers". */
  plural: string;
  /** The role as a sentence names one of its people, with its article: "an engineer", "a tester". */
  singular: string;
}

/** The roles, widest first (the order of the Team page's list and the README's columns). */
export const roleTable = {
  admin: {
    summary: 'runs the workshop account (members, invitations, roles, vehicles) and can do all an engineer can.',
    plural: 'admins',
    singular: 'an admin',
  },
  engineer: {
    summary: 'reviews readings, sets design parameters, signs off envelopes and sends fabrication sheets.',
    plural: 'engineers',
    singular: 'an engineer',
  },
  tester: { summary: 'records flex-test sessions in the field.', plural: 'testers', singular: 'a tester' },
  viewer: { summary: 'read-only: sees signed-off envelopes.', plural: 'viewers', singular: 'a viewer' },
} as const satisfies Record<string, RoleEntry>;

export type Role = keyof typeof roleTable;
export const roles = Object.keys(roleTable) as [Role, ...Role[]];

interface ActionEntry {
  /** Who may do it. */
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
  'retest.ask': {
    roles: ['admin', 'engineer'],
    lets: 'ask the crew for a re-test of a session, a pose or a reading, and close or reopen the request',
    doing: 'Asking for a re-test',
  },
  'retest.answer': {
    roles: ['admin', 'engineer', 'tester'],
    lets: 'answer a re-test request from the field',
    doing: 'Answering a re-test request',
  },
  'session.delete': { roles: ['admin', 'engineer'], lets: 'delete a test session', doing: 'Deleting a test session' },
  'envelope.read': {
    roles: ['admin', 'engineer', 'tester'],
    lets: 'see draft and signed envelopes, compare trucks',
    doing: 'Seeing draft envelopes and comparisons',
  },
  'envelope.readSigned': { roles: ['admin', 'engineer', 'tester', 'viewer'], lets: 'see signed-off envelopes', doing: 'Seeing signed-off envelopes' },
  'envelope.design': { roles: ['admin', 'engineer'], lets: 'set design parameters of an envelope', doing: 'Setting envelope design parameters' },
  'envelope.signOff': { roles: ['admin', 'engineer'], lets: 'sign off an envelope', doing: 'Signing off an envelope' },
  'envelope.send': { roles: ['admin', 'engineer'], lets: 'send a fabrication sheet (PDF) by e-mail', doing: 'Sending a fabrication sheet' },
} as const satisfies Record<string, ActionEntry>;

export type Action = keyof typeof permissionTable;
export const actions = Object.keys(permissionTable) as Action[];

export function can(role: Role, action: Action): boolean {
  return (permissionTable[action].roles as readonly Role[]).includes(role);
}

export function isAction(name: string): name is Action {
  return Object.prototype.hasOwnProperty.call(permissionTable, name);
}

/** The roles that may do an action, in the table's order. */
export const rolesThatCan = (action: Action): Role[] => roles.filter((r) => can(r, action));

/** Who may do an action, in words, narrowest role first: "engineers and admins", or "everyone in the workshop". */
export function whoMay(action: Action): string {
  const who = rolesThatCan(action).reverse();
  return who.length === roles.length ? 'everyone in the workshop' : listInWords(who.map((r) => roleTable[r].plural));
}

/** The sentence a refusal gives: `refusal('session.review') // => 'Reviewing readings is for engineers and admins.'` */
export function refusal(action: Action): string {
  return `${permissionTable[action].doing} is for ${whoMay(action)}.`;
}
