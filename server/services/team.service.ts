// The workshop's people: members and their roles, invitations by e-mail. Every query is scoped
// by the team of the session (auth.teamId); a workshop always keeps at least one admin.
import { randomUUID } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { InvitationModel, MembershipModel, PhotoModel, TeamModel, UserModel } from '../models';
import { withTeamChanges } from './team-changes';
import type { AuthContext } from '../auth/context';
import { endTeamSessions, hashPassword, verifyPassword } from '../auth/lucia';
import { hashToken, LinkInvalid, newToken, TOKEN_TTL } from '../auth/tokens';
import { AppError, Conflict, Invalid, NotFound } from '../http/errors';
import { sendWithinQuota } from '../mail/quotas';
import { invitationMail } from '../mail/templates';
import type { Member, Role } from '../../shared/schemas';
import type { TeamSettingsInput } from '../../shared/schemas/team';
import type { TeamDetail } from '../../shared/desk-responses';
import type { AcceptInvitationInput, Invitation, InvitationPreview, InviteInput } from '../../shared/schemas/account';

const roleOrder: Record<Role, number> = { admin: 0, engineer: 1, tester: 2, viewer: 3 };

export async function getTeam(auth: AuthContext): Promise<TeamDetail> {
  const team = await TeamModel.findByPk(auth.teamId);
  if (!team) throw new NotFound('workshop');
  const memberships = await MembershipModel.findAll({
    where: { teamId: auth.teamId },
    include: [{ model: UserModel, as: 'user', attributes: ['id', 'name', 'email'] }],
  });
  const members = memberships
    .map((m) => {
      const u = (m as unknown as { user: UserModel }).user;
      return { userId: u.id, name: u.name, email: u.email, role: m.role };
    })
    .sort((a, b) => roleOrder[a.role] - roleOrder[b.role] || a.name.localeCompare(b.name));
  return { team: { id: team.id, name: team.name, unitSystem: team.unitSystem, photoGps: team.photoGps }, members };
}

/**
 * Change the workshop's settings. Dropping GPS also erases the positions photos already keep (their
 * records change, so phones learn it on their next pull); keeping it applies to photos from now on.
 */
export async function updateTeamSettings(auth: AuthContext, input: TeamSettingsInput) {
  await withTeamChanges(auth.teamId, async (transaction) => {
    await TeamModel.update(
      { ...(input.photoGps && { photoGps: input.photoGps }), ...(input.unitSystem && { unitSystem: input.unitSystem }) },
      { where: { id: auth.teamId }, transaction },
    );
    if (input.photoGps === 'drop') {
      await PhotoModel.sequelize!.query(
        'UPDATE photos SET gps_lat = NULL, gps_lon = NULL, version = version + 1 WHERE team_id = $1 AND (gps_lat IS NOT NULL OR gps_lon IS NOT NULL)',
        { bind: [auth.teamId], transaction },
      );
    }
  });
  return getTeam(auth);
}

const pending = () => ({ usedAt: null, expiresAt: { [Op.gt]: new Date() } });

async function invitationOut(i: InvitationModel): Promise<Invitation> {
  const by = await UserModel.findByPk(i.invitedBy, { attributes: ['name'] });
  return {
    id: i.id,
    email: i.email,
    role: i.role,
    invitedByName: by?.name ?? '',
    createdAt: i.createdAt.toISOString(),
    expiresAt: i.expiresAt.toISOString(),
  };
}

export async function listInvitations(auth: AuthContext): Promise<Invitation[]> {
  const rows = await InvitationModel.findAll({ where: { teamId: auth.teamId, ...pending() }, order: [['createdAt', 'DESC']] });
  return Promise.all(rows.map(invitationOut));
}

/** Invite someone by e-mail with a role. A newer invitation to the same address replaces the older one. */
export async function invite(auth: AuthContext, input: InviteInput): Promise<Invitation> {
  const existingUser = await UserModel.findOne({ where: { email: input.email } });
  if (existingUser && (await MembershipModel.findOne({ where: { teamId: auth.teamId, userId: existingUser.id } }))) {
    throw new Conflict(`${input.email} is a member of this workshop already`);
  }
  const team = await TeamModel.findByPk(auth.teamId);
  if (!team) throw new NotFound('workshop');
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + TOKEN_TTL.invitation);
  const row = await InvitationModel.sequelize!.transaction(async (transaction) => {
    await InvitationModel.destroy({ where: { teamId: auth.teamId, email: input.email, usedAt: null }, transaction });
    return InvitationModel.create(
      { id: randomUUID(), teamId: auth.teamId, email: input.email, role: input.role, tokenHash: hash, invitedBy: auth.userId, expiresAt },
      { transaction },
    );
  });
  try {
    const mail = invitationMail({ to: input.email, teamName: team.name, role: input.role, invitedBy: auth.name, token, expiresAt });
    await sendWithinQuota(auth, 'invitation', mail, async () => mail);
  } catch (err) {
    await row.destroy();
    if (err instanceof AppError) throw err;
    throw new AppError(502, 'mail_failed', 'the invitation e-mail could not be sent; nothing was saved, try again');
  }
  return invitationOut(row);
}

export async function revokeInvitation(auth: AuthContext, id: string): Promise<void> {
  const n = await InvitationModel.destroy({ where: { id, teamId: auth.teamId, usedAt: null } });
  if (!n) throw new NotFound('invitation');
}

/** Lock the team's memberships, so two admins cannot demote or remove each other at once. */
async function lockedMembers(teamId: string, transaction: Transaction) {
  return MembershipModel.findAll({ where: { teamId }, lock: transaction.LOCK.UPDATE, transaction });
}

const lastAdmin = () => new Conflict('a workshop needs at least one admin: make someone else admin first');

export async function changeRole(auth: AuthContext, userId: string, role: Role): Promise<Member> {
  await MembershipModel.sequelize!.transaction(async (transaction) => {
    const all = await lockedMembers(auth.teamId, transaction);
    const target = all.find((m) => m.userId === userId);
    if (!target) throw new NotFound('member');
    const admins = all.filter((m) => m.role === 'admin').length;
    if (target.role === 'admin' && role !== 'admin' && admins <= 1) throw lastAdmin();
    if (target.role !== role) await target.update({ role }, { transaction });
  });
  const { members } = await getTeam(auth);
  return members.find((m) => m.userId === userId)!;
}

export async function removeMember(auth: AuthContext, userId: string): Promise<void> {
  await MembershipModel.sequelize!.transaction(async (transaction) => {
    const all = await lockedMembers(auth.teamId, transaction);
    const target = all.find((m) => m.userId === userId);
    if (!target) throw new NotFound('member');
    const admins = all.filter((m) => m.role === 'admin').length;
    if (target.role === 'admin' && admins <= 1) throw lastAdmin();
    await target.destroy({ transaction });
  });
  // Their sessions in this workshop end now (context.ts would refuse them anyway).
  await endTeamSessions(userId, auth.teamId);
}

// ---------------------------------------------------------------------------------------------
// The invitee's side: public routes, the token is the only credential.

async function findPendingInvitation(token: string) {
  const i = await InvitationModel.findOne({ where: { tokenHash: hashToken(token), ...pending() } });
  if (!i) throw new LinkInvalid();
  return i;
}

export async function previewInvitation(token: string): Promise<InvitationPreview> {
  const i = await findPendingInvitation(token);
  const [team, by, user] = await Promise.all([
    TeamModel.findByPk(i.teamId),
    UserModel.findByPk(i.invitedBy, { attributes: ['name'] }),
    UserModel.findOne({ where: { email: i.email }, attributes: ['id'] }),
  ]);
  return {
    email: i.email,
    role: i.role,
    teamName: team?.name ?? '',
    invitedByName: by?.name ?? '',
    // Only the holder of the link (the invited address) learns this.
    hasAccount: !!user,
    expiresAt: i.expiresAt.toISOString(),
  };
}

/**
 * Join with an invitation (once). A new person sets a name and password; someone with an
 * account already confirms with their password. Returns whom to sign in, into the invited team.
 */
export async function acceptInvitation(input: AcceptInvitationInput): Promise<{ userId: string; teamId: string }> {
  const invitation = await findPendingInvitation(input.token);
  const existing = await UserModel.findOne({ where: { email: invitation.email } });
  let newUser: { id: string; passwordHash: string; name: string } | null = null;
  if (existing) {
    if (!(await verifyPassword(existing.passwordHash, input.password))) {
      throw new Invalid('that is not the password of your account', [{ field: 'body.password', message: 'this is not the password of your account' }]);
    }
  } else {
    if (!input.name) throw new Invalid('enter your name', [{ field: 'body.name', message: 'enter your name' }]);
    if (input.password.length < 10) throw new Invalid('use at least 10 characters', [{ field: 'body.password', message: 'use at least 10 characters' }]);
    newUser = { id: randomUUID(), passwordHash: await hashPassword(input.password), name: input.name };
  }
  return InvitationModel.sequelize!.transaction(async (transaction) => {
    const [, rows] = await InvitationModel.update({ usedAt: new Date() }, { where: { id: invitation.id, ...pending() }, returning: true, transaction });
    const used = rows[0];
    if (!used) throw new LinkInvalid();
    let userId = existing?.id;
    if (newUser) {
      if (await UserModel.findOne({ where: { email: used.email }, transaction })) throw new LinkInvalid();
      await UserModel.create({ id: newUser.id, email: used.email, name: newUser.name, passwordHash: newUser.passwordHash }, { transaction });
      userId = newUser.id;
    }
    // Someone has now confirmed an e-mail address of this workshop (mail quotas count on it).
    await TeamModel.update({ emailConfirmedAt: new Date() }, { where: { id: used.teamId, emailConfirmedAt: null }, transaction });
    const already = await MembershipModel.findOne({ where: { teamId: used.teamId, userId: userId! }, transaction });
    if (!already) await MembershipModel.create({ id: randomUUID(), teamId: used.teamId, userId: userId!, role: used.role }, { transaction });
    return { userId: userId!, teamId: used.teamId };
  });
}
