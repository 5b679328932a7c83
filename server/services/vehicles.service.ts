// The desk's list of vehicles. Vehicles and gauge points are written only through sync push
// (sync-push.ts), from the setup screen's phone store like every other synced record, so one set
// of rules (access per field, label uniqueness, a stale edit kept as a conflict) holds; the field
// and the setup screen read them from the phone store.
import { VehicleModel } from '../models';
import { toRecord } from './to-record';
import type { AuthContext } from '../auth/context';

export async function listVehicles(auth: AuthContext) {
  const rows = await VehicleModel.findAll({ where: { teamId: auth.teamId, deletedAt: null }, order: [['name', 'ASC']] });
  return rows.map((v) => toRecord('vehicle', v));
}
