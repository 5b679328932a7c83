// Conflicts the server keeps (table conflicts of field-db.ts): pulled with the other changes, and
// stored at once when a person resolves one here, so the sync page and bar need not wait for a pull.
import type { SyncConflict } from '@shared/schemas/sync';
import { fieldDb, type FieldDb } from './field-db';

export async function keepResolvedConflict(conflict: SyncConflict, db: FieldDb = fieldDb): Promise<void> {
  await db.conflicts.put(conflict);
}
