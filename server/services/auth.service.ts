import { MembershipModel, TeamModel, UserModel } from '../models';
import { hashPassword, verifyPassword } from '../auth/lucia';
import { Unauthenticated } from '../http/errors';
import type { AuthContext } from '../auth/context';
import type { Me } from '../../shared/schemas';

// A real hash to verify against when the e-mail is unknown, so an unknown address takes as long
// as a wrong password and the answer gives nothing away.
let decoyHash: Promise<string> | undefined;

/** Check e-mail and password; one generic error for every kind of failure. */
export async function checkCredentials(email: string, password: string): Promise<{ userId: string; teamId: string }> {
  const user = await UserModel.findOne({ where: { email } });
  if (!user) {
    decoyHash ??= hashPassword('not-a-real-password-decoy');
    await verifyPassword(await decoyHash, password);
    throw new Unauthenticated('e-mail or password is wrong');
  }
  if (!(await verifyPassword(user.passwordHash, password))) throw new Unauthenticated('e-mail or password is wrong');
  const membership = await MembershipModel.findOne({ where: { userId: user.id }, order: [['createdAt', 'ASC']] });
  if (!membership) throw new Unauthenticated('e-mail or password is wrong');
  return { userId: user.id, teamId: membership.teamId };
}

export async function describeMe(auth: AuthContext): Promise<Me> {
  const [user, team] = await Promise.all([UserModel.findByPk(auth.userId), TeamModel.findByPk(auth.teamId)]);
  if (!user || !team) throw new Unauthenticated();
  return {
    user: { id: user.id, name: user.name, email: user.email, unitSystem: user.unitSystem ?? null },
    team: { id: team.id, name: team.name, unitSystem: team.unitSystem },
    role: auth.role,
  };
}
