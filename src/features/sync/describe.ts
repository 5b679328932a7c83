// Records and their fields in the trade's words, for conflicts, held records and saved files:
// "Lift front right: 410 mm on this phone, 0 mm on the server", never `"liftFrMm": 410`.
import type { UnitSystem } from '@shared/schemas';
import type { SyncEntity } from '@shared/schemas/sync';
import { AXIS_NAMES } from '@shared/format';
import { RETEST_STATE_WORDS, retestTargetWords } from '@shared/retest-words';
import { formatLength } from '@shared/units';
import type { FieldLookups } from '@/lib/db/unsent';

type Rec = Record<string, unknown>;
type Kind = 'length' | 'degrees' | 'text' | 'date' | 'time' | 'yes-no' | 'opening' | 'choice' | 'count';

const FIELDS: Record<SyncEntity, Record<string, [name: string, kind: Kind]>> = {
  vehicle: {
    name: ['Name', 'text'],
    chassis: ['Chassis', 'text'],
    body: ['Body', 'text'],
    wheelbaseMm: ['Wheelbase', 'length'],
    trackFrontMm: ['Track front', 'length'],
    trackRearMm: ['Track rear', 'length'],
    opening: ['Opening', 'opening'],
    nominalGapMm: ['Nominal gap', 'length'],
    notes: ['Notes', 'text'],
    deletedAt: ['Removed', 'time'],
  },
  gaugePoint: {
    label: ['Label', 'text'],
    yMm: ['Position y (+ left)', 'length'],
    zMm: ['Position z (above the rail)', 'length'],
    vehicleId: ['Vehicle', 'text'],
    deletedAt: ['Removed', 'time'],
  },
  testSession: {
    title: ['Title', 'text'],
    testedOn: ['Date', 'date'],
    conditions: ['Conditions', 'text'],
    loadState: ['Load state', 'text'],
    tyrePressures: ['Tyre pressures', 'text'],
    crew: ['Who', 'text'],
    readingMode: ['Readings entered as', 'choice'],
    safetyAckAt: ['Safety checklist done', 'time'],
    notes: ['Notes', 'text'],
    vehicleId: ['Vehicle', 'text'],
    deletedAt: ['Deleted', 'time'],
  },
  pose: {
    label: ['Pose name', 'text'],
    kind: ['Kind', 'choice'],
    liftFlMm: ['Lift front left', 'length'],
    liftFrMm: ['Lift front right', 'length'],
    liftRlMm: ['Lift rear left', 'length'],
    liftRrMm: ['Lift rear right', 'length'],
    rampAngleDeg: ['Ramp angle', 'degrees'],
    rampDistanceMm: ['Distance up the ramp', 'length'],
    notes: ['Notes', 'text'],
    seq: ['Order in the session', 'count'],
    recordedAt: ['Recorded at', 'time'],
    sessionId: ['Session', 'text'],
    deletedAt: ['Deleted', 'time'],
  },
  reading: {
    valueMm: ['Reading', 'length'],
    excluded: ['Excluded from the envelope', 'yes-no'],
    excludeReason: ['Reason for excluding', 'text'],
    flagNote: ['Flag note', 'text'],
    poseId: ['Pose', 'text'],
    gaugePointId: ['Gauge point', 'text'],
    axis: ['Axis', 'choice'],
    deletedAt: ['Cleared', 'time'],
  },
  retestRequest: {
    comment: ['What to measure again', 'text'],
    state: ['State', 'choice'],
    answer: ['Answer', 'text'],
    answeredAt: ['Answered at', 'time'],
    closedAt: ['Closed at', 'time'],
    askedAt: ['Asked at', 'time'],
    sessionId: ['Session', 'text'],
    poseId: ['Pose', 'text'],
    gaugePointId: ['Gauge point', 'text'],
    axis: ['Axis', 'choice'],
    answeredBy: ['Answered by', 'text'],
    closedBy: ['Closed by', 'text'],
    deletedAt: ['Withdrawn', 'time'],
  },
};

const CHOICES: Record<string, string> = {
  level: 'level',
  wheels: 'wheels lifted',
  ramp: 'ramp',
  gap: 'raw gaps',
  displacement: 'displacements',
  ...RETEST_STATE_WORDS,
  ...AXIS_NAMES,
};

const poseName = (p: Rec | undefined) => (p ? String(p.label || `Pose ${p.seq}`) : 'a pose not on this phone');

/** What the record is, as the tester knows it: "Point A lateral in Pose 2". */
export function recordTitle(entity: SyncEntity, r: Rec, look: FieldLookups): string {
  switch (entity) {
    case 'reading': {
      const point = look.gaugePoints.get(String(r.gaugePointId));
      const axis = AXIS_NAMES[r.axis as keyof typeof AXIS_NAMES] ?? String(r.axis);
      return `Point ${point?.label ?? '?'} ${axis} in ${poseName(look.poses.get(String(r.poseId)))}`;
    }
    case 'pose': {
      const session = look.sessions.get(String(r.sessionId));
      return `${poseName(r)}${session ? ` of “${session.title || 'Flex test'}” (${session.testedOn})` : ''}`;
    }
    case 'gaugePoint':
      return `Gauge point ${String(r.label)} on ${look.vehicles.get(String(r.vehicleId))?.name ?? 'a vehicle not on this phone'}`;
    case 'testSession':
      return `Session “${String(r.title) || 'Flex test'}” of ${String(r.testedOn)}`;
    case 'vehicle':
      return `Vehicle ${String(r.name)}`;
    case 'retestRequest': {
      const target = retestTargetWords(r as Parameters<typeof retestTargetWords>[0], {
        pose: (id) => look.poses.get(id),
        point: (id) => look.gaugePoints.get(id),
      });
      return `Re-test request on ${target}`;
    }
  }
}

/** One field's name: a reading's value is named by its slot ("Point A lateral in Pose 2"). */
export function fieldName(entity: SyncEntity, key: string, r: Rec, look: FieldLookups): string {
  if (entity === 'reading' && key === 'valueMm') return recordTitle(entity, r, look);
  return FIELDS[entity][key]?.[0] ?? key;
}

export function fieldValue(entity: SyncEntity, key: string, value: unknown, unit: UnitSystem): string {
  if (value === null || value === undefined || value === '') return key === 'deletedAt' ? 'no' : 'empty';
  const kind = FIELDS[entity][key]?.[1] ?? 'text';
  switch (kind) {
    case 'length':
      return formatLength(Number(value), unit, unit === 'in' ? 2 : Number.isInteger(Number(value)) ? 0 : 1);
    case 'degrees':
      return `${Number(value)}°`;
    case 'yes-no':
      return value ? 'yes' : 'no';
    case 'time':
      return key === 'deletedAt' ? 'yes' : new Date(String(value)).toLocaleString();
    case 'choice':
      return CHOICES[String(value)] ?? String(value);
    case 'opening': {
      const o = value as Record<string, number>;
      return `${formatLength(o.widthMm, unit)} × ${formatLength(o.heightMm, unit)}, corner radius ${formatLength(o.cornerRadiusMm, unit)}`;
    }
    default:
      return String(value);
  }
}

/** The fields a person wrote, in the order a tester reads them (identity and references last). */
export function describedFields(entity: SyncEntity): string[] {
  return Object.keys(FIELDS[entity]);
}

export interface Difference {
  key: string;
  name: string;
  phone: string;
  server: string;
}

/** Where this phone's version and the server's differ, field by field, in the trade's words. */
export function differences(entity: SyncEntity, phone: Rec, server: Rec, look: FieldLookups, unit: UnitSystem): Difference[] {
  return describedFields(entity)
    .filter((k) => JSON.stringify(phone[k] ?? null) !== JSON.stringify(server[k] ?? null))
    .map((k) => ({
      key: k,
      name: fieldName(entity, k, phone, look),
      phone: fieldValue(entity, k, phone[k], unit),
      server: fieldValue(entity, k, server[k], unit),
    }));
}

/** "Lift front right: 410 mm on this phone, 0 mm on the server". */
export const differenceSentence = (d: Difference) => `${d.name}: ${d.phone} on this phone, ${d.server} on the server`;

/** A record's own values in a line, for a held record or a saved file ("Pose name: Front left up; Lift front left: 300 mm"). */
export function valuesLine(entity: SyncEntity, r: Rec, look: FieldLookups, unit: UnitSystem): string {
  const skip = new Set(['sessionId', 'vehicleId', 'poseId', 'gaugePointId', 'axis', 'seq', 'recordedAt']);
  return describedFields(entity)
    .filter((k) => !skip.has(k) && r[k] !== undefined && !(k === 'deletedAt' && !r[k]))
    .map((k) => `${fieldName(entity, k, r, look)}: ${fieldValue(entity, k, r[k], unit)}`)
    .join('; ');
}
