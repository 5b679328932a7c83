// Push for the field client.
//
// Push applies one batch in ONE transaction: every record is checked first (team ownership,
// references, uniqueness, versions), and any problem rejects the whole batch with field errors
// naming the record and the field; only then are rows written, with one bulk statement
// per table and kind (insert / update), not one query per row. A stale base version is a
// conflict: the server row stays as it is and both versions are kept in sync_conflicts
// (sync-conflicts.ts). The answer is stored under the batch's idempotency key, so the same batch
// twice writes once and answers the same (stored compactly, see StoredAnswer). Pushes hold the team's change lock until they commit,
// so a pull never sees a later change number before an earlier one (team-changes.ts).
import { createHash } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, type FieldError } from '../http/errors';
import { lockTeamChanges } from './team-changes';
import { enforceSyncAccess } from './sync-access';
import { translateDbError } from './sync-db-errors';
import { syncOrder, syncTables } from './sync-tables';
import {
  bulkInsert,
  bulkUpdate,
  checkGaugeLabels,
  checkReadingSlots,
  db,
  field,
  lockNamedRows,
  poseSessions,
  readAhead,
  rowKey,
  select,
  short,
  type BatchReads,
  type Item,
  type Plan,
  type PoseSessions,
  type RecordsJson,
} from './sync-batch';
import { keepConflicts } from './sync-conflicts';
import { alongside } from './alongside';
import { preparedIn, queryIn } from '../db';
import type { PushRequest, PushResponse, SyncConflict, SyncEntity } from '../../shared/schemas/sync';

/** Each change's record as JSON: what the batch's hash and its bulk inserts are made of, each record stringified once. */
const recordTexts = (items: Item[]) => items.map((i) => JSON.stringify(i.record));

/**
 * The hash of the validated changes as `JSON.stringify(changes)` writes them (`{"entity":…,"record":…}`
 * each, as zod gives them), which is what every stored hash was taken of; put together from the
 * records' texts, which the inserts use too.
 */
const requestHash = (items: Item[], texts = recordTexts(items)) =>
  createHash('sha256')
    .update(`[${items.map((i, k) => `{"entity":${JSON.stringify(i.entity)},"record":${texts[k]}}`).join(',')}]`)
    .digest('hex');

/** A written change: its index in the batch and the version the server now holds. */
type Accepted = { index: number; version: number };

/**
 * The answer as stored for a retry. A retry carries the same changes (its hash says so), so the
 * accepted records are kept as runs of consecutive change indexes that took one version
 * (`[first index, count, version]`), and the answer is rebuilt from the batch: a batch of 1,000
 * new readings stores one run instead of about 70 kB of JSON. Conflicts are kept whole (a few,
 * with the server's row as it was then). Rows stored before this form hold the whole answer.
 */
type StoredAnswer = { acceptedRuns: [number, number, number][]; conflicts: SyncConflict[] } | PushResponse;

function storedAnswer(accepted: Accepted[], conflicts: SyncConflict[]): StoredAnswer {
  const acceptedRuns: [number, number, number][] = [];
  for (const { index, version } of accepted) {
    const last = acceptedRuns.at(-1);
    if (last && last[0] + last[1] === index && last[2] === version) last[1] += 1;
    else acceptedRuns.push([index, 1, version]);
  }
  return { acceptedRuns, conflicts };
}

function answerOf(req: PushRequest, stored: StoredAnswer): PushResponse {
  if ('accepted' in stored) return stored;
  const accepted: PushResponse['accepted'] = [];
  for (const [first, count, version] of stored.acceptedRuns) {
    for (let index = first; index < first + count; index++) {
      const { entity, record } = req.changes[index];
      accepted.push({ entity, id: record.id, version });
    }
  }
  return { accepted, conflicts: stored.conflicts };
}

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

/** Each entity's records of the batch as the bulk insert's JSON parameter (used when all of them are new, as in a batch of new readings). */
function recordsAhead(items: Item[], texts: string[]): Map<SyncEntity, RecordsJson> {
  const byEntity = new Map<SyncEntity, { items: Item[]; texts: string[] }>();
  items.forEach((item, k) => {
    const list = byEntity.get(item.entity);
    if (list) {
      list.items.push(item);
      list.texts.push(texts[k]);
    } else byEntity.set(item.entity, { items: [item], texts: [texts[k]] });
  });
  return new Map([...byEntity].map(([entity, list]) => [entity, { items: list.items, text: `[${list.texts.join(',')}]` }]));
}

async function writeBatch(auth: AuthContext, req: PushRequest, items: Item[]): Promise<PushResponse> {
  return db().transaction(async (transaction) => {
    await lockTeamChanges(auth.teamId, transaction);
    const [earlier] = await select<{ request_hash: string; response: StoredAnswer }>(
      'SELECT request_hash, response FROM sync_batches WHERE team_id = $1 AND idempotency_key = $2',
      [auth.teamId, req.idempotencyKey],
      transaction,
    );
    if (earlier) {
      if (earlier.request_hash !== requestHash(items)) throw new Conflict('this idempotency key was already used for a different batch');
      return answerOf(req, earlier.response);
    }
    // A new batch: its hash is needed only when its answer is stored, and its records' JSON only
    // for the inserts; both are made while PostgreSQL reads and locks the rows the batch names.
    const [rows, ahead] = await alongside(lockNamedRows(items, transaction), () => {
      const texts = recordTexts(items);
      return { hash: requestHash(items, texts), records: recordsAhead(items, texts) };
    });
    const hash = ahead.hash;
    const poses = poseSessions(auth, transaction);
    const reads: BatchReads = { rows, poseSessions: poses, lookups: await readAhead(auth, items, rows, poses, transaction) };
    await enforceSyncAccess(auth, items, transaction, undefined, reads);
    const plan = await checkBatch(auth, items, reads, transaction);
    const { accepted, conflicts } = await applyPlan(auth, plan, transaction, ahead.records);
    const arrivals = await fieldArrivals(plan, reads.poseSessions);
    // Slot and label constraints wait for the end of the batch (a swap is fine); check them here,
    // so a violation the checks above missed is named, not found at commit.
    await queryIn(transaction, 'SET CONSTRAINTS ALL IMMEDIATE');
    // One statement writes what arrived per session into the history and stores the answer.
    const stored = storedAnswer(accepted, conflicts);
    await preparedIn(
      transaction,
      'push-stored-answer',
      `WITH arrived AS (
         INSERT INTO history_events (team_id, session_id, entity, entity_id, action, user_id, detail)
         SELECT $1::uuid, u.id, 'session', u.id, 'field.sync', $3::uuid, u.detail FROM unnest($6::uuid[], $7::jsonb[]) AS u(id, detail)
       )
       INSERT INTO sync_batches (team_id, idempotency_key, user_id, request_hash, response) VALUES ($1, $2, $3, $4, $5::jsonb)`,
      [auth.teamId, req.idempotencyKey, auth.userId, hash, JSON.stringify(stored), [...arrivals.keys()], [...arrivals.values()].map((t) => JSON.stringify(t))],
    );
    // The first answer is rebuilt from what is stored, as a retry's is: the two cannot differ.
    return answerOf(req, stored);
  });
}

/** Every check before any write; throws Invalid naming each bad record and field. */
async function checkBatch(auth: AuthContext, items: Item[], reads: BatchReads, transaction: Transaction): Promise<Plan> {
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
    const list = byEntity.get(entity)!;
    const inserts: Item[] = [];
    const updates: Item[] = [];
    for (const item of list) {
      const row = reads.rows.get(rowKey(entity, item.record.id));
      if (!row) {
        if (item.record.version !== 1) {
          errors.push({
            field: field(item, 'version'),
            message: `${entity} ${short(item.record.id)} is not on the server, so its version must be 1, got ${item.record.version}`,
          });
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

  await checkReferences(byEntity, known, errors, reads);
  await checkReadingSlots(auth, plan, errors, transaction, field, reads.lookups.slots);
  await checkGaugeLabels(auth, plan, errors, transaction, field, reads.lookups.labels);

  if (errors.length) {
    errors.sort((a, b) => a.field.localeCompare(b.field, 'en', { numeric: true }));
    throw new Invalid(
      `batch rejected, nothing was written: ${errors.length} problem${errors.length > 1 ? 's' : ''}, first ${errors[0].field}: ${errors[0].message}`,
      errors,
    );
  }
  return plan;
}

async function checkReferences(byEntity: Map<SyncEntity, Item[]>, known: Map<SyncEntity, Set<string>>, errors: FieldError[], reads: BatchReads) {
  // Referenced ids not in this batch must be the team's rows: poses through the batch's pose
  // look-up (the access rules and the history read the same), every other table as read ahead.
  const wanted = new Map<SyncEntity, Set<string>>();
  for (const entity of syncOrder) {
    for (const ref of syncTables[entity].references) {
      for (const item of byEntity.get(entity)!) {
        const target = item.record[ref.key] as string | null;
        // An optional reference (a re-test request's pose) may be empty.
        if (target != null && !known.get(ref.entity)!.has(target)) {
          if (!wanted.has(ref.entity)) wanted.set(ref.entity, new Set());
          wanted.get(ref.entity)!.add(target);
        }
      }
    }
  }
  const wantedPoses = wanted.get('pose');
  wanted.delete('pose');
  if (wantedPoses) {
    // Read ahead with the rest: no statement of its own.
    await reads.poseSessions.load(wantedPoses);
    for (const id of wantedPoses) if (reads.poseSessions.sessionOf(id)) known.get('pose')!.add(id);
  }
  for (const [entity, ids] of wanted) for (const id of ids) if (reads.lookups.referenced.has(rowKey(entity, id))) known.get(entity)!.add(id);
  for (const entity of syncOrder) {
    for (const ref of syncTables[entity].references) {
      for (const item of byEntity.get(entity)!) {
        const target = item.record[ref.key] as string | null;
        if (target != null && !known.get(ref.entity)!.has(target)) {
          errors.push({
            field: field(item, ref.key),
            message: `${entity} ${short(item.record.id)} refers to ${ref.entity} ${target}, which is neither in this batch nor on the server`,
          });
        }
      }
    }
  }
}

async function applyPlan(
  auth: AuthContext,
  plan: Plan,
  transaction: Transaction,
  ahead: Map<SyncEntity, RecordsJson>,
): Promise<{ accepted: Accepted[]; conflicts: SyncConflict[] }> {
  const accepted: Accepted[] = [];
  for (const entity of syncOrder) {
    const spec = syncTables[entity];
    const inserts = plan.inserts.get(entity)!;
    if (inserts.length) {
      await bulkInsert(auth, spec, inserts, transaction, ahead.get(entity));
      for (const i of inserts) accepted.push({ index: i.index, version: 1 });
    }
    const updates = plan.updates.get(entity)!;
    if (updates.length) {
      const rows = await bulkUpdate(auth, spec, updates, transaction);
      // PostgreSQL answers with its own spelling of the id (lower case): the change is found by it.
      const indexOf = new Map(updates.map((i) => [i.record.id.toLowerCase(), i.index]));
      for (const r of rows) accepted.push({ index: indexOf.get(r.id)!, version: r.version });
    }
  }
  const conflicts = await keepConflicts(auth, plan.conflicts, transaction);
  return { accepted, conflicts };
}

type Tally = { added: Partial<Record<SyncEntity, number>>; changed: Partial<Record<SyncEntity, number>>; conflicts: number };

/** What arrived from the field per session the batch touched: one history event each, and who sent it. */
async function fieldArrivals(plan: Plan, poses: PoseSessions): Promise<Map<string, Tally>> {
  const items = (m: Map<SyncEntity, Item[]>, e: SyncEntity) => m.get(e) ?? [];
  const poseSession = new Map<string, string>();
  for (const p of [...items(plan.inserts, 'pose'), ...items(plan.updates, 'pose')]) poseSession.set(p.record.id, p.record.sessionId as string);
  const readings = [
    ...items(plan.inserts, 'reading'),
    ...items(plan.updates, 'reading'),
    ...plan.conflicts.filter((c) => c.item.entity === 'reading').map((c) => c.item),
  ];
  await poses.load(readings.map((r) => r.record.poseId as string).filter((id) => !poseSession.has(id)));
  const sessionOf = (item: Item): string | undefined =>
    item.entity === 'testSession'
      ? item.record.id
      : item.entity === 'pose'
        ? (item.record.sessionId as string)
        : item.entity === 'reading'
          ? (poseSession.get(item.record.poseId as string) ?? poses.sessionOf(item.record.poseId as string))
          : undefined;
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
  return bySession;
}
