import { z } from 'zod';
import { publicRoute, route } from './route';
import { signInInput } from '../../shared/schemas';
import { checkCredentials, describeMe } from '../services/auth.service';
import { blankSessionCookie, lucia, startSession } from '../auth/lucia';

export const authRoutes = [
  publicRoute({
    method: 'post',
    path: '/api/auth/sign-in',
    access: 'public',
    body: signInInput,
    handler: async ({ req, res, body }) => {
      const { userId, teamId } = await checkCredentials(body.email, body.password);
      // Drop any session this browser already had, so the id is new at every sign-in.
      if (req.auth) await lucia.invalidateSession(req.auth.sessionId);
      res.append('Set-Cookie', await startSession(userId, teamId));
      return { ok: true };
    },
  }),
  route({
    method: 'post',
    path: '/api/auth/sign-out',
    access: 'signedIn',
    body: z.object({}).strict(),
    handler: async ({ res, auth }) => {
      await lucia.invalidateSession(auth.sessionId);
      res.append('Set-Cookie', blankSessionCookie());
      return { ok: true };
    },
  }),
  route({
    method: 'get',
    path: '/api/me',
    access: 'signedIn',
    handler: async ({ auth }) => describeMe(auth),
  }),
];
