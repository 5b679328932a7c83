// Accounts, sign-up, password reset and invitations: the inputs of the auth and team routes and
// the records they answer with. Shared by the server's routes and the client's forms.
import * as z from 'zod';
import { id, role, text, unitSystem } from './common';

export const emailAddress = z.string().trim().toLowerCase().pipe(z.email('enter a valid e-mail address').max(254));
/** The least length of a chosen password: the schema's rule and the forms' hint. */
export const NEW_PASSWORD_MIN_LENGTH = 10;
/** At least 10 characters; long passphrases welcome (Argon2id hashes any length up to the cap). */
export const newPassword = z.string().min(NEW_PASSWORD_MIN_LENGTH, `use at least ${NEW_PASSWORD_MIN_LENGTH} characters`).max(256, 'use at most 256 characters');
export const personName = text(120, 1, 'enter a name');
export const teamName = text(120, 1, 'enter the workshop name');
/** A token from an e-mailed link (base64url of 32 random bytes). */
export const linkToken = z
  .string()
  .trim()
  .min(20)
  .max(128)
  .regex(/^[A-Za-z0-9_-]+$/, 'not a valid link');

export const signUpInput = z.object({ teamName, name: personName, email: emailAddress, password: newPassword });
export type SignUpInput = z.infer<typeof signUpInput>;

export const tokenInput = z.object({ token: linkToken });

export const passwordResetRequestInput = z.object({ email: emailAddress });
export const passwordResetInput = z.object({ token: linkToken, password: newPassword });
export const changePasswordInput = z.object({ currentPassword: z.string().min(1, 'enter your current password').max(256), newPassword });
export type ChangePasswordInput = z.infer<typeof changePasswordInput>;

export const updateMeInput = z.object({ name: personName.optional(), unitSystem: unitSystem.nullable().optional() }).strict();
export type UpdateMeInput = z.infer<typeof updateMeInput>;

export const inviteInput = z.object({ email: emailAddress, role });
export type InviteInput = z.infer<typeof inviteInput>;
export const roleChangeInput = z.object({ role });

/** Accepting an invitation: a new person gives a name and password; someone with an account already gives their password. */
export const acceptInvitationInput = z.object({ token: linkToken, name: personName.optional(), password: z.string().min(1).max(256) });
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInput>;

export const invitation = z.object({
  id,
  email: z.email(),
  role,
  invitedByName: z.string(),
  createdAt: z.string(),
  expiresAt: z.string(),
});
export type Invitation = z.infer<typeof invitation>;

/** What the invitation page shows before the person joins. */
export const invitationPreview = z.object({
  email: z.email(),
  role,
  teamName: z.string(),
  invitedByName: z.string(),
  hasAccount: z.boolean(),
  expiresAt: z.string(),
});
export type InvitationPreview = z.infer<typeof invitationPreview>;

/** The answer to sign-up and to a reset request: always the same, whoever asked. */
export const checkYourMail = z.object({ ok: z.literal(true), devMailbox: z.string().optional() });
export type CheckYourMail = z.infer<typeof checkYourMail>;
