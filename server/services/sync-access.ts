// Who may change what through sync push, field by field: the same actions the REST routes check
// (shared/permissions.ts), so a phone can do nothing the desk would refuse the same person.
//
// The rules are data (`syncAccess`, one entry per entity): the action that creates a record, the
// action each field needs to change, and the defaults a new record must carry in every field its
// author may not set. On top of that, a session whose envelope is signed is closed to the field:
// any change to it, its poses or its readings (new, changed or deleted) needs `session.review`.
//
// A change is what differs from the server's row (for a new record: from the defaults), so a phone
// sending back a whole record with an engineer's exclusion in it, untouched, changes nothing it
// may not. A refused change rejects the batch with a 400 naming each refused field; nothing of it
// is written. Every accepted change to a record the server had leaves a history event with the
// before and after value of each field, in the same transaction as the write; so does a new re-test
// request (the engineer's question), whose steps (asked, answered, closed, asked again) are named.
import type { Transaction } from 'sequelize';
import canonicalize from 'canonicalize';
import type { AuthContext } from '../auth/context';
import { can, whoMay, type Action } from '../../shared/permissions';
import { Invalid, type FieldError } from '../http/errors';
import { syncTables } from './sync-tables';
import type { Column } from '../../shared/records/define';
import { readingEditAction } from './review.service';
import { db, lockNamedRows, poseSessions, rowKey, select, teamRows, type BatchReads, type PoseSessions, type Row } from './sync-batch';
import type { SyncEntity } from '../../shared/schemas/sync';

/** The action a change needs: one per field, or one that depends on the new value and the server's row (a state's step). */
type FieldRule = Action | ((record: Row, row: Row | undefined) => Action);

interface EntityAccess {
  /** Creating the record. */
  create: Action;
  /** The action that changes each field (every column of the record has one). */
  fields: Record<string, FieldRule>;
  /** What a new record must hold in each field its author may not set (absent: any value). */
  defaults: Record<string, unknown>;
  /** Part of a session: closed once the session has a signed envelope, except to this action. */
  signedSession?: Action;
  /** Fields that name who made a change (who answered): when changed to a person, it must be the sender. */
  sender?: string[];
}

/**
 * Every field of the record (shared/records) needs `action` to change, but those named in
 * `except`: a field added to a record is guarded like the record's other fields at once.
 */
const fieldsOf = (entity: SyncEntity, action: Action, except: Record<string, FieldRule> = {}) => ({
  ...Object.fromEntries(syncTables[entity].columns.map((c) => [c.key, action])),
  ...except,
});

/** The rules, per entity and field (README "Roles and permissions" states them in words). */
export const syncAccess: Record<SyncEntity, EntityAccess> = {
  vehicle: {
    create: 'vehicle.write',
    fields: fieldsOf('vehicle', 'vehicle.write', { deletedAt: 'vehicle.delete' }),
    defaults: { deletedAt: null },
  },
  gaugePoint: {
    create: 'vehicle.write',
    // The desk's gauge point editor (vehicle.write) also removes points.
    fields: fieldsOf('gaugePoint', 'vehicle.write'),
    defaults: { deletedAt: null },
  },
  testSession: {
    create: 'session.record',
    fields: fieldsOf('testSession', 'session.record', { deletedAt: 'session.delete' }),
    defaults: { deletedAt: null },
    signedSession: 'session.review',
  },
  pose: {
    create: 'session.record',
    fields: fieldsOf('pose', 'session.record'),
    defaults: { deletedAt: null },
    signedSession: 'session.review',
  },
  reading: {
    create: 'session.record',
    // Review at the desk: PATCH /api/readings/:id/review needs the same action.
    fields: fieldsOf('reading', 'session.record', { excluded: 'session.review', excludeReason: 'session.review', flagNote: 'session.review' }),
    defaults: { excluded: false, excludeReason: null, flagNote: null, deletedAt: null },
    signedSession: 'session.review',
  },
  retestRequest: {
    create: 'retest.ask',
    // The engineer asks, edits the comment, closes and reopens; the crew answers. Answering a
    // closed request reopens the question, so it is for those who may reopen.
    fields: fieldsOf('retestRequest', 'retest.ask', {
      answer: 'retest.answer',
      answeredAt: 'retest.answer',
      answeredBy: 'retest.answer',
      state: (record, row) => (record.state === 'answered' && row?.state !== 'closed' ? 'retest.answer' : 'retest.ask'),
    }),
    defaults: { state: 'open', answer: '', answeredAt: null, answeredBy: null, closedAt: null, closedBy: null, deletedAt: null },
    sender: ['answeredBy', 'closedBy'],
  },
};

export interface AccessItem {
  index: number;
  entity: SyncEntity;
  record: Record<string, unknown> & { id: string; version: number };
}

/** One value in a form that compares equal when it means the same (an instant, a JSON value, a uuid). */
function comparable(col: Column, v: unknown): unknown {
  if (v === undefined || v === null) return null;
  if (col.type === 'timestamptz') return new Date(v as string | Date).getTime();
  if (col.type === 'jsonb') return canonicalize(v);
  if (col.type === 'uuid') return String(v).toLowerCase();
  return v;
}

/** The value as a person reads it in the history (ISO times, plain JSON). */
function shown(col: Column, v: unknown): unknown {
  if (v === undefined || v === null) return null;
  if (col.type === 'timestamptz') return new Date(v as string | Date).toISOString();
  return v;
}

/** Per entity, the columns a new record must hold a default in, in column order, with the default as `comparable` gives it. */
const defaultColumns = new Map<SyncEntity, { col: Column; value: unknown }[]>();
function defaultsOf(entity: SyncEntity) {
  let list = defaultColumns.get(entity);
  if (!list) {
    const defaults = syncAccess[entity].defaults;
    list = syncTables[entity].columns.filter((col) => col.key in defaults).map((col) => ({ col, value: comparable(col, defaults[col.key]) }));
    defaultColumns.set(entity, list);
  }
  return list;
}

const fieldPath = (index: number, key: string) => `body.changes.${index}.record.${key}`;

const WORDS: Record<SyncEntity, string> = {
  vehicle: 'a vehicle',
  gaugePoint: 'a gauge point',
  testSession: 'a session',
  pose: 'a pose',
  reading: 'a reading',
  retestRequest: 'a re-test request',
};

/**
 * Checks every change of a push (or a conflict resolved with the phone's version) against the
 * signed-in person's role, and records the accepted changes' before and after values. Items the
 * server will keep as conflicts (stale version) or refuse anyway (another workshop's id, a bad
 * version) are left to the batch check. Throws Invalid naming each refused field.
 */
export async function enforceSyncAccess(
  auth: AuthContext,
  items: AccessItem[],
  transaction: Transaction,
  where: (index: number, key: string) => string = fieldPath,
  reads?: BatchReads,
): Promise<void> {
  const named = reads?.rows ?? (await lockNamedRows(items, transaction));
  // Another workshop's row under the same id is the batch check's to refuse: nothing of it is compared here.
  const rows = new Map([...named].filter(([, row]) => row.team_id === auth.teamId));
  const applied = items.filter((item) => {
    const row = rows.get(rowKey(item.entity, item.record.id));
    return row ? row.version === item.record.version : item.record.version === 1;
  });

  const poses = reads?.poseSessions ?? poseSessions(auth, transaction);
  const resolve = await sessionResolver(applied, rows, poses);
  // Each item's sessions, worked out once (a batch of readings asks for them twice an item).
  const sessionLists = new Map(applied.map((item) => [item, resolve(item)]));
  const sessionsOf = (item: AccessItem) => sessionLists.get(item)!;
  const sessionIds = [...new Set([...sessionLists.values()].flat())];
  // The pose look-up already said for the sessions of the poses it found; only the others are asked.
  const unknown = sessionIds.filter((s) => poses.signed(s) === undefined);
  const signed = new Set(sessionIds.filter((s) => poses.signed(s)));
  if (unknown.length) {
    const found = await select<{ session_id: string }>(
      `SELECT DISTINCT session_id FROM (${teamRows('envelopes', 'session_id', "session_id = ANY($2::uuid[]) AND status = 'signed' AND deleted_at IS NULL", '$1')}) e`,
      [auth.teamId, unknown],
      transaction,
    );
    for (const r of found) signed.add(r.session_id);
  }

  const errors: FieldError[] = [];
  const history: { item: AccessItem; sessionId: string | null; changes: Record<string, { before: unknown; after: unknown }> }[] = [];
  for (const item of applied) {
    const rules = syncAccess[item.entity];
    const spec = syncTables[item.entity];
    const row = rows.get(rowKey(item.entity, item.record.id));
    const refuse = (key: string, action: Action, what: string) =>
      errors.push({ field: where(item.index, key), message: `a ${auth.role} may not ${what}: that is for ${whoMay(action)} (${action})` });

    const changed: Column[] = [];
    if (row) {
      for (const col of spec.columns) if (comparable(col, item.record[col.key]) !== comparable(col, row[col.column])) changed.push(col);
    } else {
      // A new record: only the fields with a default are compared, each with its default's form made once.
      for (const { col, value } of defaultsOf(item.entity)) if (comparable(col, item.record[col.key]) !== value) changed.push(col);
    }
    if (row && !changed.length) continue;

    if (!row && !can(auth.role, rules.create)) refuse('id', rules.create, `add ${WORDS[item.entity]}`);
    for (const col of changed) {
      const rule = rules.fields[col.key];
      const action = typeof rule === 'function' ? rule(item.record, row) : rule;
      if (!can(auth.role, action)) refuse(col.key, action, `${row ? 'change' : 'set'} ${col.key} of ${WORDS[item.entity]}`);
      const sender = rules.sender?.includes(col.key) && item.record[col.key] != null;
      if (sender && comparable(col, item.record[col.key]) !== comparable(col, auth.userId)) {
        errors.push({ field: where(item.index, col.key), message: `${col.key} must be the person who sends the change (you), not someone else` });
      }
    }
    const closed = rules.signedSession && sessionsOf(item).some((s) => signed.has(s));
    if (closed && !can(auth.role, rules.signedSession!)) {
      refuse(row ? changed[0].key : 'id', rules.signedSession!, `${row ? 'change' : 'add'} ${WORDS[item.entity]} of a session whose envelope is signed`);
    }
    // A new record's arrival is in the field's sync summary; a new re-test request is the engineer's
    // question, so it is a history event of its own, with what was asked.
    if (row || item.entity === 'retestRequest') {
      const before = (col: Column) => (row ? shown(col, row[col.column]) : null);
      const fields = row ? changed : spec.columns.filter((col) => item.record[col.key] != null && col.key !== 'askedAt');
      const changes = Object.fromEntries(fields.map((col) => [col.key, { before: before(col), after: shown(col, item.record[col.key]) }]));
      history.push({ item, sessionId: sessionsOf(item)[0] ?? null, changes });
    }
  }
  if (errors.length) {
    throw new Invalid(
      `batch rejected, nothing was written: ${errors.length} change${errors.length > 1 ? 's' : ''} your role may not make, first ${errors[0].field}: ${errors[0].message}`,
      errors,
    );
  }
  await recordChanges(auth, history, transaction);
}

/** The session(s) each item belongs to, before and after the change (a pose or reading can move). */
async function sessionResolver(items: AccessItem[], rows: Map<string, Row>, poses: PoseSessions) {
  const batchPoses = new Map<string, string>();
  for (const i of items) if (i.entity === 'pose') batchPoses.set(i.record.id, i.record.sessionId as string);
  const poseIds = new Set<string>();
  for (const i of items) {
    if (i.entity !== 'reading') continue;
    poseIds.add(i.record.poseId as string);
    const row = rows.get(rowKey('reading', i.record.id));
    if (row) poseIds.add(row.pose_id as string);
  }
  await poses.load([...poseIds].filter((id) => !batchPoses.has(id)));
  const sessionOfPose = (id: string) => batchPoses.get(id) ?? poses.sessionOf(id);
  return (item: AccessItem): string[] => {
    const row = rows.get(rowKey(item.entity, item.record.id));
    const ids =
      item.entity === 'testSession'
        ? [item.record.id]
        : item.entity === 'pose'
          ? [item.record.sessionId as string, row?.session_id as string | undefined]
          : item.entity === 'reading'
            ? [sessionOfPose(item.record.poseId as string), row ? sessionOfPose(row.pose_id as string) : undefined]
            : item.entity === 'retestRequest'
              ? [item.record.sessionId as string, row?.session_id as string | undefined]
              : [];
    const [first, second] = ids;
    if (!first) return second ? [second] : [];
    return second && second !== first ? [first, second] : [first];
  };
}

/** One history event per changed record, with each field's before and after (as the desk's review leaves them). */
async function recordChanges(
  auth: AuthContext,
  history: { item: AccessItem; sessionId: string | null; changes: Record<string, { before: unknown; after: unknown }> }[],
  transaction: Transaction,
) {
  if (!history.length) return;
  const action = (h: (typeof history)[number]) =>
    h.item.entity === 'reading'
      ? readingEditAction(h.changes, h.item.record.excluded as boolean)
      : h.item.entity === 'retestRequest'
        ? retestAction(h.changes)
        : `${h.item.entity}.edit`;
  await db().query(
    `INSERT INTO history_events (team_id, session_id, entity, entity_id, action, user_id, detail)
     SELECT $1::uuid, u.session_id, u.entity, u.entity_id, u.action, $2::uuid, u.detail
     FROM unnest($3::uuid[], $4::text[], $5::uuid[], $6::text[], $7::jsonb[]) AS u(session_id, entity, entity_id, action, detail)`,
    {
      bind: [
        auth.teamId,
        auth.userId,
        history.map((h) => h.sessionId),
        history.map((h) => h.item.entity),
        history.map((h) => h.item.record.id),
        history.map(action),
        history.map((h) => JSON.stringify(h.changes)),
      ],
      transaction,
    },
  );
}

/** The history action of a change to a re-test request: asked, answered, closed, reopened or edited. */
export function retestAction(changes: Record<string, { before: unknown; after: unknown }>): string {
  const state = changes.state;
  if (!state) return 'retest.edit';
  if (state.before === null) return 'retest.ask';
  return { open: 'retest.reopen', answered: 'retest.answer', closed: 'retest.close' }[state.after as string] ?? 'retest.edit';
}
