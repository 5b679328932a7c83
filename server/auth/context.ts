// Who is asking: loaded once per request from the session cookie. Team scope always comes from
// here, never from the request body or URL.
import type { RequestHandler } from 'express';
import type { Role, UnitSystem } from '../../shared/schemas/common';
import type { Team } from '../../shared/schemas/team';
import { blankSessionCookie, endSession, validateSessionCookie } from './lucia';

export interface AuthContext {
  userId: string;
  teamId: string;
  role: Role;
  sessionId: string;
  email: string;
  name: string;
  /** The person's own choice of units, if any (read with the session). */
  unitSystem: UnitSystem | null;
  /** The session's team as it is now (read with the session). */
  team: Team;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      auth?: AuthContext;
    }
  }
}

export const loadAuth: RequestHandler = async (req, res, next) => {
  const { session, setCookies } = await validateSessionCookie(req.headers.cookie);
  for (const c of setCookies) res.append('Set-Cookie', c);
  if (!session) return next();
  // The role is read with the session on every request (one query, auth/lucia.ts), so a role
  // change or a removal counts at once.
  if (!session.role) {
    // Removed from the team: the session no longer grants anything.
    await endSession(session.sessionId);
    res.append('Set-Cookie', blankSessionCookie());
    return next();
  }
  req.auth = {
    userId: session.userId,
    teamId: session.teamId,
    role: session.role,
    sessionId: session.sessionId,
    email: session.email,
    name: session.name,
    unitSystem: session.unitSystem,
    team: session.team,
  };
  next();
};
