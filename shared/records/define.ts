// How a synced record is declared once: its zod schema, the PostgreSQL type of each field's
// column, the records it refers to, the column the server fills with the signed-in person, the
// columns only the server writes, the phone's Dexie indexes and its key in a pull answer; beside
// it, each record's file exports its factory `new<Entity>()`. Everything else (the server's sync
// specs and row mapper, the Sequelize attributes, the phone's table look-ups, the drift test) is
// derived from these declarations.
import type * as z from 'zod';

/** PostgreSQL type of a column; the bulk sync statements read each field of a batch's records as this type. */
export type ColumnType = 'uuid' | 'text' | 'float8' | 'int4' | 'int8' | 'bool' | 'jsonb' | 'date' | 'timestamptz';

/** A column the server fills and the record does not carry (the created-by column aside). */
export interface ServerColumn {
  type: ColumnType;
  nullable: boolean;
}

/** Fields every synced record carries; their columns are the same in every table. */
type CommonField = 'id' | 'version' | 'deletedAt';

/** The schema of a synced record: a zod object (refinements allowed) with the common fields. */
type RecordSchema = z.ZodType<{ id: string; version: number; deletedAt?: string | null }> & { shape: Record<string, z.ZodType> };

/** A column type for every field but id, version and deletedAt. */
type ColumnsOf<S extends RecordSchema> = { [K in Exclude<keyof z.output<S>, CommonField>]-?: ColumnType };

export interface RecordDefinition<
  E extends string = string,
  S extends RecordSchema = RecordSchema,
  Pull extends string = string,
  CreatedBy extends string | null = string | null,
  Server extends Record<string, ServerColumn> = Record<string, ServerColumn>,
  Columns extends ColumnsOf<S> = ColumnsOf<S>,
> {
  entity: E;
  schema: S;
  /** The server's table. */
  table: string;
  /** The column type of every field but id, version and deletedAt (the column is the field in snake_case). */
  columns: Columns;
  /** Fields that hold the id of another synced record: checked against the batch and the team's rows. */
  references: Partial<Record<Exclude<keyof z.output<S>, CommonField>, string>>;
  /** The field (column in snake_case) set from the signed-in person when the server creates the row, never from the client. */
  createdBy: CreatedBy;
  /** Columns only the server writes, by field name (column in snake_case). */
  serverColumns: Server;
  /** The phone's table (Dexie) and its indexes besides the primary key `id`. */
  dexie: { table: string; indexes: string[] };
  /** The key of the record's list in a pull answer. */
  pullKey: Pull;
}

/** Declares a synced record (see the header); a no-op at run time that keeps the literal types. */
export function defineRecord<
  const E extends string,
  S extends RecordSchema,
  const Pull extends string,
  const CreatedBy extends string | null,
  const Server extends Record<string, ServerColumn>,
  const Columns extends ColumnsOf<S>,
>(definition: RecordDefinition<E, S, Pull, CreatedBy, Server, Columns>): RecordDefinition<E, S, Pull, CreatedBy, Server, Columns> {
  return definition;
}

/** `wheelbaseMm` → `wheelbase_mm`: every record field's column is its name in snake_case. */
export const columnOf = (field: string) => field.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

/** Whether a field may hold null, as its zod schema says (so the column is nullable). */
export const acceptsNull = (schema: z.ZodType) => schema.safeParse(null).success;

export interface Column {
  /** The record's field. */
  key: string;
  column: string;
  type: ColumnType;
  nullable: boolean;
}

/** The columns of a record's fields, besides id and version, in declaration order (deletedAt last). */
export function recordColumns(def: RecordDefinition): Column[] {
  const keys = [...Object.keys(def.columns), 'deletedAt'];
  const typeOf = (key: string): ColumnType => (key === 'deletedAt' ? 'timestamptz' : def.columns[key as never]);
  return keys.map((key) => ({ key, column: columnOf(key), type: typeOf(key), nullable: acceptsNull(def.schema.shape[key]) }));
}

/** Every column of the record's table, with its type and nullability: what the drift test compares with the database. */
export function tableColumns(def: RecordDefinition): Column[] {
  const c = (key: string, type: ColumnType, nullable = false): Column => ({ key, column: columnOf(key), type, nullable });
  return [
    c('id', 'uuid'),
    c('teamId', 'uuid'),
    c('version', 'int4'),
    ...recordColumns(def),
    ...(def.createdBy ? [c(def.createdBy, 'uuid')] : []),
    ...Object.entries(def.serverColumns).map(([key, s]) => c(key, s.type, s.nullable)),
    c('changeSeq', 'int8'),
    c('createdAt', 'timestamptz'),
    c('updatedAt', 'timestamptz'),
  ];
}
