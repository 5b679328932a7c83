// How each synced record maps onto its table, derived from shared/records: the columns a client
// may write (with their PostgreSQL types, for the bulk statements), the column the
// server sets from the session, and the references checked in a batch.
import { records, syncEntities, type SyncEntity } from '../../shared/records';
import { columnOf, recordColumns, type Column } from '../../shared/records/define';

export interface SyncTable {
  entity: SyncEntity;
  table: string;
  /** Client-writable columns, besides id and version. */
  columns: Column[];
  /** The column set from the signed-in user when a row is created (never from the client). */
  createdByColumn?: string;
  /** References to other synced records: checked against this batch and the team's rows. */
  references: { key: string; entity: SyncEntity }[];
}

export const syncTables = Object.fromEntries(
  syncEntities.map((entity): [SyncEntity, SyncTable] => {
    const def = records[entity];
    return [
      entity,
      {
        entity,
        table: def.table,
        columns: recordColumns(def),
        ...(def.createdBy ? { createdByColumn: columnOf(def.createdBy) } : {}),
        references: Object.entries(def.references).map(([key, target]) => ({ key, entity: target as SyncEntity })),
      },
    ];
  }),
) as Record<SyncEntity, SyncTable>;

/** Parents before children, so a batch's inserts satisfy the foreign keys. */
export const syncOrder: readonly SyncEntity[] = syncEntities;
