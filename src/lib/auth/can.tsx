// What the signed-in person may do, for hiding what they cannot use: the shared permission table
// (shared/permissions.ts). The server still checks every request; this only keeps buttons and
// links away from people who cannot use them. Screens ask for an action, never a role name.
import type { ReactNode } from 'react';
import { can as roleCan, type Action } from '@shared/permissions';
import { useMe } from './get-me';

/** `const can = useCan(); can('session.review')`: false while nobody is signed in (or still loading). */
export function useCan(): (action: Action) => boolean {
  const role = useMe().data?.role;
  return (action) => role !== undefined && roleCan(role, action);
}

/** Shows its children only to people who may do the action (and `otherwise` to the rest). */
export function Can({ action, children, otherwise = null }: { action: Action; children: ReactNode; otherwise?: ReactNode }) {
  return useCan()(action) ? children : otherwise;
}
