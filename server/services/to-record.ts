// Rows → the records of shared/records: the one mapper for the API's answers, pulls and kept
// conflicts. It takes a row as PostgreSQL returns it (column names, snake_case) or as a model holds
// it (field names), so raw SQL and Sequelize reads answer the same record.
import type { RecordOf, SyncEntity } from '../../shared/records';
import { syncTables } from './sync-tables';

const isoOrNull = (v: unknown) => (v == null ? null : new Date(v as string | Date).toISOString());

/** A row → the record of `entity` plus its change cursor. */
export function toRecord<E extends SyncEntity>(entity: E, row: object): RecordOf<E> & { changeSeq: number } {
  const r = row as Record<string, unknown>;
  const read = (key: string, column: string) => (column in r ? r[column] : r[key]);
  const out: Record<string, unknown> = { id: r.id, version: r.version, changeSeq: Number(read('changeSeq', 'change_seq')) };
  for (const col of syncTables[entity].columns) {
    const v = read(col.key, col.column);
    out[col.key] = col.type === 'timestamptz' ? isoOrNull(v) : (v ?? null);
  }
  return out as RecordOf<E> & { changeSeq: number };
}

/** The record without its change cursor: what a kept conflict stores. */
export function withoutSeq<T extends { changeSeq: number }>(r: T): Omit<T, 'changeSeq'> {
  const { changeSeq: _drop, ...rest } = r;
  return rest;
}
