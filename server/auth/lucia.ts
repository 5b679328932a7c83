// All session code lives here so the session library can be swapped later (lucia v3 is in
// maintenance mode). Sessions are stored in PostgreSQL through a small Sequelize adapter of our
// own; lucia ships none for Sequelize. The table holds only the SHA-256 of each session id (the
// cookie's value), so a copy of the database signs nobody in: the adapter hashes every id it is
// given before it looks up, writes or deletes.
import { createHash } from 'node:crypto';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { Argon2id } from 'oslo/password';
import { Op } from 'sequelize';
import { preparedSelect } from '../db';
import type { SessionCompanion } from '../http/validator';
import { UserSessionModel } from '../models';
import type { Role, UnitSystem } from '../../shared/schemas/common';
import type { PhotoGps, Team } from '../../shared/schemas/team';

/** OWASP Password Storage Cheat Sheet minimum for Argon2id: m = 19456 KiB, t = 2, p = 1. */
export const ARGON2_PARAMS = { memorySize: 19456, iterations: 2, parallelism: 1, tagLength: 32 } as const;
const argon2id = new Argon2id(ARGON2_PARAMS);

export const hashPassword = (password: string) => argon2id.hash(password);
export const verifyPassword = (hash: string, password: string) => argon2id.verify(hash, password);

/** What the table keeps for a session id. */
export const storedSessionId = (id: string) => createHash('sha256').update(id, 'utf8').digest('hex');

/** A stored row as lucia's session, under the id the browser holds (lucia writes it back into the cookie). */
const toSession = (s: UserSessionModel, id: string): DatabaseSession => ({
  id,
  userId: s.userId,
  expiresAt: s.expiresAt,
  attributes: { teamId: s.teamId, role: null, team: null },
});

interface SessionRow {
  user_id: string;
  team_id: string;
  expires_at: Date;
  email: string;
  name: string;
  user_unit_system: UnitSystem | null;
  role: Role | null;
  team_name: string;
  team_unit_system: UnitSystem;
  photo_gps: PhotoGps;
}

// One query per signed-in request: the session, its person (with their own units) and their role
// in the session's team (null once they are no longer a member) and the team's name and
// settings, read afresh so a change counts at once; /api/me needs no query of its own. Prepared
// once per connection (db.ts preparedSelect): planning the join cost more than running it.
const SESSION_AND_PERSON_SQL = `SELECT s.user_id, s.team_id, s.expires_at, u.email, u.name, u.unit_system AS user_unit_system, m.role,
        t.name AS team_name, t.unit_system AS team_unit_system, t.photo_gps
   FROM user_sessions s
   JOIN users u ON u.id = s.user_id
   JOIN teams t ON t.id = s.team_id
   LEFT JOIN memberships m ON m.user_id = s.user_id AND m.team_id = s.team_id
  WHERE s.id = $1`;

// A route's validator query to read in the look-up's statement (validateSessionCookie): handed to
// the adapter through this slot, which validateSessionCookie fills just before it calls lucia and
// empties just after; lucia's validateSession calls the adapter first, within that same
// synchronous step, so no other request's look-up can see it. The route reads the row back from
// the companion and fails loudly without it (http/validator.ts companionRow).
let companionSlot: SessionCompanion | undefined;

/**
 * The look-up's statement, with a validator's query joined to it when one is given: one round trip
 * for both. The validator's query runs only for a person whose role in the session's team is one
 * of `companion.roles` (the route's access): it sits in a CASE branch, which PostgreSQL never
 * executes for anyone else, so a request the access check will refuse costs the look-up alone.
 * Whatever it runs over, it reads only the rows of the session's own team (`p.team_id`).
 */
export function sessionLookup(storedId: string, companion: SessionCompanion | undefined): { name: string; text: string; values: unknown[] } {
  if (!companion) return { name: 'session-and-person', text: SESSION_AND_PERSON_SQL, values: [storedId] };
  const roles = `$${companion.values.length + 2}::text[]`;
  return {
    name: `session-and-${companion.name}`,
    text: `SELECT p.*, CASE WHEN p.role = ANY(${roles}) THEN (SELECT row_to_json(c) FROM (${companion.sql}) c) END AS companion
  FROM (${SESSION_AND_PERSON_SQL}) p`,
    values: [storedId, ...companion.values, companion.roles],
  };
}

async function readSession(storedId: string, companion: SessionCompanion | undefined): Promise<SessionRow | undefined> {
  const { name, text, values } = sessionLookup(storedId, companion);
  const [row] = await preparedSelect<SessionRow & { companion?: object | null }>(UserSessionModel.sequelize!, name, text, values);
  if (row?.companion && companion) companion.row = row.companion;
  return row;
}

const sequelizeAdapter: Adapter = {
  async getSessionAndUser(sessionId) {
    const companion = companionSlot;
    companionSlot = undefined;
    const row = await readSession(storedSessionId(sessionId), companion);
    if (!row) return [null, null];
    const team = { id: row.team_id, name: row.team_name, unitSystem: row.team_unit_system, photoGps: row.photo_gps };
    const session: DatabaseSession = {
      id: sessionId,
      userId: row.user_id,
      expiresAt: row.expires_at,
      attributes: { teamId: row.team_id, role: row.role, team },
    };
    const user: DatabaseUser = { id: row.user_id, attributes: { email: row.email, name: row.name, unitSystem: row.user_unit_system } };
    return [session, user];
  },
  async getUserSessions(userId) {
    // Only hashes are stored: these sessions can be counted and ended, never resumed.
    return (await UserSessionModel.findAll({ where: { userId } })).map((s) => toSession(s, s.id));
  },
  async setSession(session) {
    await UserSessionModel.create({
      id: storedSessionId(session.id),
      userId: session.userId,
      teamId: (session.attributes as { teamId: string }).teamId,
      expiresAt: session.expiresAt,
    });
  },
  async updateSessionExpiration(sessionId, expiresAt) {
    await UserSessionModel.update({ expiresAt }, { where: { id: storedSessionId(sessionId) } });
  },
  async deleteSession(sessionId) {
    await UserSessionModel.destroy({ where: { id: storedSessionId(sessionId) } });
  },
  async deleteUserSessions(userId) {
    await UserSessionModel.destroy({ where: { userId } });
  },
  async deleteExpiredSessions() {
    await UserSessionModel.destroy({ where: { expiresAt: { [Op.lte]: new Date() } } });
  },
};

export const lucia = new Lucia(sequelizeAdapter, {
  sessionExpiresIn: new TimeSpan(30, 'd'),
  sessionCookie: {
    name: 'twistlog_session',
    attributes: { secure: process.env.NODE_ENV === 'production', sameSite: 'lax' },
  },
  getSessionAttributes: (a) => ({ teamId: a.teamId, role: a.role, team: a.team }),
  getUserAttributes: (a) => ({ email: a.email, name: a.name, unitSystem: a.unitSystem }),
});

declare module 'lucia' {
  interface Register {
    Lucia: typeof lucia;
    /** role and team: the person's role in the team and the team itself, read with the session (not stored with it). */
    DatabaseSessionAttributes: { teamId: string; role: Role | null; team: Team | null };
    DatabaseUserAttributes: { email: string; name: string; unitSystem: UnitSystem | null };
  }
}

/** Start a fresh session (a new id at every sign-in) and return its cookie header value. */
export async function startSession(userId: string, teamId: string): Promise<string> {
  const session = await lucia.createSession(userId, { teamId, role: null, team: null });
  return lucia.createSessionCookie(session.id).serialize();
}

export const blankSessionCookie = () => lucia.createBlankSessionCookie().serialize();

/** The session id named by a request's Cookie header, if any. */
export const readSessionId = (cookieHeader: string | undefined) => lucia.readSessionCookie(cookieHeader ?? '');

/** End one session (sign out of this browser). */
export const endSession = (sessionId: string) => lucia.invalidateSession(sessionId);

/** End every session of a person, on every device (sign out everywhere, password change or reset). */
export const endAllSessions = (userId: string) => lucia.invalidateUserSessions(userId);

/** End a person's sessions in one team (they were removed from it). */
export async function endTeamSessions(userId: string, teamId: string): Promise<void> {
  await UserSessionModel.destroy({ where: { userId, teamId } });
}

/**
 * Sign a browser in: end the session it already had (if any), start a new one, and set its
 * cookie. The id is new at every sign-in, so a session id planted before sign-in is worthless.
 */
export async function signInResponse(
  res: { append(field: string, value: string): unknown },
  previousSessionId: string | undefined,
  userId: string,
  teamId: string,
): Promise<void> {
  if (previousSessionId) await lucia.invalidateSession(previousSessionId);
  res.append('Set-Cookie', await startSession(userId, teamId));
}

/** Sign a browser out: end its session and clear its cookie. */
export async function signOutResponse(res: { append(field: string, value: string): unknown }, sessionId: string): Promise<void> {
  await lucia.invalidateSession(sessionId);
  res.append('Set-Cookie', blankSessionCookie());
}

export interface ValidatedSession {
  sessionId: string;
  userId: string;
  teamId: string;
  /** The person's role in the team now; null when they are no longer a member. */
  role: Role | null;
  email: string;
  name: string;
  /** The person's own choice of units, if any. */
  unitSystem: UnitSystem | null;
  team: Team;
}

/**
 * Check the session named by a request's cookies, reading `companion` (a route's validator query)
 * in the same statement when given. Returns the session (or null) and the
 * Set-Cookie values to send back: a refreshed cookie when lucia extended the session, a blank
 * one when the cookie named no live session.
 */
export async function validateSessionCookie(
  cookieHeader: string | undefined,
  companion?: SessionCompanion,
): Promise<{ session: ValidatedSession | null; setCookies: string[] }> {
  const sessionId = readSessionId(cookieHeader);
  if (!sessionId) return { session: null, setCookies: [] };
  companionSlot = companion;
  const validating = lucia.validateSession(sessionId);
  companionSlot = undefined;
  const { session, user } = await validating;
  if (!session) return { session: null, setCookies: [blankSessionCookie()] };
  const setCookies = session.fresh ? [lucia.createSessionCookie(session.id).serialize()] : [];
  return {
    session: {
      sessionId: session.id,
      userId: user.id,
      teamId: session.teamId,
      role: session.role,
      email: user.email,
      name: user.name,
      unitSystem: user.unitSystem,
      team: session.team!,
    },
    setCookies,
  };
}
