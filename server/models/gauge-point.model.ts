// The gauge points table: its columns and typed fields come from shared/records/gauge-point.ts.
import type { Sequelize } from 'sequelize';
import { gaugePointRecord } from '../../shared/records/gauge-point';
import { initSynced, syncedModel } from './synced-model';

export const GaugePointModel = syncedModel(gaugePointRecord);
export type GaugePointModel = InstanceType<typeof GaugePointModel>;

export const initGaugePoint = (sequelize: Sequelize) => initSynced(GaugePointModel, gaugePointRecord, sequelize);
