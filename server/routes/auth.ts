// Sign-in and out, sign-up (confirmed by e-mail), password reset and change, the invitee's side
// of an invitation, and the person's own settings. Every session change goes through
// auth/lucia.ts; every answer anyone may ask for is the same whether or not an account exists.
import * as z from 'zod';
import { publicRoute, route } from './route';
import { signInInput } from '../../shared/schemas';
import {
  acceptInvitationInput,
  changePasswordInput,
  passwordResetInput,
  passwordResetRequestInput,
  signUpInput,
  tokenInput,
  updateMeInput,
} from '../../shared/schemas/account';
import { changePassword, checkCredentials, confirmSignUp, describeMe, requestPasswordReset, requestSignUp, resetPassword } from '../services/auth.service';
import { acceptInvitation, previewInvitation } from '../services/team.service';
import { updateMe } from '../services/account.service';
import { endAllSessions, blankSessionCookie, signInResponse, signOutResponse } from '../auth/lucia';
import { throttle } from '../auth/throttle';
import { devMailboxPath } from '../mail/mailbox';

const empty = z.object({}).strict();
const checkYourMail = () => {
  const devMailbox = devMailboxPath();
  return devMailbox ? { ok: true as const, devMailbox } : { ok: true as const };
};

export const authRoutes = [
  publicRoute({
    method: 'post',
    path: '/api/auth/sign-in',
    access: 'public',
    before: throttle.signIn,
    body: signInInput,
    handler: async ({ req, res, body }) => {
      const { userId, teamId } = await checkCredentials(body.email, body.password);
      // The id is new at every sign-in: the browser's old session (if any) ends.
      await signInResponse(res, req.auth?.sessionId, userId, teamId);
      return { ok: true };
    },
  }),
  route({
    method: 'post',
    path: '/api/auth/sign-out',
    access: 'signedIn',
    body: empty,
    handler: async ({ res, auth }) => {
      await signOutResponse(res, auth.sessionId);
      return { ok: true };
    },
  }),
  route({
    method: 'post',
    path: '/api/auth/sign-out-everywhere',
    access: 'signedIn',
    body: empty,
    handler: async ({ res, auth }) => {
      await endAllSessions(auth.userId);
      res.append('Set-Cookie', blankSessionCookie());
      return { ok: true };
    },
  }),
  publicRoute({
    method: 'post',
    path: '/api/auth/sign-up',
    access: 'public',
    before: throttle.signUp,
    body: signUpInput,
    handler: async ({ req, res, body }) => {
      await requestSignUp(body, req.log);
      res.status(202);
      return checkYourMail();
    },
  }),
  publicRoute({
    method: 'post',
    path: '/api/auth/sign-up/confirm',
    access: 'public',
    before: throttle.token,
    body: tokenInput,
    handler: async ({ req, res, body }) => {
      const { userId, teamId } = await confirmSignUp(body.token);
      await signInResponse(res, req.auth?.sessionId, userId, teamId);
      return { ok: true };
    },
  }),
  publicRoute({
    method: 'post',
    path: '/api/auth/password-reset',
    access: 'public',
    before: throttle.passwordReset,
    body: passwordResetRequestInput,
    handler: async ({ req, res, body }) => {
      // Answered before anything is looked up, so a known address takes no longer than an unknown one.
      requestPasswordReset(body.email, req.log).catch((err) => req.log.error({ err }, 'password reset request failed'));
      res.status(202);
      return checkYourMail();
    },
  }),
  publicRoute({
    method: 'post',
    path: '/api/auth/password-reset/confirm',
    access: 'public',
    before: throttle.token,
    body: passwordResetInput,
    handler: async ({ req, res, body }) => {
      const { userId, teamId } = await resetPassword(body.token, body.password, req.log);
      if (teamId) await signInResponse(res, req.auth?.sessionId, userId, teamId);
      return { ok: true, signedIn: !!teamId };
    },
  }),
  route({
    method: 'post',
    path: '/api/auth/change-password',
    access: 'signedIn',
    before: throttle.changePassword,
    body: changePasswordInput,
    handler: async ({ req, res, auth, body }) => {
      await changePassword(auth, body.currentPassword, body.newPassword, req.log);
      // Every session ended, this one too: this browser gets a fresh one.
      await signInResponse(res, undefined, auth.userId, auth.teamId);
      return { ok: true };
    },
  }),
  publicRoute({
    method: 'post',
    path: '/api/invitations/preview',
    access: 'public',
    before: throttle.token,
    body: tokenInput,
    handler: async ({ body }) => previewInvitation(body.token),
  }),
  publicRoute({
    method: 'post',
    path: '/api/invitations/accept',
    access: 'public',
    before: throttle.token,
    body: acceptInvitationInput,
    handler: async ({ req, res, body }) => {
      const { userId, teamId } = await acceptInvitation(body);
      await signInResponse(res, req.auth?.sessionId, userId, teamId);
      return { ok: true };
    },
  }),
  route({
    method: 'get',
    path: '/api/me',
    access: 'signedIn',
    handler: async ({ auth }) => describeMe(auth),
  }),
  route({
    method: 'patch',
    path: '/api/me',
    access: 'signedIn',
    body: updateMeInput,
    handler: async ({ auth, body }) => updateMe(auth, body),
  }),
];
