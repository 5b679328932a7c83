import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { syncedColumns } from './synced-columns';
import type { Wheel } from '../../shared/schemas';

export class PoseModel extends Model<InferAttributes<PoseModel>, InferCreationAttributes<PoseModel>> {
  declare id: string;
  declare teamId: string;
  declare sessionId: string;
  declare seq: number;
  declare label: CreationOptional<string>;
  declare kind: 'level' | 'wheels' | 'ramp';
  declare liftFlMm: number;
  declare liftFrMm: number;
  declare liftRlMm: number;
  declare liftRrMm: number;
  declare rampAngleDeg: number | null;
  declare rampDistanceMm: number | null;
  declare rampWheel: CreationOptional<Wheel | null>;
  declare notes: CreationOptional<string>;
  declare recordedAt: Date;
  declare createdBy: string;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPose(sequelize: Sequelize) {
  PoseModel.init(
    {
      ...syncedColumns,
      sessionId: { type: DataTypes.UUID, allowNull: false },
      seq: { type: DataTypes.INTEGER, allowNull: false },
      label: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      kind: { type: DataTypes.TEXT, allowNull: false },
      liftFlMm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      liftFrMm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      liftRlMm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      liftRrMm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      rampAngleDeg: { type: DataTypes.DOUBLE, allowNull: true },
      rampDistanceMm: { type: DataTypes.DOUBLE, allowNull: true },
      rampWheel: { type: DataTypes.TEXT, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      recordedAt: { type: DataTypes.DATE, allowNull: false },
      createdBy: { type: DataTypes.UUID, allowNull: false },
    },
    { sequelize, tableName: 'poses' },
  );
}
