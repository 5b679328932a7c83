// Push and pull for the field client.
//
// Push applies one batch in ONE transaction: every record is checked first (team ownership,
// references, uniqueness, versions), and any problem rejects the whole batch with field errors
// naming the record and the field; only then are rows written, with one array-based statement
// per table and kind (insert / update), not one query per row. A stale base version is a
// conflict: the server row stays as it is and both versions are kept in sync_conflicts. The
// answer is stored under the batch's idempotency key, so the same batch twice writes once and
// answers the same.
//
// Pull returns rows whose change_seq is past the client's cursor. change_seq comes from one
// global sequence stamped by a trigger; a transaction that took a number but has not committed
// yet would be skipped by a cursor that already moved past it. Pushes therefore hold the team's
// change lock until they commit and pulls wait on it (shared), so a pull never sees a later
// number before an earlier one of the same team. Other writers of synced rows should take the
// same lock (team-changes.ts).
import { createHash, randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, NotFound, type FieldError } from '../http/errors';
import { VehicleModel } from '../models';
import { photoRecordFromRow } from './photos.service';
import { lockTeamChanges } from './team-changes';
import { enforceSyncAccess } from './sync-access';
import { translateDbError } from './sync-db-errors';
import { columnValue, rowToRecord, syncOrder, syncTables, type SyncTable } from './sync-tables';
import { syncChange, type PullResponse, type PushRequest, type PushResponse, type SyncConflict, type SyncEntity } from '../../shared/schemas/sync';

type Row = Record<string, unknown>;

const db = (): Sequelize => VehicleModel.sequelize!;

async function select<T = Row>(sql: string, bind: unknown[], transaction: Transaction): Promise<T[]> {
  return db().query(sql, { bind, transaction, type: QueryTypes.SELECT }) as Promise<T[]>;
}

const requestHash = (req: PushRequest) => createHash('sha256').update(JSON.stringify(req.changes)).digest('hex');

interface Item {
  index: number;
  entity: SyncEntity;
  record: Record<string, unknown> & { id: string; version: number };
}

interface Plan {
  inserts: Map<SyncEntity, Item[]>;
  updates: Map<SyncEntity, Item[]>;
  /**
   * Edits kept beside the server's row for a person to decide: a stale base version, or a new
   * reading typed into a slot another device filled first (then `targetId` is that reading).
   */
  conflicts: { item: Item; targetId: string; serverRow: Row }[];
}

/** Where a field error points: `body.changes.3.record.label` for a push, `clientRecord.label` for a resolution. */
type FieldOf = (item: Item, key: string) => string;
const field: FieldOf = (item, key) => `body.changes.${item.index}.record.${key}`;
const short = (id: string) => id.slice(0, 8);

export async function pushBatch(auth: AuthContext, req: PushRequest): Promise<PushResponse> {
  const items: Item[] = req.changes.map((c, index) => ({ index, entity: c.entity, record: c.record as Item['record'] }));
  try {
    return await writeBatch(auth, req, items);
  } catch (err) {
    translateDbError(err, (constraint, key) => nameConstraint(items, constraint, key));
  }
}

/** The change of the batch a slot or label constraint's key points at, if one does. */
function nameConstraint(items: Item[], constraint: string, key: Record<string, string>): FieldError | null {
  const match = (entity: SyncEntity, test: (r: Item['record']) => boolean) => items.find((i) => i.entity === entity && !i.record.deletedAt && test(i.record));
  if (constraint === 'readings_slot') {
    const item = match('reading', (r) => r.poseId === key.pose_id && r.gaugePointId === key.gauge_point_id && r.axis === key.axis);
    if (item) return { field: field(item, 'axis'), message: `pose ${short(key.pose_id)} already has a ${key.axis} reading at this gauge point` };
  }
  if (constraint === 'gauge_points_label') {
    const item = match('gaugePoint', (r) => r.vehicleId === key.vehicle_id && r.label === key.label);
    if (item) return { field: field(item, 'label'), message: `gauge point label '${key.label}' is already used on this vehicle` };
  }
  return null;
}

async function writeBatch(auth: AuthContext, req: PushRequest, items: Item[]): Promise<PushResponse> {
  const hash = requestHash(req);
  return db().transaction(async (transaction) => {
    await lockTeamChanges(auth.teamId, transaction);
    const [earlier] = await select<{ request_hash: string; response: PushResponse }>(
      'SELECT request_hash, response FROM sync_batches WHERE team_id = $1 AND idempotency_key = $2',
      [auth.teamId, req.idempotencyKey],
      transaction,
    );
    if (earlier) {
      if (earlier.request_hash !== hash) throw new Conflict('this idempotency key was already used for a different batch');
      return earlier.response;
    }
    await enforceSyncAccess(auth, items, transaction);
    const plan = await checkBatch(auth, items, transaction);
    const response = await applyPlan(auth, plan, transaction);
    // Slot and label constraints wait for the end of the batch (a swap is fine); check them here,
    // so a violation the checks above missed is named, not found at commit.
    await db().query('SET CONSTRAINTS ALL IMMEDIATE', { transaction });
    await db().query(
      'INSERT INTO sync_batches (team_id, idempotency_key, user_id, request_hash, response) VALUES ($1, $2, $3, $4, $5::jsonb)',
      { bind: [auth.teamId, req.idempotencyKey, auth.userId, hash, JSON.stringify(response)], transaction },
    );
    return response;
  });
}

/** Every check before any write; throws Invalid naming each bad record and field. */
async function checkBatch(auth: AuthContext, items: Item[], transaction: Transaction): Promise<Plan> {
  const errors: FieldError[] = [];
  const byEntity = new Map<SyncEntity, Item[]>(syncOrder.map((e) => [e, []]));
  const seen = new Map<string, Item>();
  for (const item of items) {
    const key = `${item.entity}:${item.record.id}`;
    const first = seen.get(key);
    if (first) errors.push({ field: field(item, 'id'), message: `${item.entity} ${item.record.id} appears twice in the batch (also change ${first.index})` });
    else {
      seen.set(key, item);
      byEntity.get(item.entity)!.push(item);
    }
  }

  const plan: Plan = { inserts: new Map(), updates: new Map(), conflicts: [] };
  /** Ids each entity will have after this batch: the batch's records plus the team's rows. */
  const known = new Map<SyncEntity, Set<string>>(syncOrder.map((e) => [e, new Set(byEntity.get(e)!.map((i) => i.record.id))]));

  for (const entity of syncOrder) {
    const spec = syncTables[entity];
    const list = byEntity.get(entity)!;
    const rows = list.length
      ? await select(`SELECT id, team_id, version FROM ${spec.table} WHERE id = ANY($1::uuid[]) FOR UPDATE`, [list.map((i) => i.record.id)], transaction)
      : [];
    const rowMap = new Map(rows.map((r) => [r.id as string, r]));
    const inserts: Item[] = [];
    const updates: Item[] = [];
    for (const item of list) {
      const row = rowMap.get(item.record.id);
      if (!row) {
        if (item.record.version !== 1) {
          errors.push({ field: field(item, 'version'), message: `${entity} ${short(item.record.id)} is not on the server, so its version must be 1, got ${item.record.version}` });
        } else inserts.push(item);
      } else if (row.team_id !== auth.teamId) {
        errors.push({ field: field(item, 'id'), message: `${entity} id ${item.record.id} is already taken` });
      } else if (row.version !== item.record.version) {
        plan.conflicts.push({ item, targetId: item.record.id, serverRow: row });
      } else updates.push(item);
    }
    plan.inserts.set(entity, inserts);
    plan.updates.set(entity, updates);
  }

  await checkReferences(auth, byEntity, known, errors, transaction);
  await checkReadingSlots(auth, plan, errors, transaction);
  await checkGaugeLabels(auth, plan, errors, transaction);

  if (errors.length) {
    errors.sort((a, b) => a.field.localeCompare(b.field, 'en', { numeric: true }));
    throw new Invalid(`batch rejected, nothing was written: ${errors.length} problem${errors.length > 1 ? 's' : ''}, first ${errors[0].field}: ${errors[0].message}`, errors);
  }
  return plan;
}

async function checkReferences(
  auth: AuthContext,
  byEntity: Map<SyncEntity, Item[]>,
  known: Map<SyncEntity, Set<string>>,
  errors: FieldError[],
  transaction: Transaction,
) {
  // Referenced ids not in this batch must be the team's rows; one query per referenced table.
  const wanted = new Map<SyncEntity, Set<string>>();
  for (const entity of syncOrder) {
    for (const ref of syncTables[entity].references) {
      for (const item of byEntity.get(entity)!) {
        const target = item.record[ref.key] as string;
        if (!known.get(ref.entity)!.has(target)) {
          if (!wanted.has(ref.entity)) wanted.set(ref.entity, new Set());
          wanted.get(ref.entity)!.add(target);
        }
      }
    }
  }
  for (const [entity, ids] of wanted) {
    const rows = await select<{ id: string }>(
      `SELECT id FROM ${syncTables[entity].table} WHERE team_id = $1 AND id = ANY($2::uuid[])`,
      [auth.teamId, [...ids]],
      transaction,
    );
    for (const r of rows) known.get(entity)!.add(r.id);
  }
  for (const entity of syncOrder) {
    for (const ref of syncTables[entity].references) {
      for (const item of byEntity.get(entity)!) {
        const target = item.record[ref.key] as string;
        if (!known.get(ref.entity)!.has(target)) {
          errors.push({ field: field(item, ref.key), message: `${entity} ${short(item.record.id)} refers to ${ref.entity} ${target}, which is neither in this batch nor on the server` });
        }
      }
    }
  }
}

const written = (plan: Plan, entity: SyncEntity) => [...plan.inserts.get(entity)!, ...plan.updates.get(entity)!];

/**
 * One live reading per pose, gauge point and axis, judged on the state after the batch: a reading
 * the batch writes takes its new slot and frees its old one; every other live reading (kept
 * conflicts included) stays where it is. A reading written into a slot another device filled
 * first is kept as a conflict with that reading; two of the batch's own in one slot are refused.
 */
async function checkReadingSlots(auth: AuthContext, plan: Plan, errors: FieldError[], transaction: Transaction, fieldOf: FieldOf = field) {
  const writes = written(plan, 'reading');
  const live = writes.filter((i) => !i.record.deletedAt);
  if (!live.length) return;
  const slot = (r: { poseId: unknown; gaugePointId: unknown; axis: unknown }) => `${r.poseId}|${r.gaugePointId}|${r.axis}`;
  const writtenIds = new Set(writes.map((i) => i.record.id));
  const rows = await select(
    // Only the team's rows: another workshop's (refused as a reference anyway) is never named back.
    'SELECT * FROM readings WHERE pose_id = ANY($1::uuid[]) AND deleted_at IS NULL AND team_id = $2',
    [[...new Set(live.map((i) => i.record.poseId as string))], auth.teamId],
    transaction,
  );
  const holders = new Map<string, Row>();
  for (const r of rows) if (!writtenIds.has(r.id as string)) holders.set(slot({ poseId: r.pose_id, gaugePointId: r.gauge_point_id, axis: r.axis }), r);
  const claimed = new Map<string, Item>();
  const inserts = plan.inserts.get('reading')!;
  for (const item of live) {
    const key = slot(item.record as Row as { poseId: unknown; gaugePointId: unknown; axis: unknown });
    const holder = holders.get(key);
    const where = `pose ${short(item.record.poseId as string)} already has a ${item.record.axis} reading at this gauge point (reading ${short(String(holder?.id ?? claimed.get(key)?.record.id))})`;
    if (holder) {
      // Typed into (or brought back into) a slot another device filled meanwhile: both values
      // are kept, as a conflict with the reading that holds the slot, for a person to decide.
      const list = inserts.includes(item) ? inserts : plan.updates.get('reading')!;
      list.splice(list.indexOf(item), 1);
      plan.conflicts.push({ item, targetId: holder.id as string, serverRow: holder });
    } else if (claimed.has(key)) {
      errors.push({ field: fieldOf(item, 'axis'), message: `reading ${short(item.record.id)}: ${where}, in this same batch` });
    } else claimed.set(key, item);
  }
}

/**
 * Live gauge point labels are unique per vehicle, judged on the state after the batch (two labels
 * swapped in one batch are fine; a renamed point whose edit is kept as a conflict keeps its label).
 */
async function checkGaugeLabels(auth: AuthContext, plan: Plan, errors: FieldError[], transaction: Transaction, fieldOf: FieldOf = field) {
  const writes = written(plan, 'gaugePoint');
  const live = writes.filter((i) => !i.record.deletedAt);
  if (!live.length) return;
  const writtenIds = new Set(writes.map((i) => i.record.id));
  const rows = await select<{ id: string; vehicle_id: string; label: string }>(
    'SELECT id, vehicle_id, label FROM gauge_points WHERE vehicle_id = ANY($1::uuid[]) AND deleted_at IS NULL AND team_id = $2',
    [[...new Set(live.map((i) => i.record.vehicleId as string))], auth.teamId],
    transaction,
  );
  const claimed = new Map<string, string>();
  for (const r of rows) if (!writtenIds.has(r.id)) claimed.set(`${r.vehicle_id}|${r.label}`, r.id);
  for (const item of live) {
    const key = `${item.record.vehicleId}|${item.record.label}`;
    const holder = claimed.get(key);
    if (holder && holder !== item.record.id) {
      errors.push({
        field: fieldOf(item, 'label'),
        message: `gauge point label '${item.record.label}' is already used on this vehicle by another gauge point (${short(holder)}): rename one of them`,
      });
    } else claimed.set(key, item.record.id);
  }
}

async function applyPlan(auth: AuthContext, plan: Plan, transaction: Transaction): Promise<PushResponse> {
  const accepted: PushResponse['accepted'] = [];
  for (const entity of syncOrder) {
    const spec = syncTables[entity];
    const inserts = plan.inserts.get(entity)!;
    if (inserts.length) {
      await bulkInsert(auth, spec, inserts, transaction);
      for (const i of inserts) accepted.push({ entity, id: i.record.id, version: 1 });
    }
    const updates = plan.updates.get(entity)!;
    if (updates.length) {
      const rows = await bulkUpdate(auth, spec, updates, transaction);
      for (const r of rows) accepted.push({ entity, id: r.id, version: r.version });
    }
  }
  const conflicts = await keepConflicts(auth, plan.conflicts, transaction);
  await recordFieldHistory(auth, plan, transaction);
  return { accepted, conflicts };
}

type Tally = { added: Partial<Record<SyncEntity, number>>; changed: Partial<Record<SyncEntity, number>>; conflicts: number };

/** One history event per session a batch touched: what arrived from the field, and who sent it. */
async function recordFieldHistory(auth: AuthContext, plan: Plan, transaction: Transaction) {
  const items = (m: Map<SyncEntity, Item[]>, e: SyncEntity) => m.get(e) ?? [];
  const poseSession = new Map<string, string>();
  for (const p of [...items(plan.inserts, 'pose'), ...items(plan.updates, 'pose')]) poseSession.set(p.record.id, p.record.sessionId as string);
  const readings = [...items(plan.inserts, 'reading'), ...items(plan.updates, 'reading'), ...plan.conflicts.filter((c) => c.item.entity === 'reading').map((c) => c.item)];
  const unknownPoses = [...new Set(readings.map((r) => r.record.poseId as string))].filter((id) => !poseSession.has(id));
  if (unknownPoses.length) {
    const rows = await select<{ id: string; session_id: string }>('SELECT id, session_id FROM poses WHERE id = ANY($1::uuid[])', [unknownPoses], transaction);
    for (const r of rows) poseSession.set(r.id, r.session_id);
  }
  const sessionOf = (item: Item): string | undefined =>
    item.entity === 'testSession' ? item.record.id : item.entity === 'pose' ? (item.record.sessionId as string) : item.entity === 'reading' ? poseSession.get(item.record.poseId as string) : undefined;
  const bySession = new Map<string, Tally>();
  const tally = (item: Item, bump: (t: Tally) => void) => {
    const sessionId = sessionOf(item);
    if (!sessionId) return;
    if (!bySession.has(sessionId)) bySession.set(sessionId, { added: {}, changed: {}, conflicts: 0 });
    bump(bySession.get(sessionId)!);
  };
  for (const list of plan.inserts.values()) for (const i of list) tally(i, (t) => (t.added[i.entity] = (t.added[i.entity] ?? 0) + 1));
  for (const list of plan.updates.values()) for (const i of list) tally(i, (t) => (t.changed[i.entity] = (t.changed[i.entity] ?? 0) + 1));
  for (const c of plan.conflicts) tally(c.item, (t) => (t.conflicts += 1));
  if (!bySession.size) return;
  const ids = [...bySession.keys()];
  await db().query(
    `INSERT INTO history_events (team_id, session_id, entity, entity_id, action, user_id, detail)
     SELECT $1::uuid, u.id, 'session', u.id, 'field.sync', $2::uuid, u.detail FROM unnest($3::uuid[], $4::jsonb[]) AS u(id, detail)`,
    { bind: [auth.teamId, auth.userId, ids, ids.map((id) => JSON.stringify(bySession.get(id)))], transaction },
  );
}

/** unnest($n::type[], …) AS u(id, cols…): one typed array per column, so the row count never meets the parameter limit. */
function unnestSource(spec: SyncTable, items: Item[], firstParam: number) {
  const bind: unknown[] = [items.map((i) => i.record.id), items.map((i) => i.record.version)];
  const arrays = [`$${firstParam}::uuid[]`, `$${firstParam + 1}::int4[]`];
  spec.columns.forEach((col, k) => {
    bind.push(items.map((i) => columnValue(col, i.record)));
    arrays.push(`$${firstParam + 2 + k}::${col.type}[]`);
  });
  const names = ['id', 'base_version', ...spec.columns.map((col) => col.column)];
  return { bind, sql: `unnest(${arrays.join(', ')}) AS u(${names.join(', ')})` };
}

async function bulkInsert(auth: AuthContext, spec: SyncTable, items: Item[], transaction: Transaction) {
  // $2 (the signed-in user) is bound only where a column takes it: PostgreSQL refuses an untyped unused parameter.
  const needsUser = Boolean(spec.createdByColumn);
  const src = unnestSource(spec, items, needsUser ? 3 : 2);
  const cols = spec.columns.map((col) => col.column);
  const extraCols = [...(spec.createdByColumn ? [spec.createdByColumn] : []), ...(spec.entity === 'testSession' ? ['safety_ack_by'] : [])];
  const extraVals = [...(spec.createdByColumn ? ['$2::uuid'] : []), ...(spec.entity === 'testSession' ? ['CASE WHEN u.safety_ack_at IS NULL THEN NULL ELSE $2::uuid END'] : [])];
  const sql = `INSERT INTO ${spec.table} (id, team_id, version, ${[...cols, ...extraCols].join(', ')})
    SELECT u.id, $1::uuid, 1, ${[...cols.map((c) => `u.${c}`), ...extraVals].join(', ')} FROM ${src.sql}`;
  await db().query(sql, { bind: [auth.teamId, ...(needsUser ? [auth.userId] : []), ...src.bind], transaction });
}

async function bulkUpdate(auth: AuthContext, spec: SyncTable, items: Item[], transaction: Transaction) {
  const needsUser = spec.entity === 'testSession';
  const src = unnestSource(spec, items, needsUser ? 3 : 2);
  const sets = spec.columns.map((col) => `${col.column} = u.${col.column}`);
  if (spec.entity === 'testSession') {
    // Who acknowledged the checklist is the person who first sent the acknowledgement.
    sets.push('safety_ack_by = CASE WHEN u.safety_ack_at IS NULL THEN NULL WHEN t.safety_ack_at IS NULL THEN $2::uuid ELSE t.safety_ack_by END');
  }
  // The base-version condition repeats the check made under FOR UPDATE, so a stale row can never be overwritten.
  const sql = `UPDATE ${spec.table} AS t SET ${sets.join(', ')}, version = t.version + 1
    FROM ${src.sql}
    WHERE t.id = u.id AND t.team_id = $1::uuid AND t.version = u.base_version
    RETURNING t.id, t.version`;
  const rows = await select<{ id: string; version: number }>(sql, [auth.teamId, ...(needsUser ? [auth.userId] : []), ...src.bind], transaction);
  if (rows.length !== items.length) throw new Error(`${spec.table}: ${items.length - rows.length} row(s) changed under the lock`);
  return rows;
}

/**
 * Keeps each stale edit beside the server's whole row. One open conflict per record and person:
 * an edit the tester made on top of a conflicted record (sent later, still on the old base) joins
 * it, so the tester decides once, on their latest values.
 */
async function keepConflicts(auth: AuthContext, conflicts: Plan['conflicts'], transaction: Transaction): Promise<SyncConflict[]> {
  const out: SyncConflict[] = [];
  for (const c of conflicts) {
    const spec = syncTables[c.item.entity];
    const [serverRow] = await select(`SELECT * FROM ${spec.table} WHERE id = $1`, [c.targetId], transaction);
    const serverRecord = JSON.stringify(withoutSeq(rowToRecord(spec, serverRow)));
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

function withoutSeq<T extends { changeSeq: number }>(r: T): Omit<T, 'changeSeq'> {
  const { changeSeq: _drop, ...rest } = r;
  return rest;
}

const iso = (v: unknown) => (v == null ? null : new Date(v as string).toISOString());

function conflictOut(r: Row): SyncConflict {
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
    const columns = (table: string) => {
      const spec = Object.values(syncTables).find((t) => t.table === table);
      return spec ? ['id', 'version', 'change_seq', ...spec.columns.map((c) => c.column)].join(', ') : '*';
    };
    // A kept conflict is a decision for the person whose edit it holds: each phone gets its own.
    const page = (table: string) =>
      table === 'sync_conflicts'
        ? select(`SELECT * FROM sync_conflicts WHERE team_id = $1 AND user_id = $4 AND change_seq > $2 ORDER BY change_seq LIMIT $3`, [auth.teamId, since, limit, auth.userId], transaction)
        : select(`SELECT ${columns(table)} FROM ${table} WHERE team_id = $1 AND change_seq > $2 ORDER BY change_seq LIMIT $3`, [auth.teamId, since, limit], transaction);
    const tables = ['vehicles', 'gauge_points', 'test_sessions', 'poses', 'readings', 'photos', 'sync_conflicts'] as const;
    const pages: (readonly [(typeof tables)[number], Row[]])[] = [];
    for (const t of tables) pages.push([t, await page(t)] as const);
    // A full page may have more behind it: stop the cursor at the lowest last seq of the full
    // pages, and hold back every row beyond it so no table skips rows.
    const full = pages.filter(([, rows]) => rows.length === limit);
    const allSeqs = pages.flatMap(([, rows]) => rows.map((r) => Number(r.change_seq)));
    const cursor = full.length
      ? Math.min(...full.map(([, rows]) => Number(rows[rows.length - 1].change_seq)))
      : Math.max(since, ...allSeqs);
    const get = (t: (typeof tables)[number]) => pages.find(([name]) => name === t)![1].filter((r) => Number(r.change_seq) <= cursor);
    return {
      cursor,
      hasMore: full.length > 0,
      vehicles: get('vehicles').map((r) => rowToRecord(syncTables.vehicle, r)),
      gaugePoints: get('gauge_points').map((r) => rowToRecord(syncTables.gaugePoint, r)),
      testSessions: get('test_sessions').map((r) => rowToRecord(syncTables.testSession, r)),
      poses: get('poses').map((r) => rowToRecord(syncTables.pose, r)),
      readings: get('readings').map((r) => rowToRecord(syncTables.reading, r)),
      photos: get('photos').map(photoRecordFromRow),
      conflicts: get('sync_conflicts').map(conflictOut),
    } as PullResponse;
  });
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
  const now = withoutSeq(rowToRecord(spec, current));
  const merged: Record<string, unknown> = { ...now };
  for (const col of spec.columns) {
    if (JSON.stringify(phone[col.key] ?? null) !== JSON.stringify(server[col.key] ?? null)) merged[col.key] = phone[col.key] ?? null;
  }
  const parsed = syncChange.safeParse({ entity, record: merged });
  if (!parsed.success) throw Invalid.fromZod('clientRecord', parsed.error);
  const item: Item = { index: 0, entity, record: parsed.data.record as Item['record'] };
  const plan: Plan = { inserts: new Map(syncOrder.map((e) => [e, []])), updates: new Map(syncOrder.map((e) => [e, e === entity ? [item] : []])), conflicts: [] };
  const errors: FieldError[] = [];
  const fieldOf: FieldOf = (_item, key) => `clientRecord.${key}`;
  await checkReadingSlots(auth, plan, errors, transaction, fieldOf);
  await checkGaugeLabels(auth, plan, errors, transaction, fieldOf);
  for (const taken of plan.conflicts) {
    errors.push({ field: 'clientRecord.axis', message: `its slot now holds another reading (${short(taken.targetId)}): keep the server's version, or clear one of them first` });
  }
  if (errors.length) throw new Invalid(`this phone's version cannot be kept: ${errors[0].message}`, errors);
  // Keeping the phone's version is a change like a push: the same field-by-field role checks.
  await enforceSyncAccess(auth, [item], transaction, (_i, key) => `clientRecord.${key}`);
  await bulkUpdate(auth, spec, [item], transaction);
  await db().query('SET CONSTRAINTS ALL IMMEDIATE', { transaction });
}
