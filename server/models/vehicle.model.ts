import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { syncedColumns } from './synced-columns';
import type { Opening } from '../../shared/schemas/vehicle';
export class VehicleModel extends Model<InferAttributes<VehicleModel>, InferCreationAttributes<VehicleModel>> {
  declare id: string;
  declare teamId: string;
  declare name: string;
  declare chassis: CreationOptional<string>;
  declare body: CreationOptional<string>;
  declare wheelbaseMm: number;
  declare trackFrontMm: number;
  declare trackRearMm: number;
  declare opening: Opening;
  declare nominalGapMm: CreationOptional<number>;
  declare notes: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initVehicle(sequelize: Sequelize) {
  VehicleModel.init(
    {
      ...syncedColumns,
      name: { type: DataTypes.TEXT, allowNull: false },
      chassis: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      body: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      wheelbaseMm: { type: DataTypes.DOUBLE, allowNull: false },
      trackFrontMm: { type: DataTypes.DOUBLE, allowNull: false },
      trackRearMm: { type: DataTypes.DOUBLE, allowNull: false },
      opening: { type: DataTypes.JSONB, allowNull: false },
      nominalGapMm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    },
    { sequelize, tableName: 'vehicles' },
  );
}
