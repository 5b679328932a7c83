// Small values in table meta of field-db.ts: the pull cursor, the last sync and its error, the
// display unit chosen on this phone, whether persistent storage was granted, and whose records
// the store holds (owner.ts).
import type { UnitSystem } from '@shared/schemas';
import { fieldDb, type FieldDb } from './field-db';

export interface SyncProblem {
  message: string;
  fields: { field: string; message: string }[];
  at: string;
}

export interface MetaValues {
  pullCursor: number;
  lastSyncAt: string | null;
  lastError: SyncProblem | null;
  unit: UnitSystem | null;
  persisted: boolean | null;
  owner: StoreOwner | null;
  /** Most changes in the next batch while a failing batch is being narrowed down (halved each time). */
  pushLimit: number | null;
}

/** The person and workshop whose records the store holds. */
export interface StoreOwner {
  userId: string;
  teamId: string;
  email: string;
}

const defaults: MetaValues = { pullCursor: 0, lastSyncAt: null, lastError: null, unit: null, persisted: null, owner: null, pushLimit: null };

export async function getMeta<K extends keyof MetaValues>(key: K, db: FieldDb = fieldDb): Promise<MetaValues[K]> {
  const row = await db.meta.get(key);
  return row ? (row.value as MetaValues[K]) : defaults[key];
}

export async function setMeta<K extends keyof MetaValues>(key: K, value: MetaValues[K], db: FieldDb = fieldDb): Promise<void> {
  await db.meta.put({ key, value });
}
