// Sign-in, sign-up (confirmed by e-mail), password reset and change. Answers that anyone may
// ask for (sign-up, reset request, sign-in) are the same whether or not an account exists.
import { randomUUID } from 'node:crypto';
import { Op, QueryTypes } from 'sequelize';
import type { Logger } from 'pino';
import { MembershipModel, PasswordResetModel, TeamModel, UserModel } from '../models';
import { endAllSessions, hashPassword, verifyPassword } from '../auth/lucia';
import { hashToken, LinkInvalid, newToken, TOKEN_TTL } from '../auth/tokens';
import { Conflict, Invalid, Unauthenticated } from '../http/errors';
import type { AuthContext } from '../auth/context';
import type { Me } from '../../shared/schemas';
import type { SignUpInput } from '../../shared/schemas/account';
import { sendInBackground } from '../mail/deliver';
import { accountExistsMail, passwordChangedMail, passwordResetMail, signUpConfirmMail } from '../mail/templates';

type Log = Pick<Logger, 'error'> | undefined;

// A real hash to verify against when the e-mail is unknown, so an unknown address takes as long
// as a wrong password and the answer gives nothing away.
let decoyHash: Promise<string> | undefined;

/** The workshop a person enters at sign-in: the one they joined first. */
async function homeTeamOf(userId: string): Promise<string | null> {
  const m = await MembershipModel.findOne({ where: { userId }, order: [['createdAt', 'ASC']] });
  return m?.teamId ?? null;
}

/** Check e-mail and password; one generic error for every kind of failure. */
export async function checkCredentials(email: string, password: string): Promise<{ userId: string; teamId: string }> {
  const user = await UserModel.findOne({ where: { email } });
  if (!user) {
    decoyHash ??= hashPassword('not-a-real-password-decoy');
    await verifyPassword(await decoyHash, password);
    throw new Unauthenticated('e-mail or password is wrong');
  }
  if (!(await verifyPassword(user.passwordHash, password))) throw new Unauthenticated('e-mail or password is wrong');
  const teamId = await homeTeamOf(user.id);
  if (!teamId) throw new Unauthenticated('e-mail or password is wrong');
  return { userId: user.id, teamId };
}

/** The signed-in person, their workshop and role: all read with the session (auth/lucia.ts). */
export function describeMe(auth: AuthContext): Me {
  return {
    user: { id: auth.userId, name: auth.name, email: auth.email, unitSystem: auth.unitSystem },
    team: auth.team,
    role: auth.role,
  };
}

// ---------------------------------------------------------------------------------------------
// Sign-up: a request kept until its e-mail is confirmed.

/**
 * Ask to create a workshop. Whoever asks gets the same answer and one e-mail: a confirmation
 * link for a new address, "you already have an account" for a known one.
 */
export async function requestSignUp(input: SignUpInput, log?: Log): Promise<void> {
  // Hash in both cases, so both answers take as long.
  const passwordHash = await hashPassword(input.password);
  const existing = await UserModel.findOne({ where: { email: input.email } });
  if (existing) {
    sendInBackground(accountExistsMail({ to: existing.email, name: existing.name }), { kind: 'account-exists', userId: existing.id }, log);
    return;
  }
  const { token, hash } = newToken();
  await UserModel.sequelize!.query(
    `INSERT INTO sign_up_requests (id, email, team_name, name, password_hash, token_hash, expires_at)
     VALUES (:id, :email, :teamName, :name, :passwordHash, :tokenHash, :expiresAt)`,
    {
      replacements: {
        id: randomUUID(),
        email: input.email,
        teamName: input.teamName,
        name: input.name,
        passwordHash,
        tokenHash: hash,
        expiresAt: new Date(Date.now() + TOKEN_TTL.signUp),
      },
    },
  );
  sendInBackground(signUpConfirmMail({ to: input.email, name: input.name, teamName: input.teamName, token }), { kind: 'sign-up' }, log);
}

interface SignUpRow {
  email: string;
  team_name: string;
  name: string;
  password_hash: string;
}

/** Use a sign-up link (once): create the workshop and its first admin. */
export async function confirmSignUp(token: string): Promise<{ userId: string; teamId: string }> {
  const sequelize = UserModel.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<SignUpRow>(
      `UPDATE sign_up_requests SET used_at = now()
       WHERE token_hash = :hash AND used_at IS NULL AND expires_at > now()
       RETURNING email, team_name, name, password_hash`,
      { replacements: { hash: hashToken(token) }, type: QueryTypes.SELECT, transaction },
    );
    const r = rows[0];
    if (!r) throw new LinkInvalid();
    if (await UserModel.findOne({ where: { email: r.email }, transaction })) {
      throw new Conflict('an account with this e-mail exists already: sign in, or reset your password');
    }
    const teamId = randomUUID();
    const userId = randomUUID();
    await TeamModel.create({ id: teamId, name: r.team_name, emailConfirmedAt: new Date() }, { transaction });
    await UserModel.create({ id: userId, email: r.email, name: r.name, passwordHash: r.password_hash }, { transaction });
    await MembershipModel.create({ id: randomUUID(), teamId, userId, role: 'admin' }, { transaction });
    // Other pending sign-ups for the same address are void now.
    await sequelize.query(`UPDATE sign_up_requests SET used_at = now() WHERE email = :email AND used_at IS NULL`, {
      replacements: { email: r.email },
      transaction,
    });
    return { userId, teamId };
  });
}

// ---------------------------------------------------------------------------------------------
// Password reset and change.

/** Ask for a reset link. The same answer whether or not the address has an account. */
export async function requestPasswordReset(email: string, log?: Log): Promise<void> {
  const user = await UserModel.findOne({ where: { email } });
  if (!user) return;
  const { token, hash } = newToken();
  await UserModel.sequelize!.transaction(async (transaction) => {
    // Only the newest link works.
    await PasswordResetModel.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: null }, transaction });
    await PasswordResetModel.create(
      { id: randomUUID(), userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + TOKEN_TTL.passwordReset) },
      { transaction },
    );
  });
  sendInBackground(passwordResetMail({ to: user.email, name: user.name, token }), { kind: 'password-reset', userId: user.id }, log);
}

/**
 * Use a reset link (once): set the new password, end every session of the person, and return
 * whom to sign in (teamId null when they belong to no workshop any more).
 */
export async function resetPassword(token: string, password: string, log?: Log): Promise<{ userId: string; teamId: string | null }> {
  const passwordHash = await hashPassword(password);
  const userId = await UserModel.sequelize!.transaction(async (transaction) => {
    const [, rows] = await PasswordResetModel.update(
      { usedAt: new Date() },
      { where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } }, returning: true, transaction },
    );
    const reset = rows[0];
    if (!reset) throw new LinkInvalid();
    await UserModel.update({ passwordHash }, { where: { id: reset.userId }, transaction });
    await PasswordResetModel.update({ usedAt: new Date() }, { where: { userId: reset.userId, usedAt: null }, transaction });
    return reset.userId;
  });
  await endAllSessions(userId);
  const user = await UserModel.findByPk(userId);
  if (user) sendInBackground(passwordChangedMail({ to: user.email, name: user.name }), { kind: 'password-changed', userId: user.id }, log);
  return { userId, teamId: await homeTeamOf(userId) };
}

/** Change the password (knowing the current one); every session of the person ends. */
export async function changePassword(auth: AuthContext, currentPassword: string, newPassword: string, log?: Log): Promise<void> {
  const user = await UserModel.findByPk(auth.userId);
  if (!user) throw new Unauthenticated();
  if (!(await verifyPassword(user.passwordHash, currentPassword))) {
    throw new Invalid('the current password is not right', [{ field: 'body.currentPassword', message: 'this is not your current password' }]);
  }
  if (currentPassword === newPassword) {
    throw new Invalid('the new password is the same as the current one', [{ field: 'body.newPassword', message: 'choose a different password' }]);
  }
  await user.update({ passwordHash: await hashPassword(newPassword) });
  await PasswordResetModel.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: null } });
  await endAllSessions(user.id);
  sendInBackground(passwordChangedMail({ to: user.email, name: user.name }), { kind: 'password-changed', userId: user.id }, log);
}
