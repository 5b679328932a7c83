// Pulled server rows into the record tables of field-db.ts. A record with a local change still
// waiting in the outbox keeps the local version (the push will settle it); everything else takes
// the server's row. Pulled rows are checked with the shared schemas; bad ones are reported.
import type { PullResponse } from '@shared/schemas/sync';
import { records, syncEntities } from '@shared/records';
import { fieldDb, tableOf, type FieldDb } from './field-db';
import { setMeta } from './meta';
import { checkRows } from './records';
import { mergeServerPhotos } from './photos';

export async function applyPull(page: PullResponse, db: FieldDb = fieldDb): Promise<{ corrupt: { id: string; message: string }[] }> {
  const corrupt: { id: string; message: string }[] = [];
  const tables = syncEntities.map((e) => tableOf(db, e));
  await db.transaction('rw', [db.outbox, db.conflicts, db.meta, db.photos, ...tables], async () => {
    const pending = new Set((await db.outbox.toArray()).map((e) => `${e.entity}:${e.recordId}`));
    for (const entity of syncEntities) {
      const rows = page[records[entity].pullKey] as { id: string; changeSeq: number }[];
      const checked = checkRows<{ id: string; version: number }>(entity, rows);
      corrupt.push(...checked.corrupt);
      const fresh = checked.records.filter((r) => !pending.has(`${entity}:${r.id}`));
      await tableOf(db, entity).bulkPut(fresh);
    }
    await db.conflicts.bulkPut(page.conflicts);
    await mergeServerPhotos(page.photos, db);
    await setMeta('pullCursor', page.cursor, db);
  });
  return { corrupt };
}
