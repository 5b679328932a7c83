// What a role may do, for hiding what it cannot: the server's own permission table (the server
// still checks every request; this only keeps buttons away from people who cannot use them).
import type { Role } from '@shared/schemas';
import { can as serverCan, type Action } from '../../../server/auth/permissions';

export type { Action };
export const can = (role: Role | undefined, action: Action) => !!role && serverCan(role, action);
