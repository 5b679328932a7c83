// Review of a session's readings at the desk: the readings with who entered them and the
// session's history, and the engineer's edits of one reading (exclude with a reason, flag with a
// note, correct a value). Nothing is deleted; every edit checks the reading's version (a stale edit
// is a 409) and leaves a history event in the same transaction.
import { HistoryEventModel, PoseModel, ReadingModel, TestSessionModel, UserModel } from '../models';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, NotFound } from '../http/errors';
import type { HistoryEventRecord, ReadingReviewInput } from '../../shared/schemas/envelope';
import type { SessionReview } from '../../shared/desk-responses';
import { getSessionDetail } from './sessions.service';
import { readingOut } from './serialize';
import { withTeamChanges } from './team-changes';

type Reviewer = Pick<AuthContext, 'teamId' | 'userId'>;

async function people(ids: (string | null)[]) {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  const users = wanted.length ? await UserModel.findAll({ where: { id: wanted }, attributes: ['id', 'name'] }) : [];
  return Object.fromEntries(users.map((u) => [u.id, u.name])) as Record<string, string>;
}

export async function sessionHistory(teamId: string, sessionId: string): Promise<HistoryEventRecord[]> {
  const events = await HistoryEventModel.findAll({ where: { teamId, sessionId }, order: [['id', 'DESC']], limit: 200 });
  const names = await people(events.map((e) => e.userId));
  return events.map((e) => ({
    id: Number(e.id),
    entity: e.entity,
    entityId: e.entityId,
    action: e.action,
    userName: e.userId ? (names[e.userId] ?? null) : null,
    detail: e.detail as Record<string, unknown>,
    createdAt: new Date(e.createdAt).toISOString(),
  }));
}

/** The session as getSessionDetail gives it, plus the names of the people in it and its history. */
export async function getReview(auth: Reviewer, sessionId: string): Promise<SessionReview> {
  const detail = await getSessionDetail(auth, sessionId);
  const [names, history] = await Promise.all([people(detail.readings.map((r) => r.enteredBy)), sessionHistory(auth.teamId, sessionId)]);
  return { ...detail, people: names, history };
}

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
    if (next.excluded && !next.excludeReason) throw new Invalid('body.excludeReason: excluding a reading needs a reason', [{ field: 'body.excludeReason', message: 'excluding a reading needs a reason' }]);

    const changes: Record<string, { before: unknown; after: unknown }> = {};
    for (const key of ['excluded', 'excludeReason', 'flagNote', 'valueMm'] as const) {
      if (reading[key] !== next[key]) changes[key] = { before: reading[key], after: next[key] };
    }
    if (Object.keys(changes).length === 0) return readingOut(reading);
    await reading.update({ ...next, version: reading.version + 1 }, { transaction });
    await HistoryEventModel.create(
      { teamId: auth.teamId, sessionId: session.id, entity: 'reading', entityId: reading.id, action: readingEditAction(changes, next.excluded), userId: auth.userId, detail: changes },
      { transaction },
    );
    return readingOut(reading);
  });
}
