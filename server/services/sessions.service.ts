import { GaugePointModel, PoseModel, ReadingModel, TestSessionModel, VehicleModel } from '../models';
import { NotFound } from '../http/errors';
import { gaugePointOut, poseOut, readingOut, testSessionOut, vehicleOut } from './serialize';
import type { AuthContext } from '../auth/context';

export async function listSessions(auth: AuthContext) {
  const rows = await TestSessionModel.findAll({
    where: { teamId: auth.teamId, deletedAt: null },
    order: [['testedOn', 'DESC'], ['createdAt', 'DESC']],
    include: [{ model: VehicleModel, as: 'vehicle', attributes: ['name'] }],
  });
  return rows.map((s) => ({ ...testSessionOut(s), vehicleName: (s as unknown as { vehicle?: { name: string } }).vehicle?.name ?? '' }));
}

/** A whole session with its vehicle, gauge points, poses and readings: what review and the envelope need. */
export async function getSessionDetail(auth: AuthContext, id: string) {
  const s = await TestSessionModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null } });
  if (!s) throw new NotFound('session');
  const [v, points, poses] = await Promise.all([
    VehicleModel.findOne({ where: { id: s.vehicleId, teamId: auth.teamId } }),
    GaugePointModel.findAll({ where: { vehicleId: s.vehicleId, teamId: auth.teamId, deletedAt: null }, order: [['label', 'ASC']] }),
    PoseModel.findAll({ where: { sessionId: id, teamId: auth.teamId, deletedAt: null }, order: [['seq', 'ASC']] }),
  ]);
  if (!v) throw new NotFound('vehicle');
  const readings = poses.length
    ? await ReadingModel.findAll({ where: { teamId: auth.teamId, poseId: poses.map((p) => p.id), deletedAt: null } })
    : [];
  return {
    session: testSessionOut(s),
    vehicle: vehicleOut(v),
    gaugePoints: points.map(gaugePointOut),
    poses: poses.map(poseOut),
    readings: readings.map(readingOut),
  };
}
