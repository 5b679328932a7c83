import { DataTypes } from 'sequelize';

/** Columns every synced record shares: team scope, optimistic version, change cursor, soft delete. */
export const syncedColumns = {
  id: { type: DataTypes.UUID, primaryKey: true },
  teamId: { type: DataTypes.UUID, allowNull: false },
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
  changeSeq: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
  deletedAt: { type: DataTypes.DATE, allowNull: true },
  createdAt: DataTypes.DATE,
  updatedAt: DataTypes.DATE,
};
