import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class TeamModel extends Model<InferAttributes<TeamModel>, InferCreationAttributes<TeamModel>> {
  declare id: string;
  declare name: string;
  declare unitSystem: CreationOptional<'mm' | 'in'>;
  /** When the workshop's first e-mail address was confirmed (sign-up link, or a member joining by invitation). */
  declare emailConfirmedAt: CreationOptional<Date | null>;
  /** Whether photos keep the GPS position read from their EXIF ('keep') or lose it at upload ('drop'). */
  declare photoGps: CreationOptional<'keep' | 'drop'>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initTeam(sequelize: Sequelize) {
  TeamModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      name: { type: DataTypes.TEXT, allowNull: false },
      unitSystem: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'mm' },
      emailConfirmedAt: { type: DataTypes.DATE, allowNull: true },
      photoGps: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'drop' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'teams' },
  );
}
