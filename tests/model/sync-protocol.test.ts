// The sync protocol against a model (fast-check commands, seeded): three phones of three people in
// one workshop, each the real field client on fake-indexeddb, and the real server on PostgreSQL.
// Every push and pull waits at a gate the test opens, so the commands interleave edits with
// batches in flight, lost answers (the server wrote, the phone never heard), server failures
// (500: nothing written), dropped connections and reloads, in orders a browser never hits.
//
// The model is the protocol in a few lines: an edit changes the phone's copy; a pushed record is
// written when its base version is the server's, else kept as a conflict beside the row (a reading
// written into a slot another phone filled first conflicts with that reading); an answer gives the
// phone the new versions, and the server's row where a conflict was kept unless the phone was
// edited since; a pull replaces what the phone has not changed. After every command the phone's
// store and PostgreSQL must equal the model, every pushed record must carry the version the phone
// last learned (so a phone never conflicts with its own edit), and every conflict must be against
// another phone's write. At the end, with no more faults, every phone and the server converge.
import 'fake-indexeddb/auto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { QueryTypes } from 'sequelize';
import { ApiError } from '@/lib/api-client';
import { FieldDb } from '@/lib/db/field-db';
import { patchRecord, setReadingValue } from '@/lib/db/records';
import { runSync, type RunResult } from '@/features/sync/engine/sync-run';
import type { SyncTransport } from '@/features/sync/api/transport';
import type { PullResponse, PushRequest, PushResponse } from '@shared/schemas/sync';
import { startSession } from '../../server/auth/lucia';
import { createTeam, sessionAgent, startTestServer, type TestServer } from '../support/test-app';
import { batchKey, change, poseRecord, sessionRecord, vehicleWithPoints } from '../support/sync';
import { nodeTransport } from '../faults/fault-rig';

const RUNS = Number(process.env.MODEL_RUNS ?? 50);
const PHONES = 3;
const AXES = ['lateral', 'vertical'] as const;

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

/** A pose or reading as the model sees it: identity, version, and the fields phones edit. */
interface Rec {
  entity: 'pose' | 'reading';
  id: string;
  version: number;
  f: Record<string, unknown>;
}
type ServerRec = Rec & { writer: number | 'setup' };

const poseF = (r: Record<string, unknown>) => ({ label: r.label, liftFlMm: r.liftFlMm, notes: r.notes });
const readingF = (r: Record<string, unknown>) => ({ poseId: r.poseId, gaugePointId: r.gaugePointId, axis: r.axis, valueMm: r.valueMm, deleted: !!r.deletedAt });
const recOf = (entity: 'pose' | 'reading', r: Record<string, unknown>): Rec => ({
  entity,
  id: String(r.id),
  version: Number(r.version),
  f: entity === 'pose' ? poseF(r) : readingF(r),
});
const clone = <T>(x: T): T => structuredClone(x);
const sorted = (m: Map<string, Rec>) =>
  [...m.values()].map((r) => ({ entity: r.entity, id: r.id, version: r.version, f: r.f })).sort((a, b) => a.id.localeCompare(b.id));

interface Gate {
  kind: 'push' | 'pull';
  req?: PushRequest;
  since?: number;
  resolve(value: unknown): void;
  reject(err: unknown): void;
}

type PushOutcome = 'ok' | 'lost' | 'fail500' | 'offline';
type PullOutcome = 'ok' | 'offline';

interface Predicted {
  accepted: { entity: string; id: string; version: number }[];
  conflicts: { target: string; clientId: string }[];
}

class Phone {
  db: FieldDb;
  local = new Map<string, Rec>();
  gate: Gate | null = null;
  running = false;
  auto = false;
  edits = 0;
  broken: unknown = null;
  /** Record id → the edit count when it was last edited. */
  editedAt = new Map<string, number>();
  /** Batch key → the edit count when the batch was formed, and its request. */
  formed = new Map<string, { at: number; req: PushRequest; local: Map<string, Rec> }>();
  real: SyncTransport;
  transport: SyncTransport;

  constructor(
    readonly index: number,
    readonly name: string,
    readonly world: World,
    cookie: string,
  ) {
    this.db = new FieldDb(name);
    this.real = nodeTransport(ts.baseUrl, cookie);
    const park = (gate: Pick<Gate, 'kind' | 'req' | 'since'>) =>
      new Promise((resolve, reject) => {
        // A batch is formed just before its first push: remember what the phone had then.
        const key = gate.req?.idempotencyKey;
        if (key && !this.formed.has(key)) this.formed.set(key, { at: this.edits, req: gate.req!, local: clone(this.local) });
        this.gate = { ...gate, resolve, reject };
        // Settling: every gate opens at once; a broken expectation is kept to fail the test.
        if (this.auto) void this.world.answer(this, 'ok').catch((err) => (this.broken ??= err));
      });
    this.transport = {
      push: (req) => park({ kind: 'push', req: clone(req) }) as Promise<PushResponse>,
      pull: (since) => park({ kind: 'pull', since }) as Promise<PullResponse>,
      uploadPhoto: async () => {
        throw new Error('no photos in the model');
      },
    };
  }

  start(force = false): Promise<RunResult> {
    this.running = true;
    return runSync(this.db, this.transport, () => {}, { force }).finally(() => (this.running = false));
  }

  /** Lets the phone run until it waits at its next gate or its run ends. */
  async step() {
    while (this.running && !this.gate) await new Promise((r) => setImmediate(r));
  }
}

class World {
  server = new Map<string, ServerRec>();
  answers = new Map<string, Predicted>();
  phones: Phone[] = [];
  values = 0;
  conflicts = 0;
  faults = { lost: 0, fail500: 0, offline: 0, reloads: 0, editsInFlight: 0 };

  constructor(
    readonly sessionId: string,
    readonly poseIds: string[],
    readonly pointIds: string[],
  ) {}

  /** What the server does with a batch, by the protocol; asserts the phone sent what it should. */
  predictPush(phone: Phone, gate: Gate): Predicted {
    const req = gate.req!;
    const earlier = this.answers.get(req.idempotencyKey);
    if (earlier) {
      // A retry after a lost answer: the very same batch, answered the same, written once.
      expect(req).toEqual(phone.formed.get(req.idempotencyKey)?.req);
      return earlier;
    }
    // A retry after a failure that wrote nothing is the same batch too, as it was formed.
    const formed = phone.formed.get(req.idempotencyKey)!;
    expect(req).toEqual(formed.req);
    const formedWith = formed.local;
    const written: { rec: Rec; insert: boolean }[] = [];
    const predicted: Predicted = { accepted: [], conflicts: [] };
    for (const c of req.changes) {
      const rec = recOf(c.entity as 'pose' | 'reading', c.record);
      // The phone sends its copy as the model has it, on the version it last learned.
      expect(rec, `phone ${phone.index} sent ${c.entity} ${rec.id.slice(0, 8)}`).toEqual(formedWith.get(rec.id));
      const row = this.server.get(rec.id);
      if (!row) {
        expect(rec.version).toBe(1);
        written.push({ rec, insert: true });
      } else if (row.version !== rec.version) predicted.conflicts.push({ target: rec.id, clientId: rec.id });
      else written.push({ rec, insert: false });
    }
    // Slots after the batch: written readings take theirs; a slot another phone holds is a conflict.
    const writtenIds = new Set(written.map((w) => w.rec.id));
    const holders = new Map<string, string>();
    const slot = (f: Record<string, unknown>) => `${f.poseId}|${f.gaugePointId}|${f.axis}`;
    for (const r of this.server.values()) if (r.entity === 'reading' && !r.f.deleted && !writtenIds.has(r.id)) holders.set(slot(r.f), r.id);
    for (const w of [...written]) {
      if (w.rec.entity !== 'reading' || w.rec.f.deleted) continue;
      const holder = holders.get(slot(w.rec.f));
      if (holder) {
        written.splice(written.indexOf(w), 1);
        predicted.conflicts.push({ target: holder, clientId: w.rec.id });
      } else holders.set(slot(w.rec.f), w.rec.id);
    }
    for (const w of written) {
      const version = w.insert ? 1 : this.server.get(w.rec.id)!.version + 1;
      this.server.set(w.rec.id, { ...clone(w.rec), version, writer: phone.index });
      predicted.accepted.push({ entity: w.rec.entity, id: w.rec.id, version });
    }
    for (const c of predicted.conflicts) {
      // A conflict is always with another phone's write, never with this phone's own.
      expect(this.server.get(c.target)!.writer, `phone ${phone.index} conflicted on ${c.target.slice(0, 8)}`).not.toBe(phone.index);
      this.conflicts += 1;
    }
    this.answers.set(req.idempotencyKey, predicted);
    return predicted;
  }

  /** The answer reached the phone: new versions; the server's row where a conflict was kept, unless edited since. */
  applyAnswer(phone: Phone, key: string, predicted: Predicted) {
    for (const a of predicted.accepted) {
      const mine = phone.local.get(a.id);
      if (mine) mine.version = a.version;
    }
    const formedAt = phone.formed.get(key)!.at;
    for (const c of predicted.conflicts) {
      if ((phone.editedAt.get(c.clientId) ?? 0) > formedAt) continue;
      if (c.clientId !== c.target) phone.local.delete(c.clientId);
      const { writer: _w, ...row } = this.server.get(c.target)!;
      phone.local.set(c.target, clone(row));
    }
  }

  /** Opens the phone's gate with an outcome. */
  async answer(phone: Phone, outcome: PushOutcome | PullOutcome) {
    const gate = phone.gate!;
    phone.gate = null;
    try {
      await this.open(phone, gate, outcome);
    } catch (err) {
      // The phone's run must not wait for ever on a gate whose check failed.
      gate.reject(err);
      throw err;
    }
  }

  private async open(phone: Phone, gate: Gate, outcome: PushOutcome | PullOutcome) {
    const offline = () => gate.reject(new ApiError(0, 'network', 'no connection to the server'));
    if (gate.kind === 'push') {
      const req = gate.req!;
      if (outcome === 'offline') return offline();
      if (outcome === 'fail500') return gate.reject(new ApiError(500, 'internal', 'something went wrong on the server'));
      const predicted = this.predictPush(phone, gate);
      const real = await phone.real.push(req);
      const set = <T>(xs: T[]) => xs.map((x) => JSON.stringify(x)).sort();
      expect(set(real.accepted.map((a) => ({ entity: a.entity, id: a.id, version: a.version })))).toEqual(set(predicted.accepted));
      expect(set(real.conflicts.map((c) => ({ target: c.entityId, clientId: String(c.clientRecord.id) })))).toEqual(set(predicted.conflicts));
      if (outcome === 'lost') return offline();
      this.applyAnswer(phone, req.idempotencyKey, predicted);
      return gate.resolve(real);
    }
    if (outcome === 'offline') return offline();
    const page = await phone.real.pull(gate.since!);
    // A pull replaces only what the phone has not changed since (nothing in its outbox).
    const pending = new Set((await phone.db.outbox.toArray()).map((e) => e.recordId));
    for (const [entity, rows] of [
      ['pose', page.poses],
      ['reading', page.readings],
    ] as const) {
      for (const r of rows) if (!pending.has(r.id) && (entity === 'reading' || this.poseIds.includes(r.id))) phone.local.set(r.id, recOf(entity, r));
    }
    gate.resolve(page);
  }

  async edit(phone: Phone, target: EditTarget) {
    const n = ++this.values;
    if (phone.gate) this.faults.editsInFlight += 1;
    if (target.kind === 'pose') {
      const id = this.poseIds[target.pose];
      const value = target.field === 'liftFlMm' ? n : `${target.field === 'label' ? 'L' : 'N'}${n}`;
      expect(await patchRecord('pose', id, { [target.field]: value }, phone.db)).toMatchObject({ ok: true });
      phone.local.get(id)!.f[target.field] = value;
      phone.editedAt.set(id, ++phone.edits);
      return;
    }
    const slot = { poseId: this.poseIds[target.pose], gaugePointId: this.pointIds[target.point], axis: AXES[target.axis] };
    const inSlot = [...phone.local.values()]
      .filter((r) => r.entity === 'reading' && r.f.poseId === slot.poseId && r.f.gaugePointId === slot.gaugePointId && r.f.axis === slot.axis)
      .sort((a, b) => a.id.localeCompare(b.id));
    const existing = inSlot.find((r) => !r.f.deleted) ?? inSlot[0];
    if (target.clear && (!existing || existing.f.deleted)) return;
    expect(await setReadingValue(slot, target.clear ? null : n, phone.db)).toMatchObject({ ok: true });
    if (existing) {
      existing.f = target.clear ? { ...existing.f, deleted: true } : { ...existing.f, valueMm: n, deleted: false };
      phone.editedAt.set(existing.id, ++phone.edits);
      return;
    }
    const created = (await phone.db.readings.where('[poseId+gaugePointId+axis]').equals([slot.poseId, slot.gaugePointId, slot.axis]).toArray()).find(
      (r) => !phone.local.has(r.id),
    )!;
    phone.local.set(created.id, { entity: 'reading', id: created.id, version: 1, f: { ...slot, valueMm: n, deleted: false } });
    phone.editedAt.set(created.id, ++phone.edits);
  }

  /** The phone's store and PostgreSQL are what the model says. */
  async check(phone: Phone) {
    const poses = await phone.db.poses.where('sessionId').equals(this.sessionId).toArray();
    const readings = await phone.db.readings.where('poseId').anyOf(this.poseIds).toArray();
    const actual = new Map<string, Rec>([...poses.map((p) => recOf('pose', p)), ...readings.map((r) => recOf('reading', r))].map((r) => [r.id, r]));
    expect(sorted(actual), `phone ${phone.index}'s store`).toEqual(sorted(phone.local));
    expect(sorted(await this.serverRows()), 'PostgreSQL').toEqual(sorted(this.server));
  }

  async serverRows(): Promise<Map<string, Rec>> {
    const q = (sql: string) => ts.sequelize.query<Record<string, unknown>>(sql, { bind: [this.sessionId], type: QueryTypes.SELECT });
    const poses = await q('SELECT id, version, label, lift_fl_mm AS "liftFlMm", notes FROM poses WHERE session_id = $1');
    const readings = await q(
      `SELECT r.id, r.version, r.pose_id AS "poseId", r.gauge_point_id AS "gaugePointId", r.axis, r.value_mm AS "valueMm", r.deleted_at AS "deletedAt"
       FROM readings r JOIN poses p ON p.id = r.pose_id WHERE p.session_id = $1`,
    );
    return new Map([...poses.map((p) => recOf('pose', p)), ...readings.map((r) => recOf('reading', r))].map((r) => [r.id, r]));
  }
}

type EditTarget =
  { kind: 'pose'; pose: number; field: 'label' | 'liftFlMm' | 'notes' } | { kind: 'slot'; pose: number; point: number; axis: number; clear: boolean };

/** What fast-check's preconditions see: which phones are mid-run. */
interface Model {
  gated: boolean[];
  running: boolean[];
}

const phoneArb = fc.integer({ min: 0, max: PHONES - 1 });
const editArb: fc.Arbitrary<EditTarget> = fc.oneof(
  fc.record({
    kind: fc.constant('pose' as const),
    pose: fc.integer({ min: 0, max: 1 }),
    field: fc.constantFrom('label' as const, 'liftFlMm' as const, 'notes' as const),
  }),
  fc.record({
    kind: fc.constant('slot' as const),
    pose: fc.integer({ min: 0, max: 1 }),
    point: fc.integer({ min: 0, max: 1 }),
    axis: fc.integer({ min: 0, max: 1 }),
    clear: fc.constantFrom(false, false, false, false, true),
  }),
);

const note = (m: Model, p: Phone) => {
  m.gated[p.index] = !!p.gate;
  m.running[p.index] = p.running;
};

class Edit implements fc.AsyncCommand<Model, World> {
  constructor(
    readonly phone: number,
    readonly target: EditTarget,
  ) {}
  check = () => true;
  async run(m: Model, w: World) {
    await w.edit(w.phones[this.phone], this.target);
    await w.check(w.phones[this.phone]);
  }
  toString = () => `edit(${this.phone}, ${JSON.stringify(this.target)})`;
}

class StartSync implements fc.AsyncCommand<Model, World> {
  constructor(
    readonly phone: number,
    readonly force: boolean,
  ) {}
  check = (m: Readonly<Model>) => !m.running[this.phone];
  async run(m: Model, w: World) {
    const p = w.phones[this.phone];
    void p.start(this.force);
    await p.step();
    note(m, p);
    await w.check(p);
  }
  toString = () => `sync(${this.phone}${this.force ? ', now' : ''})`;
}

class Answer implements fc.AsyncCommand<Model, World> {
  constructor(
    readonly phone: number,
    readonly push: PushOutcome,
    readonly pull: PullOutcome,
  ) {}
  check = (m: Readonly<Model>) => m.gated[this.phone];
  async run(m: Model, w: World) {
    const p = w.phones[this.phone];
    const outcome = p.gate!.kind === 'push' ? this.push : this.pull;
    if (outcome !== 'ok') w.faults[outcome] += 1;
    await w.answer(p, outcome);
    await p.step();
    note(m, p);
    await w.check(p);
  }
  toString = () => `answer(${this.phone}, push ${this.push}, pull ${this.pull})`;
}

class Reload implements fc.AsyncCommand<Model, World> {
  constructor(readonly phone: number) {}
  check = (m: Readonly<Model>) => !m.running[this.phone];
  async run(_m: Model, w: World) {
    const p = w.phones[this.phone];
    p.db.close();
    p.db = new FieldDb(p.name);
    await p.db.open();
    w.faults.reloads += 1;
    await w.check(p);
  }
  toString = () => `reload(${this.phone})`;
}

const edit = fc.tuple(phoneArb, editArb).map(([p, t]) => new Edit(p, t));
const sync = fc.tuple(phoneArb, fc.constantFrom(false, false, true)).map(([p, f]) => new StartSync(p, f));
const answer = fc
  .tuple(
    phoneArb,
    fc.constantFrom<PushOutcome>('ok', 'ok', 'ok', 'lost', 'lost', 'fail500', 'fail500', 'offline'),
    fc.constantFrom<PullOutcome>('ok', 'ok', 'ok', 'offline'),
  )
  .map(([p, push, pull]) => new Answer(p, push, pull));
const reload = phoneArb.map((p) => new Reload(p));
// Listed more than once to weigh them: edits and answers are what most runs are made of.
const commands = [edit, edit, edit, sync, sync, answer, answer, answer, answer, reload];

async function newWorld(): Promise<World> {
  const team = await createTeam('Model workshop');
  const roles = ['tester', 'engineer', 'admin'] as const;
  const agent = await sessionAgent(ts, team.members.tester.userId, team.teamId);
  const { vehicleId, pointIds } = await vehicleWithPoints(agent, ['A', 'B']);
  const session = sessionRecord(vehicleId);
  const poses = [poseRecord(session.id, 0, { label: 'Level', notes: '' }), poseRecord(session.id, 1, { label: 'Pose 1', notes: '' })];
  const res = await agent
    .post('/api/sync/push')
    .send({ idempotencyKey: batchKey(), changes: [change('testSession', session), ...poses.map((p) => change('pose', p))] });
  expect(res.status).toBe(200);
  const w = new World(
    session.id,
    poses.map((p) => p.id),
    pointIds,
  );
  for (const p of poses) w.server.set(p.id, { ...recOf('pose', p), writer: 'setup' });
  for (let i = 0; i < PHONES; i++) {
    const cookie = (await startSession(team.members[roles[i]].userId, team.teamId)).split(';')[0];
    const phone = new Phone(i, `model-${crypto.randomUUID()}`, w, cookie);
    await phone.db.open();
    w.phones.push(phone);
    // Every phone starts with what the server has.
    phone.auto = true;
    await phone.start();
    phone.auto = false;
    await w.check(phone);
  }
  return w;
}

/** No more faults: every phone syncs until nothing waits; then all hold what the server holds. */
async function settle(w: World) {
  for (const p of w.phones) {
    if (p.gate) await w.answer(p, 'ok');
    p.auto = true;
    await p.step();
  }
  for (let round = 0; round < 3; round++) {
    for (const p of w.phones) {
      await p.start(true);
      if (p.broken) throw p.broken;
      await w.check(p);
    }
  }
  for (const p of w.phones) {
    expect(await p.db.outbox.count(), `phone ${p.index}'s outbox`).toBe(0);
    expect(await p.db.batches.count()).toBe(0);
    expect(sorted(p.local), `phone ${p.index} converged`).toEqual(sorted(new Map([...w.server].map(([id, { writer: _w, ...r }]) => [id, r]))));
  }
}

describe('the sync protocol against its model', () => {
  it(`converges, never conflicts with itself, and conflicts only on concurrent edits (${RUNS} runs)`, async () => {
    const started = Date.now();
    const totals = { commands: 0, conflicts: 0, lost: 0, fail500: 0, offline: 0, reloads: 0, editsInFlight: 0 };
    await fc.assert(
      fc.asyncProperty(fc.commands(commands, { maxCommands: 60, size: 'max' }), async (cmds) => {
        const w = await newWorld();
        try {
          await fc.asyncModelRun(() => ({ model: { gated: [false, false, false], running: [false, false, false] }, real: w }), cmds);
          await settle(w);
        } finally {
          // A failing run leaves a phone waiting at a gate: let it finish so the next run starts clean.
          for (const p of w.phones) {
            p.auto = false;
            while (p.running) {
              if (p.gate) await w.answer(p, 'offline').catch(() => undefined);
              await new Promise((r) => setImmediate(r));
            }
            p.db.close();
            await p.db.delete();
          }
        }
        totals.commands += [...cmds].length;
        totals.conflicts += w.conflicts;
        for (const k of ['lost', 'fail500', 'offline', 'reloads', 'editsInFlight'] as const) totals[k] += w.faults[k];
      }),
      { numRuns: RUNS },
    );
    console.log(`sync model: ${RUNS} runs in ${((Date.now() - started) / 1000).toFixed(1)} s, ${JSON.stringify(totals)}`);
    // The runs really did meet the cases they are for.
    expect(totals.conflicts).toBeGreaterThan(0);
    expect(totals.lost).toBeGreaterThan(0);
    expect(totals.fail500).toBeGreaterThan(0);
    expect(totals.editsInFlight).toBeGreaterThan(0);
  }, 600_000);
});
