// The readings table: its columns and typed fields come from shared/records/reading.ts.
import type { Sequelize } from 'sequelize';
import { readingRecord } from '../../shared/records/reading';
import { initSynced, syncedModel } from './synced-model';

export const ReadingModel = syncedModel(readingRecord);
export type ReadingModel = InstanceType<typeof ReadingModel>;

export const initReading = (sequelize: Sequelize) => initSynced(ReadingModel, readingRecord, sequelize);
