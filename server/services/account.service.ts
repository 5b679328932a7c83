// A person's own settings: name and preferred unit (mm/in; null follows the workshop's).
import { UserModel } from '../models';
import type { AuthContext } from '../auth/context';
import { Unauthenticated } from '../http/errors';
import type { UpdateMeInput } from '../../shared/schemas/account';
import { describeMe } from './auth.service';

export async function updateMe(auth: AuthContext, input: UpdateMeInput) {
  const user = await UserModel.findByPk(auth.userId);
  if (!user) throw new Unauthenticated();
  const changes: Partial<{ name: string; unitSystem: 'mm' | 'in' | null }> = {};
  if (input.name !== undefined) changes.name = input.name;
  if (input.unitSystem !== undefined) changes.unitSystem = input.unitSystem;
  if (Object.keys(changes).length) await user.update(changes);
  return describeMe({ ...auth, name: user.name, unitSystem: user.unitSystem ?? null });
}
