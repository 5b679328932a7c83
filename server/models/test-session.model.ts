// The test sessions table: its columns and typed fields come from shared/records/test-session.ts.
import type { Sequelize } from 'sequelize';
import { testSessionRecord } from '../../shared/records/test-session';
import { initSynced, syncedModel } from './synced-model';

export const TestSessionModel = syncedModel(testSessionRecord);
export type TestSessionModel = InstanceType<typeof TestSessionModel>;

export const initTestSession = (sequelize: Sequelize) => initSynced(TestSessionModel, testSessionRecord, sequelize);
