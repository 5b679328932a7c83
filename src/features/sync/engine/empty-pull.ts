// For the sync tests (not a test itself): a server's pull answer with nothing new, one empty list
// per synced record of the registry.
import { records, syncEntities } from '@shared/records';
import type { PullResponse } from '@shared/schemas/sync';

type RecordLists = Omit<PullResponse, 'cursor' | 'hasMore' | 'photos' | 'conflicts'>;

export function emptyPull(cursor: number): PullResponse {
  const lists = Object.fromEntries(syncEntities.map((e) => [records[e].pullKey, []])) as unknown as RecordLists;
  return { cursor, hasMore: false, photos: [], conflicts: [], ...lists };
}
