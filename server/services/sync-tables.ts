// How each synced record maps onto its table: the columns a client may write (with their
// PostgreSQL types, for the array-based bulk statements), the columns the server sets from the
// session, and the way back from a row to the record of shared/schemas.
import type { SyncEntity } from '../../shared/schemas/sync';

export interface SyncColumn {
  /** The record's field (shared/schemas). */
  key: string;
  column: string;
  /** PostgreSQL type of the column: the bulk statements pass each column as one typed array. */
  type: 'uuid' | 'text' | 'float8' | 'int4' | 'bool' | 'jsonb' | 'date' | 'timestamptz';
}

export interface SyncTable {
  entity: SyncEntity;
  table: string;
  /** Client-writable columns, besides id and version. */
  columns: SyncColumn[];
  /** Columns set from the signed-in user when a row is created (never from the client). */
  createdByColumn?: string;
  /** References to other synced records: checked against this batch and the team's rows. */
  references: { key: string; entity: SyncEntity }[];
}

const c = (key: string, column: string, type: SyncColumn['type']): SyncColumn => ({ key, column, type });
const deletedAt = c('deletedAt', 'deleted_at', 'timestamptz');

export const syncTables: Record<SyncEntity, SyncTable> = {
  vehicle: {
    entity: 'vehicle',
    table: 'vehicles',
    columns: [
      c('name', 'name', 'text'),
      c('chassis', 'chassis', 'text'),
      c('body', 'body', 'text'),
      c('wheelbaseMm', 'wheelbase_mm', 'float8'),
      c('trackFrontMm', 'track_front_mm', 'float8'),
      c('trackRearMm', 'track_rear_mm', 'float8'),
      c('opening', 'opening', 'jsonb'),
      c('nominalGapMm', 'nominal_gap_mm', 'float8'),
      c('notes', 'notes', 'text'),
      deletedAt,
    ],
    references: [],
  },
  gaugePoint: {
    entity: 'gaugePoint',
    table: 'gauge_points',
    columns: [c('vehicleId', 'vehicle_id', 'uuid'), c('label', 'label', 'text'), c('yMm', 'y_mm', 'float8'), c('zMm', 'z_mm', 'float8'), deletedAt],
    references: [{ key: 'vehicleId', entity: 'vehicle' }],
  },
  testSession: {
    entity: 'testSession',
    table: 'test_sessions',
    columns: [
      c('vehicleId', 'vehicle_id', 'uuid'),
      c('title', 'title', 'text'),
      c('testedOn', 'tested_on', 'date'),
      c('conditions', 'conditions', 'text'),
      c('loadState', 'load_state', 'text'),
      c('tyrePressures', 'tyre_pressures', 'text'),
      c('crew', 'crew', 'text'),
      c('readingMode', 'reading_mode', 'text'),
      c('safetyAckAt', 'safety_ack_at', 'timestamptz'),
      c('notes', 'notes', 'text'),
      deletedAt,
    ],
    createdByColumn: 'created_by',
    references: [{ key: 'vehicleId', entity: 'vehicle' }],
  },
  pose: {
    entity: 'pose',
    table: 'poses',
    columns: [
      c('sessionId', 'session_id', 'uuid'),
      c('seq', 'seq', 'int4'),
      c('label', 'label', 'text'),
      c('kind', 'kind', 'text'),
      c('liftFlMm', 'lift_fl_mm', 'float8'),
      c('liftFrMm', 'lift_fr_mm', 'float8'),
      c('liftRlMm', 'lift_rl_mm', 'float8'),
      c('liftRrMm', 'lift_rr_mm', 'float8'),
      c('rampAngleDeg', 'ramp_angle_deg', 'float8'),
      c('rampDistanceMm', 'ramp_distance_mm', 'float8'),
      c('rampWheel', 'ramp_wheel', 'text'),
      c('notes', 'notes', 'text'),
      c('recordedAt', 'recorded_at', 'timestamptz'),
      deletedAt,
    ],
    createdByColumn: 'created_by',
    references: [{ key: 'sessionId', entity: 'testSession' }],
  },
  reading: {
    entity: 'reading',
    table: 'readings',
    columns: [
      c('poseId', 'pose_id', 'uuid'),
      c('gaugePointId', 'gauge_point_id', 'uuid'),
      c('axis', 'axis', 'text'),
      c('valueMm', 'value_mm', 'float8'),
      c('excluded', 'excluded', 'bool'),
      c('excludeReason', 'exclude_reason', 'text'),
      c('flagNote', 'flag_note', 'text'),
      deletedAt,
    ],
    createdByColumn: 'entered_by',
    references: [
      { key: 'poseId', entity: 'pose' },
      { key: 'gaugePointId', entity: 'gaugePoint' },
    ],
  },
};

/** Parents before children, so a batch's inserts satisfy the foreign keys. */
export const syncOrder: SyncEntity[] = ['vehicle', 'gaugePoint', 'testSession', 'pose', 'reading'];

type Row = Record<string, unknown>;

const isoOrNull = (v: unknown) => (v == null ? null : new Date(v as string | Date).toISOString());

/** A raw row (snake_case, as PostgreSQL returns it) → the record of shared/schemas plus its change cursor. */
export function rowToRecord(spec: SyncTable, row: Row): Record<string, unknown> & { id: string; version: number; changeSeq: number } {
  const out: Record<string, unknown> = { id: row.id, version: row.version, changeSeq: Number(row.change_seq) };
  for (const col of spec.columns) {
    const v = row[col.column];
    out[col.key] = col.type === 'timestamptz' ? isoOrNull(v) : v;
  }
  return out as Record<string, unknown> & { id: string; version: number; changeSeq: number };
}

/** A record's value for one column, as the bulk statement's typed array wants it. */
export function columnValue(col: SyncColumn, record: Record<string, unknown>): unknown {
  const v = record[col.key];
  if (v === undefined) return null;
  if (col.type === 'jsonb') return v === null ? null : JSON.stringify(v);
  return v;
}
