// The vehicles table: its columns and typed fields come from shared/records/vehicle.ts.
import type { Sequelize } from 'sequelize';
import { vehicleRecord } from '../../shared/records/vehicle';
import { initSynced, syncedModel } from './synced-model';

export const VehicleModel = syncedModel(vehicleRecord);
export type VehicleModel = InstanceType<typeof VehicleModel>;

export const initVehicle = (sequelize: Sequelize) => initSynced(VehicleModel, vehicleRecord, sequelize);
