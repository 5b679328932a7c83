// Pull for the field client: rows whose change_seq is past the client's cursor.
//
// change_seq comes from one global sequence stamped by a trigger; a transaction that took a
// number but has not committed yet would be skipped by a cursor that already moved past it.
// Pushes and every other writer of synced rows therefore hold the team's change lock until they
// commit and pulls wait on it (shared), so a pull never sees a later number before an earlier one
// of the same team (team-changes.ts).
import type { AuthContext } from '../auth/context';
import { photoRecordFromRow } from './photos.service';
import { lockTeamChanges } from './team-changes';
import { translateDbError } from './sync-db-errors';
import { syncTables } from './sync-tables';
import { toRecord } from './to-record';
import { db, select, type Row } from './sync-batch';
import { conflictOut } from './sync-conflicts';
import { records, syncEntities, type SyncEntity } from '../../shared/records';
import type { PullResponse } from '../../shared/schemas/sync';

/** Everything of the team changed after `since`, oldest first, at most `limit` rows per table. */
export async function pullChanges(auth: AuthContext, since: number, limit: number): Promise<PullResponse> {
  try {
    return await readChanges(auth, since, limit);
  } catch (err) {
    translateDbError(err, () => null);
  }
}

async function readChanges(auth: AuthContext, since: number, limit: number): Promise<PullResponse> {
  return db().transaction(async (transaction) => {
    await lockTeamChanges(auth.teamId, transaction, 'read');
    // Only the columns a record carries: parsing timestamps nobody reads costs more than the query.
    const columns = (entity: SyncEntity) => ['id', 'version', 'change_seq', ...syncTables[entity].columns.map((c) => c.column)].join(', ');
    const rows = (table: string, columns: string) =>
      select(`SELECT ${columns} FROM ${table} WHERE team_id = $1 AND change_seq > $2 ORDER BY change_seq LIMIT $3`, [auth.teamId, since, limit], transaction);
    const pages: Row[][] = [];
    for (const entity of syncEntities) pages.push(await rows(syncTables[entity].table, columns(entity)));
    const photos = await rows('photos', '*');
    // A kept conflict is a decision for the person whose edit it holds: each phone gets its own.
    const conflicts = await select(
      `SELECT * FROM sync_conflicts WHERE team_id = $1 AND user_id = $4 AND change_seq > $2 ORDER BY change_seq LIMIT $3`,
      [auth.teamId, since, limit, auth.userId],
      transaction,
    );
    const all = [...pages, photos, conflicts];
    // A full page may have more behind it: stop the cursor at the lowest last seq of the full
    // pages, and hold back every row beyond it so no table skips rows.
    const full = all.filter((page) => page.length === limit);
    const allSeqs = all.flatMap((page) => page.map((r) => Number(r.change_seq)));
    const cursor = full.length ? Math.min(...full.map((page) => Number(page[page.length - 1].change_seq))) : Math.max(since, ...allSeqs);
    const upTo = (page: Row[]) => page.filter((r) => Number(r.change_seq) <= cursor);
    return {
      cursor,
      hasMore: full.length > 0,
      ...Object.fromEntries(syncEntities.map((entity, i) => [records[entity].pullKey, upTo(pages[i]).map((r) => toRecord(entity, r))])),
      photos: upTo(photos).map(photoRecordFromRow),
      conflicts: upTo(conflicts).map(conflictOut),
    } as PullResponse;
  });
}
