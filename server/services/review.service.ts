// Review of a session's readings at the desk: the readings with who entered them and the
// session's history, and the engineer's edits of one reading (exclude with a reason, flag with a
// note, correct a value). Nothing is deleted; every edit checks the reading's version (a stale edit
// is a 409) and leaves a history event in the same transaction.
import { QueryTypes } from 'sequelize';
import { HistoryEventModel, PoseModel, ReadingModel, TestSessionModel } from '../models';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, NotFound } from '../http/errors';
import type { ReadingReviewInput } from '../../shared/schemas/envelope';
import type { SessionReview } from '../../shared/desk-responses';
import { readingOut } from './sessions.service';
import { withTeamChanges } from './team-changes';
import { isoSql, photoJsonSql, syncedRecordJsonSql } from './record-json';
import { answerValidator, companionRow, teamCursorSqlOf, type AnswerValidator, type CompanionQuery, type SessionCompanion } from '../http/validator';

type Reviewer = Pick<AuthContext, 'teamId' | 'userId'>;

/** How many of a session's latest history events the review carries. */
const HISTORY_SHOWN = 200;

// The whole answer in one statement: the session, its vehicle and gauge points, poses and readings
// (as getSessionDetail gives them), its photos (the engineer judges a reading by the pose's photos
// and notes), the names of the people who entered readings, and the latest
// history. PostgreSQL builds the JSON and the route passes the text through (see record-json.ts).
// Written once the models are initialised, from their column names.
let reviewSqlText: string | undefined;
export const reviewSql = () =>
  (reviewSqlText ??= `
WITH s AS (SELECT * FROM test_sessions WHERE id = $2 AND team_id = $1 AND deleted_at IS NULL),
v AS (SELECT v.* FROM vehicles v JOIN s ON v.id = s.vehicle_id WHERE v.team_id = $1),
g AS (SELECT g.* FROM gauge_points g JOIN s ON g.vehicle_id = s.vehicle_id WHERE g.team_id = $1 AND g.deleted_at IS NULL),
p AS (SELECT * FROM poses WHERE session_id = $2 AND team_id = $1 AND deleted_at IS NULL),
r AS (SELECT r.* FROM readings r JOIN p ON r.pose_id = p.id WHERE r.team_id = $1 AND r.deleted_at IS NULL),
ph AS (SELECT * FROM photos WHERE team_id = $1 AND session_id = $2 AND deleted_at IS NULL),
h AS (SELECT * FROM history_events WHERE team_id = $1 AND session_id = $2 ORDER BY id DESC LIMIT ${HISTORY_SHOWN})
SELECT (SELECT count(*) FROM s)::int AS sessions, (SELECT count(*) FROM v)::int AS vehicles, json_build_object(
  'session', (SELECT ${syncedRecordJsonSql('testSession', 's')} FROM s),
  'vehicle', (SELECT ${syncedRecordJsonSql('vehicle', 'v')} FROM v),
  'gaugePoints', coalesce((SELECT json_agg(${syncedRecordJsonSql('gaugePoint', 'g')} ORDER BY g.label) FROM g), '[]'),
  'poses', coalesce((SELECT json_agg(${syncedRecordJsonSql('pose', 'p')} ORDER BY p.seq) FROM p), '[]'),
  'readings', coalesce((SELECT json_agg(${syncedRecordJsonSql('reading', 'r', { enteredBy: 'r.entered_by' })} ORDER BY r.created_at, r.id) FROM r), '[]'),
  'photos', coalesce((SELECT json_agg(${photoJsonSql('ph')} ORDER BY ph.captured_at, ph.created_at) FROM ph), '[]'),
  'people', coalesce((SELECT json_object_agg(u.id, u.name) FROM users u WHERE u.id IN (SELECT entered_by FROM r)), '{}'),
  'history', coalesce((SELECT json_agg(json_build_object('id', h.id, 'entity', h.entity, 'entityId', h.entity_id, 'action', h.action,
    'userName', u.name, 'detail', h.detail, 'createdAt', ${isoSql('h.created_at')}) ORDER BY h.id DESC) FROM h LEFT JOIN users u ON u.id = h.user_id), '[]')
)::text AS body`);

/** The review as JSON text, built by PostgreSQL. */
export async function getReviewJson(auth: Pick<AuthContext, 'teamId'>, sessionId: string): Promise<string> {
  const [row] = await TestSessionModel.sequelize!.query<{ sessions: number; vehicles: number; body: string }>(reviewSql(), {
    bind: [auth.teamId, sessionId],
    type: QueryTypes.SELECT,
  });
  if (!row.sessions) throw new NotFound('session');
  if (!row.vehicles) throw new NotFound('vehicle');
  return row.body;
}

export async function getReview(auth: Pick<AuthContext, 'teamId'>, sessionId: string): Promise<SessionReview> {
  return JSON.parse(await getReviewJson(auth, sessionId)) as SessionReview;
}

/**
 * The review's validator: the team's change cursor moves with any change to the session's
 * records, the history's count and last id with any new event (http/validator.ts), and the latest
 * update of the people the answer may name (members, and everyone the session's history names,
 * members or not any more) with a renamed person. Its key also names the workshop and the session, for
 * the answer cache.
 */
export const REVIEW_VALIDATOR = 'review-validator';

/** The review's validator query for `sessionId`, read with the sign-in session (http/validator.ts SessionCompanion). */
export const reviewValidatorQuery = (sessionId: string): CompanionQuery => ({ name: REVIEW_VALIDATOR, sql: REVIEW_VALIDATOR_SQL, values: [sessionId] });

/**
 * The review's validator from the row its query read with the session; a session that is not the
 * caller's workshop's (or is deleted) is a 404 here, before any 304 or the review's statement.
 */
export function reviewValidator(auth: Pick<AuthContext, 'teamId' | 'sessionId'>, sessionId: string, companion: SessionCompanion | undefined): AnswerValidator {
  const row = companionRow<{ found: boolean; cursor: number; events: number; last: number; people: number }>(companion, REVIEW_VALIDATOR);
  if (!row.found) throw new NotFound('session');
  return answerValidator('review', [auth.teamId, sessionId], [row.cursor, row.events, row.last, row.people], auth.sessionId);
}

// Over the session's row p (the team is p.team_id) and $2, the reviewed session. Run on every
// request for the review, in the session look-up's statement. The people the answer names are its
// history's authors and whoever entered its readings: a reading reaches the server only through
// the sync push, which leaves a history event of the session naming who sent it
// (services/sync-push.ts), so the session's history authors and the team's members cover them,
// also after someone has left the workshop, without reading the readings. `found`: the session is
// the team's and not deleted.
const REVIEW_VALIDATOR_SQL = `SELECT EXISTS (SELECT 1 FROM test_sessions WHERE id = $2 AND team_id = p.team_id AND deleted_at IS NULL) AS found,
   ${teamCursorSqlOf('p.team_id')} AS cursor, count(*)::int AS events, coalesce(max(id), 0) AS last,
   (SELECT coalesce(floor(extract(epoch FROM max(u.updated_at)) * 1000), 0)::bigint FROM users u
     JOIN (SELECT user_id FROM memberships WHERE team_id = p.team_id UNION SELECT user_id FROM history_events WHERE team_id = p.team_id AND session_id = $2) named
       ON named.user_id = u.id) AS people
 FROM history_events WHERE team_id = p.team_id AND session_id = $2`;

/** The history action of a change to a reading, at the desk or through sync. */
export function readingEditAction(changes: Record<string, unknown>, excludedAfter: boolean): string {
  if ('excluded' in changes) return excludedAfter ? 'reading.exclude' : 'reading.include';
  if ('valueMm' in changes) return 'reading.correct';
  if ('flagNote' in changes) return 'reading.flag';
  return 'reading.edit';
}

export async function reviewReading(auth: Reviewer, readingId: string, input: ReadingReviewInput) {
  return withTeamChanges(auth.teamId, async (transaction) => {
    const reading = await ReadingModel.findOne({ where: { id: readingId, teamId: auth.teamId, deletedAt: null }, transaction, lock: transaction.LOCK.UPDATE });
    if (!reading) throw new NotFound('reading');
    const pose = await PoseModel.findOne({ where: { id: reading.poseId, teamId: auth.teamId }, transaction });
    const session = pose && (await TestSessionModel.findOne({ where: { id: pose.sessionId, teamId: auth.teamId, deletedAt: null }, transaction }));
    if (!pose || !session) throw new NotFound('reading');
    if (reading.version !== input.version) {
      throw new Conflict(`the reading changed since you loaded it (version ${reading.version}, yours ${input.version}); reload and review it again`);
    }
    const next = {
      excluded: input.excluded ?? reading.excluded,
      excludeReason: input.excludeReason !== undefined ? input.excludeReason || null : reading.excludeReason,
      flagNote: input.flagNote !== undefined ? input.flagNote || null : reading.flagNote,
      valueMm: input.valueMm ?? reading.valueMm,
    };
    // Including a reading again keeps no stale reason; excluding one always has a reason.
    if (!next.excluded) next.excludeReason = null;
    if (next.excluded && !next.excludeReason)
      throw new Invalid('body.excludeReason: excluding a reading needs a reason', [
        { field: 'body.excludeReason', message: 'excluding a reading needs a reason' },
      ]);

    const changes: Record<string, { before: unknown; after: unknown }> = {};
    for (const key of ['excluded', 'excludeReason', 'flagNote', 'valueMm'] as const) {
      if (reading[key] !== next[key]) changes[key] = { before: reading[key], after: next[key] };
    }
    if (Object.keys(changes).length === 0) return readingOut(reading);
    await reading.update({ ...next, version: reading.version + 1 }, { transaction });
    await HistoryEventModel.create(
      {
        teamId: auth.teamId,
        sessionId: session.id,
        entity: 'reading',
        entityId: reading.id,
        action: readingEditAction(changes, next.excluded),
        userId: auth.userId,
        detail: changes,
      },
      { transaction },
    );
    return readingOut(reading);
  });
}
