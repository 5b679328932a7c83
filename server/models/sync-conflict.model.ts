import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A stale edit: both versions kept until a person picks one. */
export class SyncConflictModel extends Model<InferAttributes<SyncConflictModel>, InferCreationAttributes<SyncConflictModel>> {
  declare id: string;
  declare teamId: string;
  declare entity: string;
  declare entityId: string;
  declare baseVersion: number;
  declare serverVersion: number;
  declare clientRecord: object;
  declare serverRecord: object;
  declare userId: string;
  declare resolvedAt: CreationOptional<Date | null>;
  declare resolvedBy: CreationOptional<string | null>;
  declare resolution: CreationOptional<string | null>;
  declare changeSeq: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initSyncConflict(sequelize: Sequelize) {
  SyncConflictModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      teamId: { type: DataTypes.UUID, allowNull: false },
      entity: { type: DataTypes.TEXT, allowNull: false },
      entityId: { type: DataTypes.UUID, allowNull: false },
      baseVersion: { type: DataTypes.INTEGER, allowNull: false },
      serverVersion: { type: DataTypes.INTEGER, allowNull: false },
      clientRecord: { type: DataTypes.JSONB, allowNull: false },
      serverRecord: { type: DataTypes.JSONB, allowNull: false },
      userId: { type: DataTypes.UUID, allowNull: false },
      resolvedAt: { type: DataTypes.DATE, allowNull: true },
      resolvedBy: { type: DataTypes.UUID, allowNull: true },
      resolution: { type: DataTypes.TEXT, allowNull: true },
      changeSeq: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'sync_conflicts' },
  );
}
