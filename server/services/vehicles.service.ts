// The desk's and the field's reads of vehicles. Vehicles and gauge points are written only through
// sync push (sync-push.ts), from the setup screen's phone store like every other synced record, so
// one set of rules (access per field, label uniqueness, a stale edit kept as a conflict) holds.
import { GaugePointModel, VehicleModel } from '../models';
import { NotFound } from '../http/errors';
import { toRecord } from './to-record';
import type { AuthContext } from '../auth/context';

export async function listVehicles(auth: AuthContext) {
  const rows = await VehicleModel.findAll({ where: { teamId: auth.teamId, deletedAt: null }, order: [['name', 'ASC']] });
  return rows.map((v) => toRecord('vehicle', v));
}

export async function getVehicle(auth: AuthContext, id: string) {
  const v = await VehicleModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null } });
  if (!v) throw new NotFound('vehicle');
  const points = await GaugePointModel.findAll({ where: { vehicleId: id, teamId: auth.teamId, deletedAt: null }, order: [['label', 'ASC']] });
  return { ...toRecord('vehicle', v), gaugePoints: points.map((g) => toRecord('gaugePoint', g)) };
}
