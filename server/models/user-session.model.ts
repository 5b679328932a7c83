import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A signed-in browser (lucia session), scoped to one team. */
export class UserSessionModel extends Model<InferAttributes<UserSessionModel>, InferCreationAttributes<UserSessionModel>> {
  declare id: string;
  declare userId: string;
  declare teamId: string;
  declare expiresAt: Date;
  declare createdAt: CreationOptional<Date>;
}

export function initUserSession(sequelize: Sequelize) {
  UserSessionModel.init(
    {
      id: { type: DataTypes.TEXT, primaryKey: true },
      userId: { type: DataTypes.UUID, allowNull: false },
      teamId: { type: DataTypes.UUID, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'user_sessions', updatedAt: false },
  );
}
