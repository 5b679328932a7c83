// A re-test request: the engineer asks the crew to measure again, on a whole session, one pose, or
// one reading (a gauge point and axis in a pose), with a comment; the tester answers in the field.
import * as z from 'zod';
import { axis, id, isoDateTime, syncedFields, text } from '../schemas/common';
import { defineRecord } from './define';

/**
 * Where a request stands: `open` (asked, waiting for the crew), `answered` (the crew replied, the
 * engineer has not closed it), `closed` (the engineer is satisfied, or withdrew it).
 */
export const retestStates = ['open', 'answered', 'closed'] as const;
export const retestState = z.enum(retestStates);
export type RetestState = z.infer<typeof retestState>;

/**
 * One request. The target is the session alone, a pose of it (`poseId`), or a reading's slot in a
 * pose (`poseId`, `gaugePointId` and `axis`): a slot, not a reading's id, since the crew may clear
 * and type a reading again. Who asked is the record's creator (filled by the server); who answered
 * and who closed are the people who made those changes (the server checks they are the sender).
 */
export const retestRequest = z
  .object({
    ...syncedFields,
    sessionId: id,
    poseId: id.nullable(),
    gaugePointId: id.nullable(),
    axis: axis.nullable(),
    comment: text(1_000, 1, 'say what to measure again and why'),
    askedAt: isoDateTime,
    state: retestState,
    answer: text(2_000),
    answeredAt: isoDateTime.nullable(),
    answeredBy: id.nullable(),
    closedAt: isoDateTime.nullable(),
    closedBy: id.nullable(),
  })
  .superRefine((r, ctx) => {
    const issue = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
    if ((r.gaugePointId == null) !== (r.axis == null)) issue('axis', 'a reading is named by its gauge point and its axis together');
    if (r.gaugePointId != null && r.poseId == null) issue('poseId', 'a reading is named in a pose: give the pose');
    if ((r.answeredAt == null) !== (r.answeredBy == null)) issue('answeredBy', 'an answer carries who answered and when, together');
    if ((r.closedAt == null) !== (r.closedBy == null)) issue('closedBy', 'closing carries who closed it and when, together');
    if (r.state === 'answered' && (r.answer.length === 0 || r.answeredAt == null)) issue('answer', 'an answered request needs the answer');
    if (r.state === 'closed' && r.closedAt == null) issue('closedAt', 'a closed request needs when it was closed');
    if (r.state !== 'closed' && r.closedAt != null) issue('closedAt', 'only a closed request has a closing time');
  });
export type RetestRequest = z.infer<typeof retestRequest>;

export const retestRequestRecord = defineRecord({
  entity: 'retestRequest',
  schema: retestRequest,
  table: 'retest_requests',
  columns: {
    sessionId: 'uuid',
    poseId: 'uuid',
    gaugePointId: 'uuid',
    axis: 'text',
    comment: 'text',
    askedAt: 'timestamptz',
    state: 'text',
    answer: 'text',
    answeredAt: 'timestamptz',
    answeredBy: 'uuid',
    closedAt: 'timestamptz',
    closedBy: 'uuid',
  },
  references: { sessionId: 'testSession', poseId: 'pose', gaugePointId: 'gaugePoint' },
  createdBy: 'askedBy',
  serverColumns: {},
  dexie: { table: 'retestRequests', indexes: ['sessionId'] },
  pullKey: 'retestRequests',
});

/** A new open request on a session (and, if given, a pose or a reading's slot), asked now. */
export function newRetestRequest(fields: Pick<RetestRequest, 'sessionId' | 'comment'> & Partial<RetestRequest>): RetestRequest {
  return {
    id: crypto.randomUUID(),
    version: 1,
    poseId: null,
    gaugePointId: null,
    axis: null,
    askedAt: new Date().toISOString(),
    state: 'open',
    answer: '',
    answeredAt: null,
    answeredBy: null,
    closedAt: null,
    closedBy: null,
    ...fields,
  };
}
