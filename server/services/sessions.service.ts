import { EnvelopeModel, GaugePointModel, PoseModel, ReadingModel, TestSessionModel, VehicleModel } from '../models';
import { NotFound } from '../http/errors';
import { toRecord } from './to-record';
import type { AuthContext } from '../auth/context';
import type { Transaction } from 'sequelize';
import type { SessionDetail, SessionSummary } from '../../shared/desk-responses';

/** The team's sessions, newest first, each with its vehicle's name and its latest signed-off envelope revision (or null). */
export async function listSessions(auth: AuthContext): Promise<SessionSummary[]> {
  const rows = await TestSessionModel.findAll({
    where: { teamId: auth.teamId, deletedAt: null },
    order: [
      ['testedOn', 'DESC'],
      ['createdAt', 'DESC'],
    ],
    include: [{ model: VehicleModel, as: 'vehicle', attributes: ['name'] }],
  });
  const signed = await EnvelopeModel.findAll({
    where: { teamId: auth.teamId, status: 'signed', deletedAt: null },
    attributes: ['sessionId', 'revision', 'signedAt'],
    order: [['revision', 'ASC']],
  });
  const latestSigned = new Map(signed.map((e) => [e.sessionId, { revision: e.revision, signedAt: e.signedAt!.toISOString() }]));
  return rows.map((s) => ({
    ...toRecord('testSession', s),
    vehicleName: (s as unknown as { vehicle?: { name: string } }).vehicle?.name ?? '',
    signed: latestSigned.get(s.id) ?? null,
  }));
}

/** A reading with who entered it: the desk shows the person beside each value. */
export const readingOut = (r: ReadingModel) => ({ ...toRecord('reading', r), enteredBy: r.enteredBy });

/** A whole session with its vehicle, gauge points, poses and readings: what review and the envelope need. */
// `transaction` lets a sign-off read the readings it freezes inside its own transaction.
export async function getSessionDetail(
  auth: Pick<AuthContext, 'teamId'>,
  id: string,
  { transaction }: { transaction?: Transaction } = {},
): Promise<SessionDetail> {
  const s = await TestSessionModel.findOne({ where: { id, teamId: auth.teamId, deletedAt: null }, transaction });
  if (!s) throw new NotFound('session');
  // One after another: queries of one transaction share its connection.
  const v = await VehicleModel.findOne({ where: { id: s.vehicleId, teamId: auth.teamId }, transaction });
  const points = await GaugePointModel.findAll({
    where: { vehicleId: s.vehicleId, teamId: auth.teamId, deletedAt: null },
    order: [['label', 'ASC']],
    transaction,
  });
  // Plain rows for the many: building a model instance per reading costs more than the query.
  const poses = await PoseModel.findAll({
    where: { sessionId: id, teamId: auth.teamId, deletedAt: null },
    order: [['seq', 'ASC']],
    transaction,
    raw: true,
    attributes: { exclude: ['createdAt', 'updatedAt'] },
  });
  if (!v) throw new NotFound('vehicle');
  const readings = poses.length
    ? await ReadingModel.findAll({
        where: { teamId: auth.teamId, poseId: poses.map((p) => p.id), deletedAt: null },
        order: [
          ['createdAt', 'ASC'],
          ['id', 'ASC'],
        ],
        transaction,
        raw: true,
        attributes: { exclude: ['createdAt', 'updatedAt'] },
      })
    : [];
  return {
    session: toRecord('testSession', s),
    vehicle: toRecord('vehicle', v),
    gaugePoints: points.map((g) => toRecord('gaugePoint', g)),
    poses: poses.map((p) => toRecord('pose', p)),
    readings: readings.map(readingOut),
  };
}
