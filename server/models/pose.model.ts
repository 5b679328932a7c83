// The poses table: its columns and typed fields come from shared/records/pose.ts.
import type { Sequelize } from 'sequelize';
import { poseRecord } from '../../shared/records/pose';
import { initSynced, syncedModel } from './synced-model';

export const PoseModel = syncedModel(poseRecord);
export type PoseModel = InstanceType<typeof PoseModel>;

export const initPose = (sequelize: Sequelize) => initSynced(PoseModel, poseRecord, sequelize);
