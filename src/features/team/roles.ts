import type { Role } from '@shared/schemas';

/** One line per role, as the Team page and the invitation page explain them. */
export const roleSummary: Record<Role, string> = {
  admin: 'runs the workshop account (members, invitations, roles, vehicles) and can do all an engineer can.',
  engineer: 'reviews readings, sets design parameters, signs off envelopes and sends fabrication sheets.',
  tester: 'records flex-test sessions in the field.',
  viewer: 'read-only: sees signed-off envelopes.',
};

export const roleOptions: Role[] = ['admin', 'engineer', 'tester', 'viewer'];
