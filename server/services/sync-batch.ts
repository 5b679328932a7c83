// What push and a conflict resolved with the phone's version share: the items of a batch and
// the plan of what it writes, the uniqueness rules judged on the state after the batch (reading
// slots, gauge point labels), and the bulk statements that write a plan's rows (one JSON parameter each).
import type { Sequelize, Transaction } from 'sequelize';
import type { AuthContext } from '../auth/context';
import type { FieldError } from '../http/errors';
import { VehicleModel } from '../models';
import { preparedIn, queryIn } from '../db';
import { syncOrder, syncTables, type SyncTable } from './sync-tables';
import type { SyncEntity } from '../../shared/schemas/sync';

export type Row = Record<string, unknown>;

export const db = (): Sequelize => VehicleModel.sequelize!;

/** A statement of a batch's transaction that answers with rows (db.ts queryIn: straight through pg). */
export async function select<T extends object = Row>(sql: string, bind: unknown[], transaction: Transaction): Promise<T[]> {
  return queryIn<T>(transaction, sql, bind);
}

export interface Item {
  index: number;
  entity: SyncEntity;
  record: Record<string, unknown> & { id: string; version: number };
}

export interface Plan {
  inserts: Map<SyncEntity, Item[]>;
  updates: Map<SyncEntity, Item[]>;
  /**
   * Edits kept beside the server's row for a person to decide: a stale base version, or a new
   * reading typed into a slot another device filled first (then `targetId` is that reading).
   */
  conflicts: { item: Item; targetId: string; serverRow: Row }[];
}

/**
 * What the checks of one batch read once and share: the rows the batch names, and the session of
 * each pose its readings point at. Each is one query, not one per check.
 */
export interface BatchReads {
  /** `${entity}:${id}` → the row with that id, whichever team holds it; locked until commit. */
  rows: Map<string, Row>;
  poseSessions: PoseSessions;
  /** The rest the checks read, in one statement after the locked rows (readAhead). */
  lookups: Lookups;
}

export const rowKey = (entity: SyncEntity, id: string) => `${entity}:${id}`;

/** Every row a batch names, one `SELECT … FOR UPDATE` per table: the version checks and the access rules both judge these rows. */
export async function lockNamedRows(items: Item[], transaction: Transaction): Promise<Map<string, Row>> {
  const rows = new Map<string, Row>();
  for (const entity of syncOrder) {
    const ids = [...new Set(items.filter((i) => i.entity === entity).map((i) => i.record.id))];
    if (!ids.length) continue;
    const table = syncTables[entity].table;
    const found = await preparedIn<Row>(transaction, `push-lock-${table}`, `SELECT * FROM ${table} WHERE id = ANY($1::uuid[]) FOR UPDATE`, [ids]);
    for (const r of found) rows.set(rowKey(entity, r.id as string), r);
  }
  return rows;
}

/**
 * The team's rows of `table` that `where` finds by their keys (ids, poses, vehicles, sessions),
 * with `columns`. The team is compared only once the rows are found: PostgreSQL takes a team id
 * its statistics do not know yet (a workshop new since the last ANALYZE) for one row, and would
 * otherwise read the team's change index whole, a cost that grows with every reading the team
 * has; MATERIALIZED keeps the look-up by key apart from the team's comparison.
 */
export const teamRows = (table: string, columns: string, where: string, team: string) =>
  `WITH found AS MATERIALIZED (SELECT * FROM ${table} WHERE ${where}) SELECT ${columns} FROM found WHERE team_id = ${team}`;

type PoseRow = { id: string; session_id: string; signed: boolean };

/** The team's poses among `ids`, each with its session and whether that session has a signed envelope. */
const posesOfTeam = (team: string, ids: string) =>
  `SELECT p.id, p.session_id, EXISTS (${teamRows('envelopes', '1', "session_id = p.session_id AND status = 'signed' AND deleted_at IS NULL", team)}) AS signed
   FROM (${teamRows('poses', 'id, session_id', `id = ANY(${ids}::uuid[])`, team)}) p`;

/**
 * The team's poses a batch refers to but does not carry, each looked up once: whether it exists,
 * its session, and whether that session has a signed envelope (the access rules close it to the
 * field), so a batch of readings needs no look-up of its own for the envelopes.
 */
export interface PoseSessions {
  load(ids: Iterable<string>): Promise<void>;
  /** What a look-up of `asked` found (`rows`), read with other look-ups in one statement (readAhead). */
  take(asked: Iterable<string>, rows: PoseRow[]): void;
  /** The session of a loaded pose, or undefined when the team has no such pose. */
  sessionOf(id: string): string | undefined;
  /** Whether a loaded pose's session has a signed envelope; undefined for a session no loaded pose is in. */
  signed(sessionId: string): boolean | undefined;
}

export function poseSessions(auth: AuthContext, transaction: Transaction): PoseSessions {
  const known = new Map<string, string | undefined>();
  const signed = new Map<string, boolean>();
  const missing = (ids: Iterable<string>) => [...new Set(ids)].filter((id) => !known.has(id));
  const take = (asked: string[], rows: PoseRow[]) => {
    for (const id of asked) known.set(id, undefined);
    for (const r of rows) {
      known.set(r.id, r.session_id);
      signed.set(r.session_id, r.signed);
    }
  };
  return {
    async load(ids) {
      const asked = missing(ids);
      if (asked.length) take(asked, await select<PoseRow>(posesOfTeam('$1', '$2'), [auth.teamId, asked], transaction));
    },
    take: (asked, rows) => take(missing(asked), rows),
    sessionOf: (id) => known.get(id),
    signed: (sessionId) => signed.get(sessionId),
  };
}

/** Where a field error points: `body.changes.3.record.label` for a push, `clientRecord.label` for a resolution. */
export type FieldOf = (item: Item, key: string) => string;
export const field: FieldOf = (item, key) => `body.changes.${item.index}.record.${key}`;
export const short = (id: string) => id.slice(0, 8);

export const written = (plan: Plan, entity: SyncEntity) => [...plan.inserts.get(entity)!, ...plan.updates.get(entity)!];

type SlotRow = { id: string; pose_id: string; gauge_point_id: string; axis: string };
type LabelRow = { id: string; vehicle_id: string; label: string };

// Only the team's rows: another workshop's (refused as a reference anyway) is never named back.
/** The team's live readings in the poses `poses` (an array parameter): who holds each slot. */
const slotHolders = (team: string, poses: string) =>
  teamRows('readings', 'id, pose_id, gauge_point_id, axis', `pose_id = ANY(${poses}::uuid[]) AND deleted_at IS NULL`, team);
/** The team's live gauge points on the vehicles `vehicles` (an array parameter): who holds each label. */
const labelHolders = (team: string, vehicles: string) =>
  teamRows('gauge_points', 'id, vehicle_id, label', `vehicle_id = ANY(${vehicles}::uuid[]) AND deleted_at IS NULL`, team);

/**
 * What a push's checks read besides the rows it locks, all in one statement after them (and after
 * the team's lock, which every writer of the team's rows holds, so one snapshot reads what
 * separate statements would). Each part asks for at least what its check needs: the poses,
 * references, slots and labels of every record of the batch, which the checks then narrow.
 */
export interface Lookups {
  /** `${entity}:${id}` of each row the batch refers to without carrying it that the team holds (poses: in PoseSessions). */
  referenced: Set<string>;
  /** The team's live readings in the poses of the batch's live readings. */
  slots: SlotRow[];
  /** The team's live gauge points on the vehicles of the batch's live gauge points. */
  labels: LabelRow[];
}

export async function readAhead(auth: AuthContext, items: Item[], rows: Map<string, Row>, poses: PoseSessions, transaction: Transaction): Promise<Lookups> {
  const carried = new Map<SyncEntity, Set<string>>(syncOrder.map((e) => [e, new Set()]));
  for (const item of items) carried.get(item.entity)!.add(item.record.id);
  const wanted = new Map<SyncEntity, Set<string>>(syncOrder.map((e) => [e, new Set()]));
  for (const item of items) {
    for (const ref of syncTables[item.entity].references) {
      const target = item.record[ref.key] as string | null;
      if (target != null && !carried.get(ref.entity)!.has(target)) wanted.get(ref.entity)!.add(target);
    }
  }
  // The access rules also ask for the pose a reading the team holds was in (a reading can move).
  for (const [key, row] of rows) {
    if (key.startsWith('reading:') && row.team_id === auth.teamId && !carried.get('pose')!.has(row.pose_id as string))
      wanted.get('pose')!.add(row.pose_id as string);
  }
  const live = (entity: SyncEntity, key: string) => [
    ...new Set(items.filter((i) => i.entity === entity && !i.record.deletedAt).map((i) => i.record[key] as string)),
  ];
  const slotPoses = live('reading', 'poseId');
  const labelVehicles = live('gaugePoint', 'vehicleId');

  const bind: unknown[] = [auth.teamId];
  const param = (value: unknown) => `$${bind.push(value)}`;
  const listOf = (sql: string) => `(SELECT coalesce(json_agg(x), '[]') FROM (${sql}) x)`;
  const parts: string[] = [];
  const posesAsked = [...wanted.get('pose')!];
  if (posesAsked.length) parts.push(`${listOf(posesOfTeam('$1', param(posesAsked)))} AS poses`);
  const references = syncOrder
    .filter((e) => e !== 'pose' && wanted.get(e)!.size)
    .map((e) => `(${teamRows(syncTables[e].table, `'${e}' AS entity, id`, `id = ANY(${param([...wanted.get(e)!])}::uuid[])`, '$1')})`);
  if (references.length) parts.push(`${listOf(references.join(' UNION ALL '))} AS refs`);
  if (slotPoses.length) parts.push(`${listOf(slotHolders('$1', param(slotPoses)))} AS slots`);
  if (labelVehicles.length) parts.push(`${listOf(labelHolders('$1', param(labelVehicles)))} AS labels`);
  if (!parts.length) return { referenced: new Set(), slots: [], labels: [] };

  const [found] = await select<{ poses?: PoseRow[]; refs?: { entity: SyncEntity; id: string }[]; slots?: SlotRow[]; labels?: LabelRow[] }>(
    `SELECT ${parts.join(', ')}`,
    bind,
    transaction,
  );
  if (posesAsked.length) poses.take(posesAsked, found.poses!);
  return { referenced: new Set((found.refs ?? []).map((r) => rowKey(r.entity, r.id))), slots: found.slots ?? [], labels: found.labels ?? [] };
}

/**
 * One live reading per pose, gauge point and axis, judged on the state after the batch: a reading
 * the batch writes takes its new slot and frees its old one; every other live reading (kept
 * conflicts included) stays where it is. A reading written into a slot another device filled
 * first is kept as a conflict with that reading; two of the batch's own in one slot are refused.
 */
export async function checkReadingSlots(
  auth: AuthContext,
  plan: Plan,
  errors: FieldError[],
  transaction: Transaction,
  fieldOf: FieldOf = field,
  read?: SlotRow[],
) {
  const writes = written(plan, 'reading');
  const live = writes.filter((i) => !i.record.deletedAt);
  if (!live.length) return;
  const slot = (r: { poseId: unknown; gaugePointId: unknown; axis: unknown }) => `${r.poseId}|${r.gaugePointId}|${r.axis}`;
  const writtenIds = new Set(writes.map((i) => i.record.id));
  const rows = read ?? (await select<SlotRow>(slotHolders('$2', '$1'), [[...new Set(live.map((i) => i.record.poseId as string))], auth.teamId], transaction));
  const holders = new Map<string, SlotRow>();
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
export async function checkGaugeLabels(
  auth: AuthContext,
  plan: Plan,
  errors: FieldError[],
  transaction: Transaction,
  fieldOf: FieldOf = field,
  read?: LabelRow[],
) {
  const writes = written(plan, 'gaugePoint');
  const live = writes.filter((i) => !i.record.deletedAt);
  if (!live.length) return;
  const writtenIds = new Set(writes.map((i) => i.record.id));
  const rows =
    read ?? (await select<LabelRow>(labelHolders('$2', '$1'), [[...new Set(live.map((i) => i.record.vehicleId as string))], auth.teamId], transaction));
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

/**
 * The batch's records as rows: one JSON parameter that PostgreSQL reads with json_to_recordset,
 * each field typed by its column. One native JSON.stringify instead of an array literal built and
 * escaped element by element per column, and the row count never meets the parameter limit. A
 * missing field and a JSON null are both SQL NULL; a jsonb column takes the field's JSON as it is.
 */
function recordSource(spec: SyncTable, items: Item[], param: number, json?: RecordsJson) {
  const fields = [{ key: 'id', column: 'id', type: 'uuid' }, { key: 'version', column: 'base_version', type: 'int4' }, ...spec.columns];
  const typed = fields.map((f) => `"${f.key}" ${f.type}`).join(', ');
  const named = fields.map((f) => `r."${f.key}" AS ${f.column}`).join(', ');
  return {
    bind: [json && json.items.length === items.length && json.items.every((item, k) => item === items[k]) ? json.text : recordsJson(items).text],
    sql: `(SELECT ${named} FROM json_to_recordset($${param}::json) AS r(${typed})) AS u`,
  };
}

/** The records of some items as the bulk statements' JSON parameter, made ahead (sync-push.ts) for the items it names. */
export interface RecordsJson {
  items: Item[];
  text: string;
}

export const recordsJson = (items: Item[]): RecordsJson => ({ items, text: JSON.stringify(items.map((i) => i.record)) });

/** Inserts the items' records; `json`, made ahead for the same items in the same order, is used as it is. */
export async function bulkInsert(auth: AuthContext, spec: SyncTable, items: Item[], transaction: Transaction, json?: RecordsJson) {
  // $2 (the signed-in user) is bound only where a column takes it: PostgreSQL refuses an untyped unused parameter.
  const needsUser = Boolean(spec.createdByColumn);
  const src = recordSource(spec, items, needsUser ? 3 : 2, json);
  const cols = spec.columns.map((col) => col.column);
  const extraCols = [...(spec.createdByColumn ? [spec.createdByColumn] : []), ...(spec.entity === 'testSession' ? ['safety_ack_by'] : [])];
  const extraVals = [
    ...(spec.createdByColumn ? ['$2::uuid'] : []),
    ...(spec.entity === 'testSession' ? ['CASE WHEN u.safety_ack_at IS NULL THEN NULL ELSE $2::uuid END'] : []),
  ];
  const sql = `INSERT INTO ${spec.table} (id, team_id, version, ${[...cols, ...extraCols].join(', ')})
    SELECT u.id, $1::uuid, 1, ${[...cols.map((c) => `u.${c}`), ...extraVals].join(', ')} FROM ${src.sql}`;
  await preparedIn(transaction, `push-insert-${spec.table}`, sql, [auth.teamId, ...(needsUser ? [auth.userId] : []), ...src.bind]);
}

export async function bulkUpdate(auth: AuthContext, spec: SyncTable, items: Item[], transaction: Transaction) {
  const needsUser = spec.entity === 'testSession';
  const src = recordSource(spec, items, needsUser ? 3 : 2);
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
