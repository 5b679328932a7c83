// Records of the field store the server does not have yet (table outbox of field-db.ts, with the
// record tables), and the look-ups that name them in the trade's words (pose, gauge point,
// session, vehicle), for the sync page and for saving them as a file.
import { useLiveQuery } from 'dexie-react-hooks';
import type { GaugePoint, Pose, TestSession, Vehicle } from '@shared/schemas';
import type { FieldError } from '@shared/schemas/common';
import { syncEntities, type SyncEntity } from '@shared/schemas/sync';
import { fieldDb, tableOf, type FieldDb } from './field-db';

export type UnsentState = 'waiting' | 'sending' | 'held';

export interface UnsentRecord {
  entity: SyncEntity;
  record: Record<string, unknown> & { id: string; version: number };
  state: UnsentState;
  /** The server's reason for holding it back, naming the field where it could. */
  problem: string | null;
  fields: FieldError[];
  queuedAt: string;
}

export interface FieldLookups {
  poses: Map<string, Pose>;
  gaugePoints: Map<string, GaugePoint>;
  sessions: Map<string, TestSession>;
  vehicles: Map<string, Vehicle>;
}

export async function unsentRecords(db: FieldDb = fieldDb): Promise<UnsentRecord[]> {
  const entries = await db.outbox.orderBy('seq').toArray();
  const out: UnsentRecord[] = [];
  for (const entity of syncEntities) {
    const mine = new Map<string, (typeof entries)[number]>();
    // One line per record: a held entry tells more than a newer waiting one.
    for (const e of entries) if (e.entity === entity && (!mine.has(e.recordId) || e.held)) mine.set(e.recordId, e);
    const records = await tableOf(db, entity).bulkGet([...mine.keys()]);
    [...mine.values()].forEach((e, i) => {
      const record = records[i];
      if (!record) return;
      out.push({
        entity,
        record: record as UnsentRecord['record'],
        state: e.held ? 'held' : e.batchKey ? 'sending' : 'waiting',
        problem: e.held?.message ?? null,
        fields: e.held?.fields ?? [],
        queuedAt: e.queuedAt,
      });
    });
  }
  return out;
}

export async function fieldLookups(db: FieldDb = fieldDb): Promise<FieldLookups> {
  const byId = <T extends { id: string }>(rows: T[]) => new Map(rows.map((r) => [r.id, r]));
  return {
    poses: byId(await db.poses.toArray()),
    gaugePoints: byId(await db.gaugePoints.toArray()),
    sessions: byId(await db.sessions.toArray()),
    vehicles: byId(await db.vehicles.toArray()),
  };
}

export function useUnsentRecords() {
  return useLiveQuery(async () => ({ unsent: await unsentRecords(), lookups: await fieldLookups() }));
}
