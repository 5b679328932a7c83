import type { UnitSystem } from '@shared/schemas';
import { useMe } from '@/lib/auth/get-me';
import { useMetaValue } from '@/lib/db/live';
import { setMeta } from '@/lib/db/meta';

/** The unit shown on this phone: the tester's choice here, else the user's or team's setting. */
export function useFieldUnit(): [UnitSystem, (u: UnitSystem) => void] {
  const me = useMe();
  const chosen = useMetaValue('unit');
  const unit = chosen ?? me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  return [unit, (u) => void setMeta('unit', u)];
}
