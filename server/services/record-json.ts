// Records built as JSON by PostgreSQL, for answers that pass the text straight through (the
// review, the pull): no model instance, no row object and no JSON.stringify per reading in Node.
// A synced record's fields come from the registry (shared/records, through sync-tables.ts), other
// records' from their zod schema's keys and their model's columns; both add `changeSeq` and format
// as to-record.ts does (timestamps as ISO 8601 in UTC with milliseconds, dates as YYYY-MM-DD), so
// a field added to a record reaches these answers with no edit here.
// tests/api/review-answer.test.ts and pull-answer.test.ts compare both ways field by field.
import { DataTypes, type ModelStatic, type Model } from 'sequelize';
import type * as z from 'zod';
import { PhotoModel } from '../models';
import { photo } from '../../shared/schemas';
import type { SyncEntity } from '../../shared/records';
import { syncTables } from './sync-tables';

/** A timestamptz as Date#toISOString writes it (milliseconds truncated, as the pg driver reads it). */
export const isoSql = (expr: string) => `to_char(${expr} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

function columnSql(model: ModelStatic<Model>, key: string, alias: string): string {
  const attribute = model.getAttributes()[key];
  if (!attribute) throw new Error(`${model.name} has no attribute for the record field ${key}`);
  const column = `${alias}.${attribute.field ?? key}`;
  return attribute.type instanceof DataTypes.DATE && !(attribute.type instanceof DataTypes.DATEONLY) ? isoSql(column) : column;
}

/**
 * `json_build_object(…)` of one row of `model`'s table (aliased `alias`) with the fields of
 * `schema`, `changeSeq`, and `extra` fields (name → SQL expression).
 */
export function recordJsonSql(model: ModelStatic<Model>, schema: z.ZodObject, alias: string, extra: Record<string, string> = {}): string {
  const fields = [...Object.keys(schema.shape), 'changeSeq'].map((key) => `'${key}', ${columnSql(model, key, alias)}`);
  const more = Object.entries(extra).map(([key, sql]) => `'${key}', ${sql}`);
  return `json_build_object(${[...fields, ...more].join(', ')})`;
}

/** `json_build_object(…)` of one row of a synced record's table (aliased `alias`), as toRecord maps it, with `extra` fields. */
export function syncedRecordJsonSql(entity: SyncEntity, alias: string, extra: Record<string, string> = {}): string {
  const column = (name: string, type?: string) => (type === 'timestamptz' ? isoSql(`${alias}.${name}`) : `${alias}.${name}`);
  const fields: [string, string][] = [
    ['id', `${alias}.id`],
    ['version', `${alias}.version`],
    ...syncTables[entity].columns.map((c): [string, string] => [c.key, column(c.column, c.type)]),
    ['changeSeq', `${alias}.change_seq`],
    ...Object.entries(extra),
  ];
  return `json_build_object(${fields.map(([key, sql]) => `'${key}', ${sql}`).join(', ')})`;
}

/** A photo row (aliased `alias`) as photos.service.ts photoOut describes it. */
export const photoJsonSql = (alias: string) =>
  recordJsonSql(PhotoModel, photo.omit({ hasGps: true }), alias, { hasGps: `(${alias}.gps_lat IS NOT NULL AND ${alias}.gps_lon IS NOT NULL)` });
