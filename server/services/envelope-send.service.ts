// Sending a signed envelope's fabrication sheet by e-mail (the same mail path as invitations),
// logged on the envelope and in the session's history. Only a revision that is signed now is
// sent: a superseded sheet must not reach a fabricator.
import { randomUUID } from 'node:crypto';
import { EnvelopeSendModel, HistoryEventModel, TeamModel, UserModel } from '../models';
import type { AuthContext } from '../auth/context';
import { Conflict } from '../http/errors';
import { sendWithinQuota } from '../mail/quotas';
import type { UnitSystem } from '../../shared/schemas/common';
import type { SendSheetInput } from '../../shared/schemas/envelope';
import { envelopeRows } from '../../shared/envelope-rows';
import { revisionName } from '../../shared/revision-name';
import { formatLength, formatTimestamp } from '../../shared/format';
import { getSignedEnvelope } from './envelope.service';
import { PLANNING_AID_NOTICE, buildSheetPdf } from './fabrication-sheet.service';

/** The unit a person reads lengths in: their own choice, else the team's. */
export async function unitFor(auth: Pick<AuthContext, 'userId' | 'teamId'>, override?: UnitSystem): Promise<UnitSystem> {
  if (override) return override;
  const [user, team] = await Promise.all([UserModel.findByPk(auth.userId), TeamModel.findByPk(auth.teamId)]);
  return user?.unitSystem ?? team?.unitSystem ?? 'mm';
}

export function sheetFileName(vehicleName: string, revision: number) {
  const slug =
    vehicleName
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '') || 'vehicle';
  return `fabrication-sheet-${slug}-rev${revision}.pdf`;
}

export async function sendSheet(auth: AuthContext, envelopeId: string, input: SendSheetInput) {
  const envelope = await getSignedEnvelope(auth, envelopeId);
  if (envelope.status !== 'signed') throw new Conflict(`revision ${envelope.revision} is superseded by a later sign-off: send the current revision`);
  const s = envelope.snapshot;
  const subject = `Fabrication sheet: ${revisionName({ vehicleName: s.vehicle.name, sessionTitle: s.session.title, revision: s.revision })}`;
  // Counted against the sheet quotas (mail/quotas.ts) before the PDF is made, and logged like
  // every e-mail the app sends.
  const { messageId } = await sendWithinQuota(auth, 'sheet', { to: input.to, subject }, async () => {
    const unit = await unitFor(auth);
    const pdf = await buildSheetPdf({ snapshot: s, contentHash: envelope.contentHash, status: 'signed', unit });
    const lines = [
      `${auth.name} sends you the fabrication sheet for the cab-to-body boot or seal of ${s.vehicle.name} (envelope revision ${s.revision}, signed off by ${s.signedBy.name} on ${formatTimestamp(s.signedAt)}).`,
      '',
      ...(input.note ? [input.note, ''] : []),
      'Design envelope:',
      ...envelopeRows(s.result, unit).map((r) => `  ${r.name}: ${r.sign}${formatLength(r.envelopeMm, unit)}`),
      '',
      `Content hash: ${envelope.contentHash}`,
      '',
      PLANNING_AID_NOTICE,
    ];
    return {
      to: input.to,
      subject,
      text: lines.join('\n'),
      attachments: [{ filename: sheetFileName(s.vehicle.name, s.revision), content: pdf, contentType: 'application/pdf' }],
    };
  });
  const sequelize = EnvelopeSendModel.sequelize!;
  const sendId = randomUUID();
  const detail = { to: input.to, revision: s.revision };
  await sequelize.transaction(async (transaction) => {
    await EnvelopeSendModel.create({ id: sendId, teamId: auth.teamId, envelopeId, toEmail: input.to, sentBy: auth.userId, messageId }, { transaction });
    await HistoryEventModel.create(
      { teamId: auth.teamId, sessionId: envelope.sessionId, entity: 'envelope', entityId: envelopeId, action: 'envelope.send', userId: auth.userId, detail },
      { transaction },
    );
  });
  return { id: sendId, toEmail: input.to, messageId };
}
