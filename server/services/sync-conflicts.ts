// Kept conflicts: a stale edit from a push is kept beside the server's whole row for a person to
// decide, and that decision ("keep the server's" or "keep this phone's") is applied here.
import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, NotFound, type FieldError } from '../http/errors';
import { lockTeamChanges } from './team-changes';
import { enforceSyncAccess } from './sync-access';
import { translateDbError } from './sync-db-errors';
import { syncOrder, syncTables } from './sync-tables';
import { toRecord, withoutSeq } from './to-record';
import { bulkUpdate, checkGaugeLabels, checkReadingSlots, db, select, short, type FieldOf, type Item, type Plan, type Row } from './sync-batch';
import { syncChange, type SyncConflict, type SyncEntity } from '../../shared/schemas/sync';

/**
 * Keeps each stale edit beside the server's whole row. One open conflict per record and person:
 * an edit the tester made on top of a conflicted record (sent later, still on the old base) joins
 * it, so the tester decides once, on their latest values.
 */
export async function keepConflicts(auth: AuthContext, conflicts: Plan['conflicts'], transaction: Transaction): Promise<SyncConflict[]> {
  const out: SyncConflict[] = [];
  for (const c of conflicts) {
    const spec = syncTables[c.item.entity];
    const [serverRow] = await select(`SELECT * FROM ${spec.table} WHERE id = $1`, [c.targetId], transaction);
    const serverRecord = JSON.stringify(withoutSeq(toRecord(c.item.entity, serverRow)));
    const clientRecord = JSON.stringify(c.item.record);
    const [open] = await select(
      'SELECT id FROM sync_conflicts WHERE team_id = $1 AND user_id = $2 AND entity_id = $3 AND resolved_at IS NULL ORDER BY created_at LIMIT 1 FOR UPDATE',
      [auth.teamId, auth.userId, c.targetId],
      transaction,
    );
    const [row] = open
      ? await select(
          `UPDATE sync_conflicts SET base_version = $2, server_version = $3, client_record = $4::jsonb, server_record = $5::jsonb, updated_at = now()
           WHERE id = $1 RETURNING *`,
          [open.id, c.item.record.version, serverRow.version, clientRecord, serverRecord],
          transaction,
        )
      : await select(
          `INSERT INTO sync_conflicts (id, team_id, entity, entity_id, base_version, server_version, client_record, server_record, user_id)
           VALUES ($1, $2, $3, $4, $5, $6, $7::jsonb, $8::jsonb, $9) RETURNING *`,
          [randomUUID(), auth.teamId, c.item.entity, c.targetId, c.item.record.version, serverRow.version, clientRecord, serverRecord, auth.userId],
          transaction,
        );
    out.push(conflictOut(row));
  }
  return out;
}

const iso = (v: unknown) => (v == null ? null : new Date(v as string).toISOString());

export function conflictOut(r: Row): SyncConflict {
  return {
    id: r.id as string,
    entity: r.entity as SyncEntity,
    entityId: r.entity_id as string,
    baseVersion: r.base_version as number,
    serverVersion: r.server_version as number,
    clientRecord: r.client_record as Record<string, unknown>,
    serverRecord: r.server_record as Record<string, unknown>,
    createdAt: iso(r.created_at)!,
    resolvedAt: iso(r.resolved_at),
    resolution: (r.resolution as 'client' | 'server' | null) ?? null,
  };
}

/**
 * A person's decision on a kept conflict. "Keep the server's" writes nothing. "Keep this phone's"
 * writes the fields where this phone's version differs from the server's as the conflict kept it,
 * onto the row as it is now (whatever else changed since stays), with one new version; checked
 * like a pushed record, so a slot or label taken meanwhile is refused naming the field. Sent
 * twice (a lost answer, a second tap), the same decision answers the same and lands once.
 */
export async function resolveConflict(auth: AuthContext, id: string, keep: 'client' | 'server'): Promise<SyncConflict> {
  try {
    return await decideConflict(auth, id, keep);
  } catch (err) {
    translateDbError(err, () => null);
  }
}

async function decideConflict(auth: AuthContext, id: string, keep: 'client' | 'server'): Promise<SyncConflict> {
  return db().transaction(async (transaction) => {
    await lockTeamChanges(auth.teamId, transaction);
    const [row] = await select('SELECT * FROM sync_conflicts WHERE id = $1 AND team_id = $2 FOR UPDATE', [id, auth.teamId], transaction);
    if (!row) throw new NotFound('conflict');
    if (row.resolved_at) {
      if (row.resolution === keep) return conflictOut(row);
      throw new Conflict(`this conflict was already resolved, keeping the ${row.resolution === 'client' ? "phone's" : "server's"} version`);
    }
    if (keep === 'client') await writeClientSide(auth, row, transaction);
    const [done] = await select(
      'UPDATE sync_conflicts SET resolved_at = now(), resolved_by = $2, resolution = $3 WHERE id = $1 RETURNING *',
      [id, auth.userId, keep],
      transaction,
    );
    return conflictOut(done);
  });
}

async function writeClientSide(auth: AuthContext, conflict: Row, transaction: Transaction) {
  const entity = conflict.entity as SyncEntity;
  const spec = syncTables[entity];
  const [current] = await select(`SELECT * FROM ${spec.table} WHERE id = $1 AND team_id = $2 FOR UPDATE`, [conflict.entity_id, auth.teamId], transaction);
  if (!current) throw new NotFound(entity);
  const phone = conflict.client_record as Record<string, unknown>;
  const server = conflict.server_record as Record<string, unknown>;
  const now = withoutSeq(toRecord(entity, current));
  const merged: Record<string, unknown> = { ...now };
  for (const col of spec.columns) {
    if (JSON.stringify(phone[col.key] ?? null) !== JSON.stringify(server[col.key] ?? null)) merged[col.key] = phone[col.key] ?? null;
  }
  const parsed = syncChange.safeParse({ entity, record: merged });
  if (!parsed.success) throw Invalid.fromZod('clientRecord', parsed.error);
  const item: Item = { index: 0, entity, record: parsed.data.record as Item['record'] };
  const plan: Plan = {
    inserts: new Map(syncOrder.map((e) => [e, []])),
    updates: new Map(syncOrder.map((e) => [e, e === entity ? [item] : []])),
    conflicts: [],
  };
  const errors: FieldError[] = [];
  const fieldOf: FieldOf = (_item, key) => `clientRecord.${key}`;
  await checkReadingSlots(auth, plan, errors, transaction, fieldOf);
  await checkGaugeLabels(auth, plan, errors, transaction, fieldOf);
  for (const taken of plan.conflicts) {
    errors.push({
      field: 'clientRecord.axis',
      message: `its slot now holds another reading (${short(taken.targetId)}): keep the server's version, or clear one of them first`,
    });
  }
  if (errors.length) throw new Invalid(`this phone's version cannot be kept: ${errors[0].message}`, errors);
  // Keeping the phone's version is a change like a push: the same field-by-field role checks.
  await enforceSyncAccess(auth, [item], transaction, (_i, key) => `clientRecord.${key}`);
  await bulkUpdate(auth, spec, [item], transaction);
  await db().query('SET CONSTRAINTS ALL IMMEDIATE', { transaction });
}
