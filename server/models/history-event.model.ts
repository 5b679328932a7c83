import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One change a person made to a session's records (flag, exclusion, edit, sign-off). */
export class HistoryEventModel extends Model<InferAttributes<HistoryEventModel>, InferCreationAttributes<HistoryEventModel>> {
  declare id: CreationOptional<number>;
  declare teamId: string;
  declare sessionId: string | null;
  declare entity: string;
  declare entityId: string;
  declare action: string;
  declare userId: string | null;
  declare detail: CreationOptional<object>;
  declare createdAt: CreationOptional<Date>;
}

export function initHistoryEvent(sequelize: Sequelize) {
  HistoryEventModel.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      teamId: { type: DataTypes.UUID, allowNull: false },
      sessionId: { type: DataTypes.UUID, allowNull: true },
      entity: { type: DataTypes.TEXT, allowNull: false },
      entityId: { type: DataTypes.UUID, allowNull: false },
      action: { type: DataTypes.TEXT, allowNull: false },
      userId: { type: DataTypes.UUID, allowNull: true },
      detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'history_events', updatedAt: false },
  );
}
