// Who may do what: the one table of roles and the one table of actions, read by the server's
// access checks (routes name an action, `server/routes/route.ts` looks it up), by sync push's
// field rules (`server/services/sync-access.ts`) and by the client, which hides what a role
// cannot use (`src/lib/auth/can.tsx`; the server still checks every request). The README's
// "Roles and permissions" table is printed from here (`npx tsx server/auth/print-permissions.ts
// --write`; a unit test keeps the two equal).
//
// A new role is a row in `roleTable`, its roles in the `permissionTable` rows it may use, and a
// migration widening the CHECK constraints on memberships.role and invitations.role (a test
// compares those constraints with `roles`).

interface RoleEntry {
  /** One line that says what the role is for, as the Team page and the invitation page explain it. */
  summary: string;
}

/** The roles, widest first (the order of the Team page's list and the README's columns). */
export const roleTable = {
  admin: { summary: 'runs the workshop account (members, invitations, roles, vehicles) and can do all an engineer can.' },
  engineer: { summary: 'reviews readings, sets design parameters, signs off envelopes and sends fabrication sheets.' },
  tester: { summary: 'records flex-test sessions in the field.' },
  viewer: { summary: 'read-only: sees signed-off envelopes.' },
} as const satisfies Record<string, RoleEntry>;

export type Role = keyof typeof roleTable;
export const roles = Object.keys(roleTable) as [Role, ...Role[]];

interface ActionEntry {
  /** Who may do it. */
  roles: readonly Role[];
  /** What the action lets a person do (the README's column). */
  lets: string;
}

export const permissionTable = {
  'team.read': { roles: ['admin', 'engineer', 'tester', 'viewer'], lets: 'see the workshop and its members' },
  'team.manage': { roles: ['admin'], lets: 'invite members, change roles, remove members, revoke invitations' },
  'vehicle.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see vehicles and their gauge points' },
  'vehicle.write': { roles: ['admin', 'engineer', 'tester'], lets: 'add and edit vehicles and gauge points' },
  'vehicle.delete': { roles: ['admin', 'engineer'], lets: 'delete a vehicle' },
  'session.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see test sessions, poses, readings and photos' },
  'session.record': { roles: ['admin', 'engineer', 'tester'], lets: 'record sessions in the field: poses, readings, photos, sync and its conflicts' },
  'session.review': {
    roles: ['admin', 'engineer'],
    lets: 'review a session: exclude and flag readings, export them, change a session whose envelope is signed',
  },
  'session.delete': { roles: ['admin', 'engineer'], lets: 'delete a test session' },
  'envelope.read': { roles: ['admin', 'engineer', 'tester'], lets: 'see draft and signed envelopes, compare trucks' },
  'envelope.readSigned': { roles: ['admin', 'engineer', 'tester', 'viewer'], lets: 'see signed-off envelopes' },
  'envelope.design': { roles: ['admin', 'engineer'], lets: 'set design parameters of an envelope' },
  'envelope.signOff': { roles: ['admin', 'engineer'], lets: 'sign off an envelope' },
  'envelope.send': { roles: ['admin', 'engineer'], lets: 'send a fabrication sheet (PDF) by e-mail' },
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
