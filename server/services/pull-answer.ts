// The sync pull as the phone receives it: everything of the team changed after `since`, oldest
// first, at most `limit` rows per table, with the person's own kept conflicts. PostgreSQL pages
// the tables and builds the JSON in one statement; the route passes the text through (see
// record-json.ts). The records are those of the row mappers (to-record.ts toRecord, and
// photos.service.ts photoOut for photos), field for field: tests/api/pull-answer.test.ts compares.
//
// Paging: a full page may have more behind it, so the cursor stops at the lowest last change_seq
// of the full pages and every row beyond it waits for the next pull (no table skips rows).
import { QueryTypes } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { VehicleModel } from '../models';
import { records, syncEntities } from '../../shared/records';
import { syncTables } from './sync-tables';
import { answerValidator, companionRow, teamCursorSqlOf, type AnswerValidator, type CompanionQuery, type SessionCompanion } from '../http/validator';
import { isoSql, photoJsonSql, syncedRecordJsonSql } from './record-json';
import { lockTeamChanges } from './team-changes';
import { translateDbError } from './sync-db-errors';

type Puller = Pick<AuthContext, 'teamId' | 'userId' | 'sessionId'>;

const db = () => VehicleModel.sequelize!;

/** The person's kept conflicts move their own cursor: a conflict row is theirs alone. */
const conflictCursorSql = (team: string, person: string) =>
  `(SELECT coalesce(max(change_seq), 0) FROM sync_conflicts WHERE team_id = ${team} AND user_id = ${person})`;

// $1 team, $2 since, $3 limit, $4 person. Written once the models are initialised.
let pullSqlText: string | undefined;
export const pullSql = () => {
  if (pullSqlText) return pullSqlText;
  const page = (table: string) => `SELECT * FROM ${table} WHERE team_id = $1 AND change_seq > $2 ORDER BY change_seq LIMIT $3`;
  // [answer key, alias, the alias's rows, one row's JSON]: the synced records of the registry, then photos and conflicts.
  const tables: [string, string, string, string][] = [
    ...syncEntities.map((entity, i): [string, string, string, string] => [
      records[entity].pullKey,
      `t${i}`,
      page(syncTables[entity].table),
      syncedRecordJsonSql(entity, `t${i}`),
    ]),
    ['photos', 'ph', page('photos'), photoJsonSql('ph')],
    [
      'conflicts',
      'c',
      'SELECT * FROM sync_conflicts WHERE team_id = $1 AND user_id = $4 AND change_seq > $2 ORDER BY change_seq LIMIT $3',
      `json_build_object('id', c.id, 'entity', c.entity, 'entityId', c.entity_id, 'baseVersion', c.base_version,
      'serverVersion', c.server_version, 'clientRecord', c.client_record, 'serverRecord', c.server_record,
      'createdAt', ${isoSql('c.created_at')}, 'resolvedAt', ${isoSql('c.resolved_at')}, 'resolution', c.resolution)`,
    ],
  ];
  const aliases = tables.map(([, alias]) => alias);
  return (pullSqlText = `
WITH ${tables.map(([, alias, rows]) => `${alias} AS (${rows})`).join(',\n')},
pages AS (${aliases.map((a) => `SELECT count(*) AS n, max(change_seq) AS last FROM ${a}`).join(' UNION ALL ')}),
cur AS (SELECT coalesce((SELECT min(last) FROM pages WHERE n = $3), greatest($2, (SELECT max(last) FROM pages))) AS cursor,
  EXISTS (SELECT 1 FROM pages WHERE n = $3) AS more)
SELECT json_build_object(
  'cursor', cur.cursor, 'hasMore', cur.more,
  ${tables.map(([key, alias, , json]) => `'${key}', coalesce((SELECT json_agg(${json} ORDER BY ${alias}.change_seq) FROM ${alias} WHERE ${alias}.change_seq <= cur.cursor), '[]')`).join(',\n  ')}
)::text AS body FROM cur`);
};

const PULL_VALIDATOR = 'pull-validator';

// Over the session's row p (its team and person). Run on every pull, in the session look-up's statement.
const PULL_VALIDATOR_SQL = `SELECT ${teamCursorSqlOf('p.team_id')} AS team, ${conflictCursorSql('p.team_id', 'p.user_id')} AS conflicts`;

/** The pull's validator query, read with the sign-in session (http/validator.ts SessionCompanion). */
export const pullValidatorQuery = (): CompanionQuery => ({ name: PULL_VALIDATOR, sql: PULL_VALIDATOR_SQL, values: [] });

/**
 * The pull's validator: the team's change cursor, the person's conflicts' cursor, and the page
 * asked for, from one small query. Any change a pull from `since` could carry moves one of the
 * cursors. Its key also names the workshop and the person (their conflicts are theirs alone).
 */
export function pullValidator(auth: Puller, since: number, limit: number, companion: SessionCompanion | undefined): AnswerValidator {
  const row = companionRow<{ team: number; conflicts: number }>(companion, PULL_VALIDATOR);
  return answerValidator('pull', [auth.teamId, auth.userId], [since, limit, Number(row.team), Number(row.conflicts)], auth.sessionId);
}

/** The pull as JSON text, read once the team's writers in flight have committed. */
export async function pullJson(auth: Puller, since: number, limit: number): Promise<string> {
  try {
    return await db().transaction(async (transaction) => {
      // Wait for writers in flight: the cursor must not pass a change that commits late.
      await lockTeamChanges(auth.teamId, transaction, 'read');
      const [row] = await db().query<{ body: string }>(pullSql(), {
        bind: [auth.teamId, since, limit, auth.userId],
        type: QueryTypes.SELECT,
        transaction,
      });
      return row.body;
    });
  } catch (err) {
    translateDbError(err, () => null);
  }
}
