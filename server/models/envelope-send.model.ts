import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One fabrication sheet sent by e-mail, logged on its envelope. */
export class EnvelopeSendModel extends Model<InferAttributes<EnvelopeSendModel>, InferCreationAttributes<EnvelopeSendModel>> {
  declare id: string;
  declare teamId: string;
  declare envelopeId: string;
  declare toEmail: string;
  declare sentBy: string;
  declare messageId: string | null;
  declare createdAt: CreationOptional<Date>;
}

export function initEnvelopeSend(sequelize: Sequelize) {
  EnvelopeSendModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      teamId: { type: DataTypes.UUID, allowNull: false },
      envelopeId: { type: DataTypes.UUID, allowNull: false },
      toEmail: { type: DataTypes.TEXT, allowNull: false },
      sentBy: { type: DataTypes.UUID, allowNull: false },
      messageId: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'envelope_sends', updatedAt: false },
  );
}
