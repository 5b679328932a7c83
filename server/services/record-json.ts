// Records built as JSON by PostgreSQL, for answers that pass the text straight through (the
// review): no model instance, no row object and no JSON.stringify per reading in Node. A record's
// fields are its zod schema's keys (shared/schemas) plus `changeSeq`, each read from the column
// its Sequelize model maps it to, formatted as serialize.ts formats it (timestamps as ISO 8601 in
// UTC with milliseconds, dates as YYYY-MM-DD), so a field added to a record reaches these answers
// with no edit here. tests/api/review-answer.test.ts compares both ways field by field.
import { DataTypes, type ModelStatic, type Model } from 'sequelize';
import type * as z from 'zod';

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
