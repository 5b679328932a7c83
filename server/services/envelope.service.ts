// Envelope revisions of a session: drafts the engineer tunes, sign-off that freezes inputs and
// results, re-opening into a new revision.
//
// Revisions: a session has at most one open draft. Signing computes the snapshot here, on the
// server, with shared/flex from the readings in the database at that moment (never from what the
// browser sends), hashes it, and marks every earlier signed revision of the session 'superseded'.
// Re-opening a signed revision leaves it signed (its sheet stays valid and visible) and adds a new
// draft revision with the same parameters; only when that draft is signed does the old one become
// 'superseded'. A snapshot is never written again after sign-off.
// A reading the outlier rule flags may stay in the computation only if the engineer acknowledges it
// at sign-off (docs/method.md §3): the server computes the flags itself and refuses a sign-off that
// leaves one unacknowledged, naming each; the acknowledgements are frozen in the snapshot.
// Roles without 'envelope.read' (viewers) see signed revisions only; anything else is a 404 to them.
import { Op, Transaction } from 'sequelize';
import { EnvelopeModel, EnvelopeSendModel, HistoryEventModel, TestSessionModel, UserModel, VehicleModel } from '../models';
import { can } from '../../shared/permissions';
import type { AuthContext } from '../auth/context';
import { Conflict, Invalid, NotFound } from '../http/errors';
import { FlexInputError } from '../../shared/flex';
import { buildSnapshot, computeDeskEnvelope, deskFlags, type DeskEnvelope } from '../../shared/desk-envelope';
import { AXIS_NAMES, formatLength } from '../../shared/format';
import { plural } from '../../shared/plural';
import {
  DEFAULT_DRAFT_PARAMS,
  envelopeParams,
  type EnvelopeParams,
  type EnvelopeRecord,
  type EnvelopeSnapshot,
  type SignOffInput,
  type SignedEnvelopeSummary,
} from '../../shared/schemas/envelope';
import { getSessionDetail } from './sessions.service';
import { canonicalJson, contentHash } from './envelope-hash';
import { randomUUID } from 'node:crypto';

type Reader = Pick<AuthContext, 'teamId' | 'role'>;
/** Who signs: the route passes the signed-in person; the demo seed passes its engineer. */
export type Signer = Pick<AuthContext, 'teamId' | 'userId' | 'name'>;

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

function seesDrafts(auth: Reader) {
  return can(auth.role, 'envelope.read');
}

async function names(ids: (string | null)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  if (wanted.length === 0) return new Map();
  const users = await UserModel.findAll({ where: { id: wanted }, attributes: ['id', 'name'] });
  return new Map(users.map((u) => [u.id, u.name]));
}

async function toRecords(teamId: string, rows: EnvelopeModel[]): Promise<EnvelopeRecord[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const [sessions, vehicles, sends] = await Promise.all([
    TestSessionModel.findAll({ where: { teamId, id: [...new Set(rows.map((r) => r.sessionId))] }, attributes: ['id', 'title', 'testedOn'] }),
    VehicleModel.findAll({ where: { teamId, id: [...new Set(rows.map((r) => r.vehicleId))] }, attributes: ['id', 'name'] }),
    EnvelopeSendModel.findAll({ where: { teamId, envelopeId: ids }, order: [['createdAt', 'ASC']] }),
  ]);
  const people = await names([...rows.map((r) => r.signedBy), ...sends.map((s) => s.sentBy)]);
  const sessionOf = new Map(sessions.map((s) => [s.id, s]));
  const vehicleOf = new Map(vehicles.map((v) => [v.id, v]));
  return rows.map((r) => ({
    id: r.id,
    sessionId: r.sessionId,
    vehicleId: r.vehicleId,
    vehicleName: vehicleOf.get(r.vehicleId)?.name ?? '',
    sessionTitle: sessionOf.get(r.sessionId)?.title ?? '',
    testedOn: sessionOf.get(r.sessionId)?.testedOn ?? '',
    revision: r.revision,
    status: r.status,
    version: r.version,
    params: envelopeParams.parse(r.params),
    snapshot: (r.snapshot as EnvelopeSnapshot | null) ?? null,
    contentHash: r.contentHash,
    hashVerifies: r.snapshot && r.contentHash ? contentHash(r.snapshot) === r.contentHash : null,
    signedBy: r.signedBy ? { id: r.signedBy, name: people.get(r.signedBy) ?? '' } : null,
    signedAt: iso(r.signedAt),
    createdAt: iso(r.createdAt)!,
    sends: sends
      .filter((s) => s.envelopeId === r.id)
      .map((s) => ({ id: s.id, toEmail: s.toEmail, sentBy: people.get(s.sentBy) ?? '', sentAt: iso(s.createdAt)! })),
  }));
}

async function sessionRow(teamId: string, sessionId: string, transaction?: Transaction) {
  const s = await TestSessionModel.findOne({ where: { id: sessionId, teamId, deletedAt: null }, transaction });
  if (!s) throw new NotFound('session');
  return s;
}

async function envelopeRow(teamId: string, id: string, transaction?: Transaction) {
  const row = await EnvelopeModel.findOne({ where: { id, teamId, deletedAt: null }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!row) throw new NotFound('envelope');
  return row;
}

function history(teamId: string, sessionId: string, envelopeId: string, action: string, userId: string, detail: object, transaction: Transaction) {
  return HistoryEventModel.create({ teamId, sessionId, entity: 'envelope', entityId: envelopeId, action, userId, detail }, { transaction });
}

export async function listSessionEnvelopes(auth: Reader, sessionId: string): Promise<EnvelopeRecord[]> {
  await sessionRow(auth.teamId, sessionId);
  const rows = await EnvelopeModel.findAll({ where: { teamId: auth.teamId, sessionId, deletedAt: null }, order: [['revision', 'DESC']] });
  return toRecords(auth.teamId, rows);
}

export async function getEnvelope(auth: Reader, id: string): Promise<EnvelopeRecord> {
  const row = await envelopeRow(auth.teamId, id);
  if (!seesDrafts(auth) && row.status !== 'signed') throw new NotFound('envelope');
  const [record] = await toRecords(auth.teamId, [row]);
  // A viewer may be an outside fabricator: the addresses others were sent to are not theirs to see.
  return seesDrafts(auth) ? record : { ...record, sends: [] };
}

/** An envelope whose sheet can be printed: it has a snapshot (signed, or superseded for the record). */
export async function getSignedEnvelope(auth: Reader, id: string): Promise<EnvelopeRecord & { snapshot: EnvelopeSnapshot; contentHash: string }> {
  const record = await getEnvelope(auth, id);
  if (!record.snapshot || !record.contentHash) throw new Conflict('this envelope is a draft: sign it off before printing or sending its sheet');
  return record as EnvelopeRecord & { snapshot: EnvelopeSnapshot; contentHash: string };
}

/** Every signed revision of the team, newest first: the viewer's page and the desk's list. */
export async function listSignedEnvelopes(auth: Reader): Promise<SignedEnvelopeSummary[]> {
  const rows = await EnvelopeModel.findAll({ where: { teamId: auth.teamId, status: 'signed', deletedAt: null }, order: [['signedAt', 'DESC']] });
  const records = await toRecords(auth.teamId, rows);
  return records.map((r) => ({
    id: r.id,
    vehicleName: r.vehicleName,
    sessionTitle: r.sessionTitle,
    testedOn: r.testedOn,
    revision: r.revision,
    signedAt: r.signedAt!,
    signedBy: r.signedBy?.name ?? '',
    contentHash: r.contentHash!,
  }));
}

export async function createDraft(auth: Signer, sessionId: string, params: EnvelopeParams = DEFAULT_DRAFT_PARAMS): Promise<EnvelopeRecord> {
  const sequelize = EnvelopeModel.sequelize!;
  const id = await sequelize.transaction(async (transaction) => {
    const session = await sessionRow(auth.teamId, sessionId, transaction);
    // Serialises revision numbering per session.
    await TestSessionModel.findOne({ where: { id: session.id }, lock: transaction.LOCK.UPDATE, transaction });
    const existing = await EnvelopeModel.findAll({ where: { teamId: auth.teamId, sessionId, deletedAt: null }, transaction });
    const open = existing.find((e) => e.status === 'draft');
    if (open) throw new Conflict(`revision ${open.revision} of this session's envelope is already open as a draft`);
    const revision = Math.max(0, ...existing.map((e) => e.revision)) + 1;
    const row = await EnvelopeModel.create(
      { id: randomUUID(), teamId: auth.teamId, vehicleId: session.vehicleId, sessionId, revision, params, createdBy: auth.userId },
      { transaction },
    );
    await history(auth.teamId, sessionId, row.id, 'envelope.draft', auth.userId, { revision }, transaction);
    return row.id;
  });
  const [record] = await toRecords(auth.teamId, [await envelopeRow(auth.teamId, id)]);
  return record;
}

export async function saveDraft(auth: Signer, id: string, input: { version: number; params: EnvelopeParams }): Promise<EnvelopeRecord> {
  const sequelize = EnvelopeModel.sequelize!;
  await sequelize.transaction(async (transaction) => {
    const row = await envelopeRow(auth.teamId, id, transaction);
    if (row.status !== 'draft') throw new Conflict(`revision ${row.revision} is ${row.status}: its parameters are frozen; re-open it as a new revision`);
    if (row.version !== input.version)
      throw new Conflict(`the envelope changed since you opened it (version ${row.version}, yours ${input.version}); reload it`);
    const before = row.params;
    await row.update({ params: input.params, version: row.version + 1 }, { transaction });
    await history(auth.teamId, row.sessionId, row.id, 'envelope.params', auth.userId, { before, after: input.params }, transaction);
  });
  return getEnvelope({ teamId: auth.teamId, role: 'engineer' }, id);
}

/**
 * Signs a draft: reads the session from the database inside the transaction, computes envelope and
 * boot check with shared/flex, checks that every flagged reading kept in the computation is
 * acknowledged, freezes the snapshot with its hash, supersedes earlier signed revisions.
 */
export async function signOff(
  auth: Signer,
  id: string,
  input: Pick<SignOffInput, 'version'> & Partial<SignOffInput>,
  now = new Date(),
): Promise<EnvelopeRecord> {
  const sequelize = EnvelopeModel.sequelize!;
  // One snapshot of the database for every read: an edit committing mid-way cannot mix in.
  await sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, async (transaction) => {
    const row = await envelopeRow(auth.teamId, id, transaction);
    if (row.status !== 'draft') throw new Conflict(`revision ${row.revision} is already ${row.status}`);
    if (row.version !== input.version)
      throw new Conflict(`the envelope changed since you opened it (version ${row.version}, yours ${input.version}); reload it`);
    const params = envelopeParams.parse(row.params);
    const detail = await getSessionDetail(auth, row.sessionId, { transaction });
    let envelope: DeskEnvelope;
    try {
      envelope = computeDeskEnvelope(detail, params);
    } catch (error) {
      if (error instanceof FlexInputError)
        throw new Invalid(`the envelope cannot be computed from this session: ${error.message}`, [{ field: error.field, message: error.problem }]);
      throw error;
    }
    const acknowledged = new Map((input.acknowledgements ?? []).map((a) => [a.readingId, a.note ?? '']));
    const missing = deskFlags(detail, envelope.result).filter((f) => !acknowledged.has(f.readingId));
    if (missing.length > 0) {
      const named = missing.map((f) => `${f.poseLabel} ${f.pointLabel} ${AXIS_NAMES[f.flag.axis]} (residual ${formatLength(f.flag.residualMm, 'mm')})`);
      throw new Invalid(
        `${plural(missing.length, 'flagged reading')} ${missing.length === 1 ? 'is' : 'are'} still in the computation: acknowledge each one, or exclude it, before signing off: ${named.join('; ')}`,
        missing.map((f, i) => ({ field: `acknowledgements.${f.readingId}`, message: `flagged reading ${named[i]} needs an acknowledgement` })),
      );
    }
    const standing = await EnvelopeModel.findAll({
      where: { teamId: auth.teamId, sessionId: row.sessionId, status: 'signed', id: { [Op.ne]: row.id } },
      attributes: ['revision'],
      transaction,
    });
    const snapshot = {
      ...buildSnapshot(
        detail,
        params,
        { signedBy: { id: auth.userId, name: auth.name }, signedAt: now.toISOString(), revision: row.revision },
        envelope,
        acknowledged,
      ),
      supersedesRevision: standing.length === 0 ? null : Math.max(...standing.map((e) => e.revision)),
    };
    // Stored exactly as hashed, so reading it back re-hashes to the same value.
    const frozen = JSON.parse(canonicalJson(snapshot)) as EnvelopeSnapshot;
    const hash = contentHash(frozen);
    await EnvelopeModel.update(
      { status: 'superseded' },
      { where: { teamId: auth.teamId, sessionId: row.sessionId, status: 'signed', id: { [Op.ne]: row.id } }, transaction },
    );
    await row.update(
      { status: 'signed', snapshot: frozen, contentHash: hash, signedBy: auth.userId, signedAt: now, version: row.version + 1 },
      { transaction },
    );
    await history(
      auth.teamId,
      row.sessionId,
      row.id,
      'envelope.sign',
      auth.userId,
      { revision: row.revision, contentHash: hash, acknowledgedReadings: snapshot.acknowledgedFlags.map((f) => f.readingId) },
      transaction,
    );
  });
  return getEnvelope({ teamId: auth.teamId, role: 'engineer' }, id);
}

/** A new draft revision with the parameters of a signed one; the signed one stays as it is. */
export async function reopen(auth: Signer, id: string): Promise<EnvelopeRecord> {
  const row = await envelopeRow(auth.teamId, id);
  if (row.status === 'draft') throw new Conflict(`revision ${row.revision} is already a draft`);
  return createDraft(auth, row.sessionId, envelopeParams.parse(row.params));
}
