import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { syncedColumns } from './synced-columns';

export class GaugePointModel extends Model<InferAttributes<GaugePointModel>, InferCreationAttributes<GaugePointModel>> {
  declare id: string;
  declare teamId: string;
  declare vehicleId: string;
  declare label: string;
  declare yMm: number;
  declare zMm: number;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initGaugePoint(sequelize: Sequelize) {
  GaugePointModel.init(
    {
      ...syncedColumns,
      vehicleId: { type: DataTypes.UUID, allowNull: false },
      label: { type: DataTypes.TEXT, allowNull: false },
      yMm: { type: DataTypes.DOUBLE, allowNull: false },
      zMm: { type: DataTypes.DOUBLE, allowNull: false },
    },
    { sequelize, tableName: 'gauge_points' },
  );
}
