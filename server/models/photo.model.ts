import { DataTypes, type CreationOptional, type Sequelize } from 'sequelize';
import { syncedColumns, VersionedTeamModel } from './synced-model';

export class PhotoModel extends VersionedTeamModel<PhotoModel> {
  declare sessionId: string;
  declare poseId: string | null;
  declare caption: CreationOptional<string>;
  declare storedName: string;
  declare thumbName: string;
  declare mime: string;
  declare width: number;
  declare height: number;
  declare bytes: number;
  declare capturedAt: Date | null;
  declare gpsLat: number | null;
  declare gpsLon: number | null;
}

export function initPhoto(sequelize: Sequelize) {
  PhotoModel.init(
    {
      ...syncedColumns,
      sessionId: { type: DataTypes.UUID, allowNull: false },
      poseId: { type: DataTypes.UUID, allowNull: true },
      caption: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      storedName: { type: DataTypes.TEXT, allowNull: false },
      thumbName: { type: DataTypes.TEXT, allowNull: false },
      mime: { type: DataTypes.TEXT, allowNull: false },
      width: { type: DataTypes.INTEGER, allowNull: false },
      height: { type: DataTypes.INTEGER, allowNull: false },
      bytes: { type: DataTypes.INTEGER, allowNull: false },
      capturedAt: { type: DataTypes.DATE, allowNull: true },
      gpsLat: { type: DataTypes.DOUBLE, allowNull: true },
      gpsLon: { type: DataTypes.DOUBLE, allowNull: true },
    },
    { sequelize, tableName: 'photos' },
  );
}
