// What push and a conflict resolved with the phone's version share: the items of a batch and
// the plan of what it writes, the uniqueness rules judged on the state after the batch (reading
// slots, gauge point labels), and the bulk statements that write a plan's rows (one JSON parameter each).
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AuthContext } from '../auth/context';
import type { FieldError } from '../http/errors';
import { VehicleModel } from '../models';
import { syncOrder, syncTables, type SyncTable } from './sync-tables';
import type { SyncEntity } from '../../shared/schemas/sync';

export type Row = Record<string, unknown>;

export const db = (): Sequelize => VehicleModel.sequelize!;

export async function select<T = Row>(sql: string, bind: unknown[], transaction: Transaction): Promise<T[]> {
  return db().query(sql, { bind, transaction, type: QueryTypes.SELECT }) as Promise<T[]>;
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
}

export const rowKey = (entity: SyncEntity, id: string) => `${entity}:${id}`;

/** Every row a batch names, one `SELECT … FOR UPDATE` per table: the version checks and the access rules both judge these rows. */
export async function lockNamedRows(items: Item[], transaction: Transaction): Promise<Map<string, Row>> {
  const rows = new Map<string, Row>();
  for (const entity of syncOrder) {
    const ids = [...new Set(items.filter((i) => i.entity === entity).map((i) => i.record.id))];
    if (!ids.length) continue;
    const found = await select(`SELECT * FROM ${syncTables[entity].table} WHERE id = ANY($1::uuid[]) FOR UPDATE`, [ids], transaction);
    for (const r of found) rows.set(rowKey(entity, r.id as string), r);
  }
  return rows;
}

/**
 * The team's poses a batch refers to but does not carry, each looked up once: whether it exists,
 * its session, and whether that session has a signed envelope (the access rules close it to the
 * field), so a batch of readings needs no look-up of its own for the envelopes.
 */
export interface PoseSessions {
  load(ids: Iterable<string>): Promise<void>;
  /** The session of a loaded pose, or undefined when the team has no such pose. */
  sessionOf(id: string): string | undefined;
  /** Whether a loaded pose's session has a signed envelope; undefined for a session no loaded pose is in. */
  signed(sessionId: string): boolean | undefined;
}

export function poseSessions(auth: AuthContext, transaction: Transaction): PoseSessions {
  const known = new Map<string, string | undefined>();
  const signed = new Map<string, boolean>();
  return {
    async load(ids) {
      const missing = [...new Set(ids)].filter((id) => !known.has(id));
      if (!missing.length) return;
      for (const id of missing) known.set(id, undefined);
      const rows = await select<{ id: string; session_id: string; signed: boolean }>(
        `SELECT p.id, p.session_id, EXISTS (
           SELECT 1 FROM envelopes e WHERE e.session_id = p.session_id AND e.team_id = $1 AND e.status = 'signed' AND e.deleted_at IS NULL
         ) AS signed
         FROM poses p WHERE p.team_id = $1 AND p.id = ANY($2::uuid[])`,
        [auth.teamId, missing],
        transaction,
      );
      for (const r of rows) {
        known.set(r.id, r.session_id);
        signed.set(r.session_id, r.signed);
      }
    },
    sessionOf: (id) => known.get(id),
    signed: (sessionId) => signed.get(sessionId),
  };
}

/** Where a field error points: `body.changes.3.record.label` for a push, `clientRecord.label` for a resolution. */
export type FieldOf = (item: Item, key: string) => string;
export const field: FieldOf = (item, key) => `body.changes.${item.index}.record.${key}`;
export const short = (id: string) => id.slice(0, 8);

export const written = (plan: Plan, entity: SyncEntity) => [...plan.inserts.get(entity)!, ...plan.updates.get(entity)!];

/**
 * One live reading per pose, gauge point and axis, judged on the state after the batch: a reading
 * the batch writes takes its new slot and frees its old one; every other live reading (kept
 * conflicts included) stays where it is. A reading written into a slot another device filled
 * first is kept as a conflict with that reading; two of the batch's own in one slot are refused.
 */
export async function checkReadingSlots(auth: AuthContext, plan: Plan, errors: FieldError[], transaction: Transaction, fieldOf: FieldOf = field) {
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
export async function checkGaugeLabels(auth: AuthContext, plan: Plan, errors: FieldError[], transaction: Transaction, fieldOf: FieldOf = field) {
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
  await db().query(sql, { bind: [auth.teamId, ...(needsUser ? [auth.userId] : []), ...src.bind], transaction });
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
