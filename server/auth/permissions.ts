// The permission table: one place that says which role may do what. Routes name an action;
// the access middleware looks the action up here. The README prints this table.
import type { Role } from '../../shared/schemas/common';

export const permissions = {
  'team.read': ['admin', 'engineer', 'tester', 'viewer'],
  'team.manage': ['admin'],
  'vehicle.read': ['admin', 'engineer', 'tester'],
  'vehicle.write': ['admin', 'engineer', 'tester'],
  'session.read': ['admin', 'engineer', 'tester'],
  'session.record': ['admin', 'engineer', 'tester'],
  'session.review': ['admin', 'engineer'],
  'envelope.read': ['admin', 'engineer', 'tester'],
  'envelope.readSigned': ['admin', 'engineer', 'tester', 'viewer'],
  'envelope.design': ['admin', 'engineer'],
  'envelope.signOff': ['admin', 'engineer'],
  'envelope.send': ['admin', 'engineer'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof permissions;

export function can(role: Role, action: Action): boolean {
  return (permissions[action] as readonly Role[]).includes(role);
}
