// All models and their associations, initialised once per Sequelize instance.
import type { Sequelize } from 'sequelize';
import { initTeam, TeamModel } from './team.model';
import { initUser, UserModel } from './user.model';
import { initMembership, MembershipModel } from './membership.model';
import { initUserSession } from './user-session.model';
import { initInvitation } from './invitation.model';
import { initPasswordReset } from './password-reset.model';
import { initVehicle, VehicleModel } from './vehicle.model';
import { initGaugePoint, GaugePointModel } from './gauge-point.model';
import { initTestSession, TestSessionModel } from './test-session.model';
import { initPose, PoseModel } from './pose.model';
import { initReading, ReadingModel } from './reading.model';
import { initPhoto, PhotoModel } from './photo.model';
import { initEnvelope, EnvelopeModel } from './envelope.model';
import { initEnvelopeSend, EnvelopeSendModel } from './envelope-send.model';
import { initHistoryEvent } from './history-event.model';
import { initSyncConflict } from './sync-conflict.model';

export { TeamModel } from './team.model';
export { UserModel } from './user.model';
export { MembershipModel } from './membership.model';
export { UserSessionModel } from './user-session.model';
export { InvitationModel } from './invitation.model';
export { PasswordResetModel } from './password-reset.model';
export { VehicleModel } from './vehicle.model';
export { GaugePointModel } from './gauge-point.model';
export { TestSessionModel } from './test-session.model';
export { PoseModel } from './pose.model';
export { ReadingModel } from './reading.model';
export { PhotoModel } from './photo.model';
export { EnvelopeModel } from './envelope.model';
export { EnvelopeSendModel } from './envelope-send.model';
export { HistoryEventModel } from './history-event.model';
export { SyncConflictModel } from './sync-conflict.model';

export function initModels(sequelize: Sequelize) {
  for (const init of [
    initTeam,
    initUser,
    initMembership,
    initUserSession,
    initInvitation,
    initPasswordReset,
    initVehicle,
    initGaugePoint,
    initTestSession,
    initPose,
    initReading,
    initPhoto,
    initEnvelope,
    initEnvelopeSend,
    initHistoryEvent,
    initSyncConflict,
  ])
    init(sequelize);

  MembershipModel.belongsTo(UserModel, { foreignKey: 'userId', as: 'user' });
  MembershipModel.belongsTo(TeamModel, { foreignKey: 'teamId', as: 'team' });
  GaugePointModel.belongsTo(VehicleModel, { foreignKey: 'vehicleId', as: 'vehicle' });
  VehicleModel.hasMany(GaugePointModel, { foreignKey: 'vehicleId', as: 'gaugePoints' });
  TestSessionModel.belongsTo(VehicleModel, { foreignKey: 'vehicleId', as: 'vehicle' });
  TestSessionModel.hasMany(PoseModel, { foreignKey: 'sessionId', as: 'poses' });
  PoseModel.hasMany(ReadingModel, { foreignKey: 'poseId', as: 'readings' });
  ReadingModel.belongsTo(PoseModel, { foreignKey: 'poseId', as: 'pose' });
  PhotoModel.belongsTo(TestSessionModel, { foreignKey: 'sessionId', as: 'session' });
  EnvelopeModel.belongsTo(TestSessionModel, { foreignKey: 'sessionId', as: 'session' });
  EnvelopeModel.hasMany(EnvelopeSendModel, { foreignKey: 'envelopeId', as: 'sends' });
}
