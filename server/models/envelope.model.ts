import { DataTypes, type CreationOptional, type Sequelize } from 'sequelize';
import { syncedColumns, VersionedTeamModel } from './synced-model';

export class EnvelopeModel extends VersionedTeamModel<EnvelopeModel> {
  declare vehicleId: string;
  declare sessionId: string;
  declare revision: CreationOptional<number>;
  declare status: CreationOptional<'draft' | 'signed' | 'superseded'>;
  declare params: object;
  declare snapshot: CreationOptional<object | null>;
  declare contentHash: CreationOptional<string | null>;
  declare signedBy: CreationOptional<string | null>;
  declare signedAt: CreationOptional<Date | null>;
}

export function initEnvelope(sequelize: Sequelize) {
  EnvelopeModel.init(
    {
      ...syncedColumns,
      vehicleId: { type: DataTypes.UUID, allowNull: false },
      sessionId: { type: DataTypes.UUID, allowNull: false },
      revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
      params: { type: DataTypes.JSONB, allowNull: false },
      snapshot: { type: DataTypes.JSONB, allowNull: true },
      contentHash: { type: DataTypes.TEXT, allowNull: true },
      signedBy: { type: DataTypes.UUID, allowNull: true },
      signedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'envelopes' },
  );
}
