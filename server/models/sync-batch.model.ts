import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** The stored answer to one pushed batch, keyed by its idempotency key, so a retry gets the same answer. */
export class SyncBatchModel extends Model<InferAttributes<SyncBatchModel>, InferCreationAttributes<SyncBatchModel>> {
  declare teamId: string;
  declare idempotencyKey: string;
  declare userId: string;
  declare requestHash: string;
  declare response: object;
  declare createdAt: CreationOptional<Date>;
}

export function initSyncBatch(sequelize: Sequelize) {
  SyncBatchModel.init(
    {
      teamId: { type: DataTypes.UUID, primaryKey: true },
      idempotencyKey: { type: DataTypes.TEXT, primaryKey: true },
      userId: { type: DataTypes.UUID, allowNull: false },
      requestHash: { type: DataTypes.TEXT, allowNull: false },
      response: { type: DataTypes.JSONB, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'sync_batches', updatedAt: false },
  );
}
