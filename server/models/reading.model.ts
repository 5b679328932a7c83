import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { syncedColumns } from './synced-columns';
import type { Axis } from '../../shared/schemas/common';
export class ReadingModel extends Model<InferAttributes<ReadingModel>, InferCreationAttributes<ReadingModel>> {
  declare id: string;
  declare teamId: string;
  declare poseId: string;
  declare gaugePointId: string;
  declare axis: Axis;
  declare valueMm: number;
  declare enteredBy: string;
  declare excluded: CreationOptional<boolean>;
  declare excludeReason: CreationOptional<string | null>;
  declare flagNote: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initReading(sequelize: Sequelize) {
  ReadingModel.init(
    {
      ...syncedColumns,
      poseId: { type: DataTypes.UUID, allowNull: false },
      gaugePointId: { type: DataTypes.UUID, allowNull: false },
      axis: { type: DataTypes.TEXT, allowNull: false },
      valueMm: { type: DataTypes.DOUBLE, allowNull: false },
      enteredBy: { type: DataTypes.UUID, allowNull: false },
      excluded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      excludeReason: { type: DataTypes.TEXT, allowNull: true },
      flagNote: { type: DataTypes.TEXT, allowNull: true },
    },
    { sequelize, tableName: 'readings' },
  );
}
