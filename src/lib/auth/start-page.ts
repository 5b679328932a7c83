// Where a person starts: who records but does not review (a tester) in the field, everyone else
// at the desk. The home address redirects there, and signing in goes there directly.
import { can, type Role } from '@shared/permissions';
import { pathTo } from '@/paths';

export const startPath = (role: Role): string => pathTo(can(role, 'session.record') && !can(role, 'session.review') ? 'fieldSessions' : 'desk');
