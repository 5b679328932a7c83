// What a synced record of shared/records means to Sequelize: its attributes (every column of the
// table, derived from the registry) and the typed fields of its model. A synced model file only
// names its record; a field added to the record is read and written by its model with no edit here.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type ModelAttributeColumnOptions,
  type ModelAttributes,
  type ModelStatic,
  type Sequelize,
} from 'sequelize';
import type * as z from 'zod';
import { tableColumns, type ColumnType, type RecordDefinition } from '../../shared/records/define';

const dataTypes: Record<ColumnType, ModelAttributeColumnOptions['type']> = {
  uuid: DataTypes.UUID,
  text: DataTypes.TEXT,
  float8: DataTypes.DOUBLE,
  int4: DataTypes.INTEGER,
  int8: DataTypes.BIGINT,
  bool: DataTypes.BOOLEAN,
  jsonb: DataTypes.JSONB,
  date: DataTypes.DATEONLY,
  timestamptz: DataTypes.DATE,
};

/** The Sequelize attributes of a synced record's table (column names follow from `underscored`). */
export function syncedAttributes(def: RecordDefinition): Record<string, ModelAttributeColumnOptions> {
  return Object.fromEntries(
    tableColumns(def).map((c) => [
      c.key,
      {
        type: dataTypes[c.type],
        allowNull: c.nullable,
        ...(c.key === 'id' ? { primaryKey: true } : {}),
        // Set by PostgreSQL when a row is created (defaults and the change_seq trigger).
        ...(c.key === 'version' ? { defaultValue: 1 } : c.key === 'changeSeq' ? { defaultValue: 0 } : {}),
      },
    ]),
  );
}

type TsOf<T extends ColumnType> = T extends 'uuid' | 'text' | 'date'
  ? string
  : T extends 'float8' | 'int4' | 'int8'
    ? number
    : T extends 'bool'
      ? boolean
      : T extends 'timestamptz'
        ? Date
        : unknown;
type Output<D extends RecordDefinition> = z.output<D['schema']>;
/** Fields whose column is a timestamptz: a Date on the model, an ISO string in the record. */
type Instants<D extends RecordDefinition> = { [K in keyof D['columns']]: D['columns'][K] extends 'timestamptz' ? K : never }[keyof D['columns']];

/** The record's fields as Sequelize holds them, with the created-by column. */
type RecordFields<D extends RecordDefinition> = {
  [K in Exclude<keyof Output<D>, 'version' | 'deletedAt'>]: K extends Instants<D> ? Date | Extract<Output<D>[K], null> : Output<D>[K];
} & { [K in D['createdBy'] & string]: string } & { teamId: string };
/** Columns the server or PostgreSQL fills. */
type FilledFields<D extends RecordDefinition> = {
  [K in keyof D['serverColumns']]: TsOf<D['serverColumns'][K]['type']> | (D['serverColumns'][K]['nullable'] extends true ? null : never);
} & { version: number; changeSeq: number; deletedAt: Date | null; createdAt: Date; updatedAt: Date };

/** The typed fields of a synced record's model. */
export type SyncedModelFields<D extends RecordDefinition> = RecordFields<D> & FilledFields<D>;
/** What creating a row takes: instants as a Date or an ISO string; what the server or PostgreSQL fills is optional. */
type CreationFields<D extends RecordDefinition> = {
  [K in keyof RecordFields<D>]: K extends Instants<D> ? RecordFields<D>[K] | string : RecordFields<D>[K];
} & Partial<Omit<FilledFields<D>, 'deletedAt'>> & { deletedAt?: Date | string | null };

/** The model instance of a synced record: a Sequelize model with the record's fields. */
export type SyncedModel<D extends RecordDefinition> = Model<SyncedModelFields<D>, CreationFields<D>> & SyncedModelFields<D>;

/**
 * The model class of a synced record, typed from its registry entry; `init` it with
 * `initSynced`. Its fields are not declared on the class (Sequelize reads them through getters a
 * class field would hide).
 */
export function syncedModel<D extends RecordDefinition>(def: D) {
  const SyncedRecordModel = class extends Model {};
  Object.defineProperty(SyncedRecordModel, 'name', { value: `${def.entity}Model` });
  return SyncedRecordModel as unknown as ModelStatic<SyncedModel<D>>;
}

/** Registers a synced model's table and columns with a Sequelize instance. */
export function initSynced<D extends RecordDefinition>(model: ModelStatic<SyncedModel<D>>, def: D, sequelize: Sequelize) {
  model.init(syncedAttributes(def) as ModelAttributes<SyncedModel<D>>, { sequelize, tableName: def.table, modelName: def.entity });
}

/**
 * The fields every team-scoped versioned table outside the registry (photos, envelopes) shares,
 * declared once: `class PhotoModel extends VersionedTeamModel<PhotoModel>`, its columns `syncedColumns`.
 */
export abstract class VersionedTeamModel<M extends Model> extends Model<InferAttributes<M>, InferCreationAttributes<M>> {
  declare id: string;
  declare teamId: string;
  declare createdBy: string;
  declare version: CreationOptional<number>;
  declare changeSeq: CreationOptional<number>;
  declare deletedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The columns of `VersionedTeamModel`'s fields. */
export const syncedColumns = {
  id: { type: DataTypes.UUID, primaryKey: true },
  teamId: { type: DataTypes.UUID, allowNull: false },
  createdBy: { type: DataTypes.UUID, allowNull: false },
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
  changeSeq: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
  deletedAt: { type: DataTypes.DATE, allowNull: true },
  createdAt: DataTypes.DATE,
  updatedAt: DataTypes.DATE,
};
