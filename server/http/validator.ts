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

/** Every table with a change cursor: the registry's synced records, photos and envelopes. */
const SYNCED_TABLES = [...syncEntities.map((e) => records[e].table), 'photos', 'envelopes'];

/** The team's change cursor: the largest change_seq of its rows (0 before its first). */
export const teamCursorSql = `greatest(0, ${SYNCED_TABLES.map((t) => `(SELECT max(change_seq) FROM ${t} WHERE team_id = $1)`).join(', ')})`;

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
