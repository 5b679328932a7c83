// Who is asking: loaded once per request from the session cookie. Team scope always comes from
// here, never from the request body or URL.
import type { Request, RequestHandler, Response } from 'express';
import type { SessionCompanion } from '../http/validator';
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
      /** The route's validator query, read with the session (loadAuthWith). */
      sessionCompanion?: SessionCompanion;
    }
  }
}

/**
 * Loads the session into `req.auth`; with `companionOf`, also the route's validator query for this
 * request (none when its params do not parse), in the same statement, kept in `req.sessionCompanion`.
 */
export const loadAuthWith =
  (companionOf?: (req: Request) => SessionCompanion | undefined): RequestHandler =>
  async (req, res, next) => {
    const companion = companionOf?.(req);
    if (companion) req.sessionCompanion = companion;
    await loadSession(req, res, companion);
    next();
  };

export const loadAuth = loadAuthWith();

async function loadSession(req: Request, res: Response, companion: SessionCompanion | undefined): Promise<void> {
  const { session, setCookies } = await validateSessionCookie(req.headers.cookie, companion);
  for (const c of setCookies) res.append('Set-Cookie', c);
  if (!session) return;
  // The role is read with the session on every request (one query, auth/lucia.ts), so a role
  // change or a removal counts at once.
  if (!session.role) {
    // Removed from the team: the session no longer grants anything.
    await endSession(session.sessionId);
    res.append('Set-Cookie', blankSessionCookie());
    return;
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
}
