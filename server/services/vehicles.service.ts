// The desk's vehicles. Vehicles and gauge points are written only through sync push
// (sync-push.ts), from the setup screen's phone store like every other synced record, so one set
// of rules (access per field, label uniqueness, a stale edit kept as a conflict) holds; the field
// and the setup screen read them from the phone store.
import { QueryTypes } from 'sequelize';
import { EnvelopeModel, GaugePointModel, TestSessionModel, VehicleModel } from '../models';
import { NotFound } from '../http/errors';
import { toRecord } from './to-record';
import type { AuthContext } from '../auth/context';
import type { VehicleDesk } from '../../shared/desk-responses';

export async function listVehicles(auth: AuthContext) {
  const rows = await VehicleModel.findAll({ where: { teamId: auth.teamId, deletedAt: null }, order: [['name', 'ASC']] });
  return rows.map((v) => toRecord('vehicle', v));
}

/** One vehicle at the desk: its gauge points, and its sessions (newest first) with how much each holds and its envelope revisions. */
export async function getVehicleDesk(auth: AuthContext, id: string): Promise<VehicleDesk> {
  const scope = { teamId: auth.teamId, deletedAt: null };
  const vehicle = await VehicleModel.findOne({ where: { id, ...scope } });
  if (!vehicle) throw new NotFound('vehicle');
  const [points, sessions, envelopes, counts] = await Promise.all([
    GaugePointModel.findAll({ where: { vehicleId: id, ...scope }, order: [['label', 'ASC']] }),
    TestSessionModel.findAll({
      where: { vehicleId: id, ...scope },
      order: [
        ['testedOn', 'DESC'],
        ['createdAt', 'DESC'],
      ],
    }),
    EnvelopeModel.findAll({
      where: { vehicleId: id, ...scope },
      attributes: ['id', 'sessionId', 'revision', 'status', 'signedAt'],
      order: [['revision', 'DESC']],
    }),
    VehicleModel.sequelize!.query<{ session_id: string; poses: number; readings: number }>(
      `SELECT p.session_id, count(DISTINCT p.id)::int AS poses, count(r.id)::int AS readings
         FROM poses p
         JOIN test_sessions s ON s.id = p.session_id AND s.vehicle_id = :id AND s.team_id = :teamId AND s.deleted_at IS NULL
         LEFT JOIN readings r ON r.pose_id = p.id AND r.deleted_at IS NULL
        WHERE p.team_id = :teamId AND p.deleted_at IS NULL
        GROUP BY p.session_id`,
      { replacements: { id, teamId: auth.teamId }, type: QueryTypes.SELECT },
    ),
  ]);
  const countOf = new Map(counts.map((c) => [c.session_id, c]));
  return {
    vehicle: toRecord('vehicle', vehicle),
    gaugePoints: points.map((g) => toRecord('gaugePoint', g)),
    sessions: sessions.map((s) => ({
      ...toRecord('testSession', s),
      poseCount: countOf.get(s.id)?.poses ?? 0,
      readingCount: countOf.get(s.id)?.readings ?? 0,
      envelopes: envelopes
        .filter((e) => e.sessionId === s.id)
        .map((e) => ({ id: e.id, revision: e.revision, status: e.status, signedAt: e.signedAt?.toISOString() ?? null })),
    })),
  };
}
