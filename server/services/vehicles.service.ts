import { Op } from 'sequelize';
import type { GaugePoint, Vehicle } from '../../shared/schemas';
import { GaugePointModel, VehicleModel } from '../models';
import { Conflict, Invalid, NotFound } from '../http/errors';
import { gaugePointOut, vehicleOut } from './serialize';
import { withTeamChanges } from './team-changes';
import type { AuthContext } from '../auth/context';

export async function listVehicles(auth: AuthContext) {
  const rows = await VehicleModel.findAll({ where: { teamId: auth.teamId, deletedAt: null }, order: [['name', 'ASC']] });
  return rows.map(vehicleOut);
}

export async function getVehicle(auth: AuthContext, id: string) {
  const v = await VehicleModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null } });
  if (!v) throw new NotFound('vehicle');
  const points = await GaugePointModel.findAll({ where: { vehicleId: id, teamId: auth.teamId, deletedAt: null }, order: [['label', 'ASC']] });
  return { ...vehicleOut(v), gaugePoints: points.map(gaugePointOut) };
}

type VehicleInput = Omit<Vehicle, 'version' | 'deletedAt'>;

export async function createVehicle(auth: AuthContext, input: VehicleInput) {
  const existing = await VehicleModel.findByPk(input.id);
  if (existing) {
    if (existing.teamId !== auth.teamId) throw new Conflict('that id is taken');
    return vehicleOut(existing);
  }
  const v = await withTeamChanges(auth.teamId, (transaction) => VehicleModel.create({ ...input, teamId: auth.teamId }, { transaction }));
  return vehicleOut(v);
}

/** Update with an optimistic version check: a stale edit is a 409, nothing is overwritten. */
export async function updateVehicle(auth: AuthContext, id: string, input: Omit<Vehicle, 'id' | 'deletedAt'>) {
  const v = await VehicleModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null } });
  if (!v) throw new NotFound('vehicle');
  if (v.version !== input.version) throw new Conflict(`vehicle was changed by someone else (yours: version ${input.version}, now: ${v.version})`);
  const { version, ...fields } = input;
  await withTeamChanges(auth.teamId, (transaction) => v.update({ ...fields, version: version + 1 }, { transaction }));
  return vehicleOut(v);
}

type PointInput = Omit<GaugePoint, 'version' | 'deletedAt' | 'vehicleId'>;

/** Replace a vehicle's gauge points with the given set; points left out are soft-deleted. */
export async function setGaugePoints(auth: AuthContext, vehicleId: string, points: PointInput[]) {
  const v = await VehicleModel.findOne({ where: { id: vehicleId, teamId: auth.teamId, deletedAt: null } });
  if (!v) throw new NotFound('vehicle');
  // Labels are unique per vehicle (checked by the database only at commit, where it could not name the point).
  const twice = points.findIndex((p, i) => points.findIndex((q) => q.label === p.label) !== i);
  if (twice >= 0) throw new Invalid(`gauge point label '${points[twice].label}' appears twice`, [{ field: `body.gaugePoints.${twice}.label`, message: 'already used by another gauge point' }]);
  await withTeamChanges(auth.teamId, async (transaction) => {
    const keep = points.map((p) => p.id);
    await GaugePointModel.update(
      { deletedAt: new Date() },
      { where: { vehicleId, teamId: auth.teamId, deletedAt: null, id: { [Op.notIn]: keep.length ? keep : ['00000000-0000-0000-0000-000000000000'] } }, transaction },
    );
    for (const p of points) {
      const row = await GaugePointModel.findOne({ where: { id: p.id }, transaction });
      if (row && row.teamId !== auth.teamId) throw new Conflict('that gauge point id is taken');
      if (row) await row.update({ label: p.label, yMm: p.yMm, zMm: p.zMm, deletedAt: null, version: row.version + 1 }, { transaction });
      else await GaugePointModel.create({ ...p, vehicleId, teamId: auth.teamId }, { transaction });
    }
  });
  return getVehicle(auth, vehicleId);
}
