// Cheap validators for large answers that are often asked again unchanged (the review, the pull):
// an ETag made from the team's change cursor, never from a hash of the body, so a request whose
// If-None-Match still matches costs one small query and answers 304 with no body.
//
// The cursor: every synced row carries change_seq from one global sequence, stamped when written,
// and every writer holds the team's change lock until it commits (services/team-changes.ts), so the
// largest change_seq among a team's committed rows only grows, and grows with every change.
import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import { QueryTypes, type Transaction } from 'sequelize';
import { VehicleModel } from '../models';
import { records, syncEntities } from '../../shared/records';
import type { Role } from '../../shared/schemas/common';

/** Every table with a change cursor: the registry's synced records, photos and envelopes. */
const SYNCED_TABLES = [...syncEntities.map((e) => records[e].table), 'photos', 'envelopes'];

/** The change cursor of the team named by the SQL expression `team`: the largest change_seq of its rows (0 before its first). */
export const teamCursorSqlOf = (team: string) =>
  `greatest(0, ${SYNCED_TABLES.map((t) => `(SELECT max(change_seq) FROM ${t} WHERE team_id = ${team})`).join(', ')})`;

/** The change cursor of the team given as $1. */
export const teamCursorSql = teamCursorSqlOf('$1');

export async function teamCursor(teamId: string, transaction?: Transaction): Promise<number> {
  const [row] = await VehicleModel.sequelize!.query<{ cursor: number }>(`SELECT ${teamCursorSql} AS cursor`, {
    bind: [teamId],
    type: QueryTypes.SELECT,
    transaction,
  });
  return Number(row.cursor);
}

/**
 * A weak ETag from what the answer depends on. The person's sign-in session is part of it, so a
 * validator kept by one person's browser never matches another person's answer.
 */
export function etagOf(kind: string, parts: (string | number)[], signInSessionId: string): string {
  const who = createHash('sha256').update(signInSessionId).digest('base64url').slice(0, 10);
  return `W/"${kind}.${parts.join('.')}.${who}"`;
}

/**
 * What an answer's bytes are known by: `key` names the state exactly (the kind, whose data it is
 * and the validator's parts) for the instance's answer cache (answer-cache.ts); `etag` is what the
 * person's browser keeps (the same parts, bound to their sign-in session).
 */
export interface AnswerValidator {
  key: string;
  etag: string;
}

/**
 * A validator's query, read in the same round trip as the sign-in session (auth/lucia.ts
 * `validateSessionCookie`): one prepared statement instead of two for every request of a large
 * answer. `sql` is one SELECT yielding one row, written over the session's row `p` (`p.team_id`,
 * `p.user_id`: the validator is always the signed-in person's team's) and its own `values`, which
 * are numbered from $2. It runs only when the person's role is one of `roles` (the route's access,
 * filled in by routes/route.ts), and the look-up then puts the row it read in `row`.
 */
export interface SessionCompanion<Row extends object = object> {
  /** Names the prepared statement: one `sql` text per name. */
  name: string;
  sql: string;
  values: unknown[];
  /** The roles the route's access lets in: for any other the query is not run. */
  roles: readonly Role[];
  row?: Row;
}

/** A validator's query as a route declares it (RouteDef.withSession); the route table adds the roles. */
export type CompanionQuery = Omit<SessionCompanion, 'roles' | 'row'>;

/** The row a validator's query read with the session; a route that declares one always has it. */
export function companionRow<Row extends object>(companion: SessionCompanion | undefined, name: string): Row {
  if (!companion?.row || companion.name !== name) throw new Error(`the ${name} query was not read with the session`);
  return companion.row as Row;
}

export function answerValidator(kind: string, scope: string[], parts: (string | number)[], signInSessionId: string): AnswerValidator {
  return { key: [kind, ...scope, ...parts].join(' '), etag: etagOf(kind, parts, signInSessionId) };
}

/** Sets the ETag; answers 304 with no body when the request's If-None-Match names it (true then). */
export function answeredNotModified(req: Request, res: Response, etag: string): boolean {
  res.setHeader('ETag', etag);
  const sent = req.headers['if-none-match'];
  if (!sent) return false;
  const matches = sent.split(',').some((tag) => tag.trim() === etag || tag.trim() === '*');
  if (matches) res.status(304).end();
  return matches;
}
