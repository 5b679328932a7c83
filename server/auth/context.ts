// Who is asking: loaded once per request from the session cookie. Team scope always comes from
// here, never from the request body or URL.
import type { RequestHandler } from 'express';
import type { Role } from '../../shared/schemas/common';
import { MembershipModel } from '../models';
import { lucia } from './lucia';

export interface AuthContext {
  userId: string;
  teamId: string;
  role: Role;
  sessionId: string;
  email: string;
  name: string;
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
  const sessionId = lucia.readSessionCookie(req.headers.cookie ?? '');
  if (!sessionId) return next();
  const { session, user } = await lucia.validateSession(sessionId);
  if (!session) {
    res.append('Set-Cookie', lucia.createBlankSessionCookie().serialize());
    return next();
  }
  if (session.fresh) res.append('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
  const membership = await MembershipModel.findOne({ where: { userId: user.id, teamId: session.teamId } });
  if (!membership) {
    // Removed from the team: the session no longer grants anything.
    await lucia.invalidateSession(session.id);
    res.append('Set-Cookie', lucia.createBlankSessionCookie().serialize());
    return next();
  }
  req.auth = {
    userId: user.id,
    teamId: session.teamId,
    role: membership.role,
    sessionId: session.id,
    email: user.email,
    name: user.name,
  };
  next();
};
