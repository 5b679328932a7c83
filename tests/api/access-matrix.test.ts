// The role × route matrix, generated from the server's own route table (allRoutes), so a new
// route is in it the moment it is added. For every route: each role of a workshop, a member of
// another workshop (an admin there), and a signed-out caller, each asserting the status that
// auth/permissions.ts promises (allowed → not 401/403; denied → 403; signed out → 401), and that
// a denied call wrote nothing (every row of both workshops and their people, hashed, is the
// same before and after). The other workshop's admin is sent this workshop's real ids: it must
// get no 2xx for them, change nothing here, and see none of this workshop's ids in any answer.
//
// Each route gets fresh workshops with one record of every kind; a `:id` (or `:vehicleId`, …)
// parameter is filled with the id of the record its path names (see `fillPath`), an unknown
// kind with a random UUID; the body is minimal ({}), so an allowed call may well be a 400: the
// matrix checks access, the feature tests check behaviour.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomBytes, randomUUID } from 'node:crypto';
import { allRoutes } from '../../server/routes';
import type { AnyRoute } from '../../server/routes/route';
import { can, isAction, roles } from '../../shared/permissions';
import { createTeam, sessionAgent, agentFor, startTestServer, type Agent, type TestServer, type TestTeam } from '../support/test-app';
import { resetThrottles } from '../../server/auth/throttle';
import { changedTables, insertRow, scopedTables, snapshot, type ScopedTable } from '../support/db-snapshot';
import type { Role } from '../../shared/schemas';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts?.close());

type Caller = Role | 'otherTeam' | 'signedOut';
type Expect = 'allowed' | 'forbidden' | 'unauthenticated';

export function expectedFor(access: AnyRoute['access'], caller: Caller): Expect {
  if (access === 'public') return 'allowed';
  if (caller === 'signedOut') return 'unauthenticated';
  if (access === 'signedIn') return 'allowed';
  const role: Role = caller === 'otherTeam' ? 'admin' : caller;
  return can(role, access) ? 'allowed' : 'forbidden';
}

// ---------------------------------------------------------------------------------------------
// Fixtures: a workshop with one record of every kind (raw SQL on the 0001 schema, so the
// matrix does not depend on how other features build their records).

interface Fixture {
  team: TestTeam;
  other: TestTeam;
  ids: Record<string, string>;
  agents: Record<Caller, Agent>;
}

const insert = (table: string, row: Record<string, unknown>) => insertRow(ts.sequelize, table, row);

async function buildFixture(): Promise<Fixture> {
  const team = await createTeam('Matrix workshop');
  const other = await createTeam('Other workshop');
  const t = team.teamId;
  const by = team.members.engineer.userId;
  const ids = {
    team: t,
    vehicle: randomUUID(),
    gaugePoint: randomUUID(),
    session: randomUUID(),
    pose: randomUUID(),
    reading: randomUUID(),
    photo: randomUUID(),
    envelope: randomUUID(),
    send: randomUUID(),
    conflict: randomUUID(),
    invitation: randomUUID(),
    // A member who is not the last admin: the viewer.
    member: team.members.viewer.userId,
  };
  await insert('vehicles', {
    id: ids.vehicle,
    team_id: t,
    name: 'Matrix truck',
    wheelbase_mm: 3800,
    track_front_mm: 1900,
    track_rear_mm: 1880,
    opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
  });
  await insert('gauge_points', { id: ids.gaugePoint, team_id: t, vehicle_id: ids.vehicle, label: 'A', y_mm: 300, z_mm: 800 });
  await insert('test_sessions', { id: ids.session, team_id: t, vehicle_id: ids.vehicle, tested_on: '2026-05-01', created_by: by });
  await insert('poses', { id: ids.pose, team_id: t, session_id: ids.session, seq: 0, kind: 'level', recorded_at: new Date(), created_by: by });
  await insert('readings', { id: ids.reading, team_id: t, pose_id: ids.pose, gauge_point_id: ids.gaugePoint, axis: 'lateral', value_mm: 90, entered_by: by });
  await insert('photos', {
    id: ids.photo,
    team_id: t,
    session_id: ids.session,
    stored_name: `${ids.photo}.jpg`,
    thumb_name: `${ids.photo}-thumb.jpg`,
    mime: 'image/jpeg',
    width: 10,
    height: 10,
    bytes: 100,
    created_by: by,
  });
  await insert('envelopes', { id: ids.envelope, team_id: t, vehicle_id: ids.vehicle, session_id: ids.session, params: {}, created_by: by });
  await insert('envelope_sends', { id: ids.send, team_id: t, envelope_id: ids.envelope, to_email: 'boots@maker.test', sent_by: by });
  await insert('sync_conflicts', {
    id: ids.conflict,
    team_id: t,
    entity: 'reading',
    entity_id: ids.reading,
    base_version: 1,
    server_version: 2,
    client_record: {},
    server_record: {},
    user_id: by,
  });
  await insert('invitations', {
    id: ids.invitation,
    team_id: t,
    email: `invitee-${ids.invitation.slice(0, 8)}@workshop.test`,
    role: 'tester',
    token_hash: randomBytes(32).toString('hex'),
    invited_by: team.members.admin.userId,
    expires_at: new Date(Date.now() + 86_400_000),
  });
  const agents = { signedOut: agentFor(ts) } as Record<Caller, Agent>;
  for (const role of roles) agents[role] = await sessionAgent(ts, team.members[role].userId, t);
  agents.otherTeam = await sessionAgent(ts, other.members.admin.userId, other.teamId);
  return { team, other, ids, agents };
}

/** Which fixture a path word names: "vehicles" → vehicle, "gauge-points" → gaugePoint, … */
type IdKind = 'vehicle' | 'gaugePoint' | 'session' | 'pose' | 'reading' | 'photo' | 'envelope' | 'send' | 'conflict' | 'invitation' | 'member' | 'team';
const kinds: [RegExp, IdKind][] = [
  [/^vehicles?$/, 'vehicle'],
  [/^gauge-?points?$/, 'gaugePoint'],
  [/^(test-?)?sessions?$/, 'session'],
  [/^poses?$/, 'pose'],
  [/^readings?$/, 'reading'],
  [/^photos?$/, 'photo'],
  [/^envelopes?$/, 'envelope'],
  [/^sends?$/, 'send'],
  [/^(sync-?)?conflicts?$/, 'conflict'],
  [/^invitations?$/, 'invitation'],
  [/^(members?|users?|people)$/, 'member'],
  [/^teams?$/, 'team'],
];

function kindOf(word: string): string | undefined {
  const w = word.replace(/([a-z])([A-Z])/g, '$1-$2').toLowerCase();
  return kinds.find(([re]) => re.test(w))?.[1];
}

/** The route's path with every parameter filled: real ids of `ids` where the path names the kind. */
export function fillPath(path: string, ids: Record<string, string>): string {
  const segments = path.replace(/[{}]/g, '').split('/');
  return segments
    .map((seg, i) => {
      if (seg.startsWith('*')) return 'x';
      if (!seg.startsWith(':')) return seg;
      const name = seg.slice(1);
      const kind = name === 'id' ? kindOf(segments[i - 1] ?? '') : name.endsWith('Id') ? kindOf(name.slice(0, -2)) : undefined;
      if (kind && ids[kind]) return ids[kind];
      if (name === 'id' || name.endsWith('Id')) return randomUUID();
      return randomBytes(32).toString('base64url');
    })
    .join('/');
}

// ---------------------------------------------------------------------------------------------
// "Nothing was written": every row of both workshops and their people, hashed (support/db-snapshot.ts).

let tables: ScopedTable[] = [];

async function loadTables() {
  tables = await scopedTables(ts.sequelize);
  expect(tables.map((s) => s.table)).toEqual(expect.arrayContaining(['teams', 'users', 'memberships', 'vehicles', 'user_sessions']));
}

/** Hashes of the rows of the given workshops and people (both workshops unless `onlyThis`). */
async function teamSnapshot(f: Fixture, onlyThis = false): Promise<Record<string, string>> {
  const teamsOf = onlyThis ? [f.team] : [f.team, f.other];
  return snapshot(
    ts.sequelize,
    tables,
    teamsOf.map((t) => t.teamId),
    teamsOf.flatMap((t) => Object.values(t.members).map((m) => m.userId)),
  );
}

const changed = changedTables;

// ---------------------------------------------------------------------------------------------

const callers: Caller[] = ['signedOut', 'otherTeam', 'viewer', 'tester', 'engineer', 'admin'];
const label = (r: AnyRoute) => `${r.method.toUpperCase()} ${r.path}`;

async function call(agent: Agent, r: AnyRoute, path: string) {
  const req = agent[r.method](path);
  return r.method === 'get' || r.method === 'delete' ? req : req.send({});
}

const bodyText = (res: { text?: string; body?: unknown }) => (typeof res.text === 'string' && res.text ? res.text : JSON.stringify(res.body ?? ''));

describe('the route table', () => {
  it('declares a known access on every route, and has no route twice', () => {
    for (const r of allRoutes) {
      expect(r.access === 'public' || r.access === 'signedIn' || isAction(r.access), `${label(r)}: access ${r.access}`).toBe(true);
    }
    const names = allRoutes.map(label);
    expect(new Set(names).size).toBe(names.length);
  });

  it('matches the roles expected by the permission table', () => {
    expect(expectedFor('team.manage', 'admin')).toBe('allowed');
    expect(expectedFor('team.manage', 'engineer')).toBe('forbidden');
    expect(expectedFor('envelope.readSigned', 'viewer')).toBe('allowed');
    expect(expectedFor('session.read', 'viewer')).toBe('forbidden');
    expect(expectedFor('signedIn', 'signedOut')).toBe('unauthenticated');
    expect(expectedFor('public', 'signedOut')).toBe('allowed');
  });
});

describe('role × route matrix', () => {
  beforeAll(async () => {
    await loadTables();
    await resetThrottles();
  });

  it.each(allRoutes.map((r) => [label(r), r] as const))('%s', async (_name, r) => {
    const f = await buildFixture();
    const path = fillPath(r.path, f.ids);
    const outsiderPath = path; // this workshop's real ids, asked for by another workshop's admin
    const teamIds = Object.values(f.ids).concat(Object.values(f.team.members).flatMap((m) => [m.userId, m.email]));
    const failures: string[] = [];

    for (const caller of callers) {
      const want = expectedFor(r.access, caller);
      const before = await teamSnapshot(f, caller === 'otherTeam');
      const res = await call(f.agents[caller], r, caller === 'otherTeam' ? outsiderPath : path);
      const after = await teamSnapshot(f, caller === 'otherTeam');
      const where = `${label(r)} as ${caller}: ${res.status} ${bodyText(res).slice(0, 200)}`;

      // A route of the table is mounted: never the catch-all "API route not found".
      if (res.status === 404 && res.body?.error?.message === 'API route not found') failures.push(`${where} — route is not mounted`);

      if (want === 'unauthenticated') {
        if (res.status !== 401) failures.push(`${where} — expected 401`);
      } else if (want === 'forbidden') {
        if (res.status !== 403) failures.push(`${where} — expected 403`);
      } else if (res.status === 401 || res.status === 403) {
        failures.push(`${where} — expected access`);
      }
      if (want !== 'allowed') {
        const diff = changed(before, after);
        if (diff.length) failures.push(`${where} — denied, yet wrote to ${diff.join(', ')}`);
      }
      if (caller === 'otherTeam') {
        // Team scope comes from the session: this workshop's rows stay untouched and unseen
        // (the outsider's own workshop may change: signing out ends the outsider's session).
        const diff = changed(before, after);
        if (diff.length) failures.push(`${where} — another workshop's member changed ${diff.join(', ')}`);
        if (path.match(/[0-9a-f]{8}-[0-9a-f]{4}-/) && res.status >= 200 && res.status < 300) {
          failures.push(`${where} — another workshop's member got a 2xx for this workshop's record`);
        }
        const text = bodyText(res);
        const leaked = teamIds.filter((id) => text.includes(id));
        if (leaked.length) failures.push(`${where} — another workshop's member saw ${leaked.join(', ')}`);
      }
    }
    expect(failures).toEqual([]);
  });
});
