import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { syncedColumns } from './synced-columns';

export class TestSessionModel extends Model<InferAttributes<TestSessionModel>, InferCreationAttributes<TestSessionModel>> {
  declare id: string;
  declare teamId: string;
  declare vehicleId: string;
  declare title: CreationOptional<string>;
  declare testedOn: string;
  declare conditions: CreationOptional<string>;
  declare loadState: CreationOptional<string>;
  declare tyrePressures: CreationOptional<string>;
  declare crew: CreationOptional<string>;
  declare readingMode: 'gap' | 'displacement';
  declare safetyAckAt: CreationOptional<Date | null>;
  declare safetyAckBy: CreationOptional<string | null>;
  declare notes: CreationOptional<string>;
  declare createdBy: string;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initTestSession(sequelize: Sequelize) {
  TestSessionModel.init(
    {
      ...syncedColumns,
      vehicleId: { type: DataTypes.UUID, allowNull: false },
      title: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      testedOn: { type: DataTypes.DATEONLY, allowNull: false },
      conditions: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      loadState: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      tyrePressures: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      crew: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      readingMode: { type: DataTypes.TEXT, allowNull: false },
      safetyAckAt: { type: DataTypes.DATE, allowNull: true },
      safetyAckBy: { type: DataTypes.UUID, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdBy: { type: DataTypes.UUID, allowNull: false },
    },
    { sequelize, tableName: 'test_sessions' },
  );
}
