// Every e-mail the app sends is logged in PostgreSQL (mail_log): what kind, for which workshop and
// person, to whom, the subject, when, and whether it went out (with the SMTP message id). The log
// is the record of what the app sent, and the sheet and invitation quotas are counted from it.
import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { TeamModel } from '../models';
import { sendMail, type OutgoingMail } from './mailer';

export type MailKind = 'sheet' | 'invitation' | 'sign-up' | 'account-exists' | 'password-reset' | 'password-changed';

export interface MailMeta {
  kind: MailKind;
  teamId?: string | null;
  userId?: string | null;
}

const db = () => TeamModel.sequelize!;

/** A row for one e-mail about to go out ('sending'); returns its id. */
export async function logMail(mail: Pick<OutgoingMail, 'to' | 'subject'>, meta: MailMeta, transaction?: Transaction): Promise<string> {
  const id = randomUUID();
  await db().query(`INSERT INTO mail_log (id, team_id, user_id, kind, to_email, subject) VALUES ($1, $2, $3, $4, $5, $6)`, {
    bind: [id, meta.teamId ?? null, meta.userId ?? null, meta.kind, mail.to.toLowerCase(), mail.subject],
    transaction,
  });
  return id;
}

/** Send an e-mail whose row is already in the log, and note how it went. */
export async function sendLoggedRow(id: string, mail: OutgoingMail): Promise<{ messageId: string }> {
  try {
    const sent = await sendMail(mail);
    await db().query(`UPDATE mail_log SET status = 'sent', message_id = $2, updated_at = now() WHERE id = $1`, { bind: [id, sent.messageId] });
    return sent;
  } catch (err) {
    await failMail(id, err);
    throw err;
  }
}

/** Note that an e-mail of the log did not go out, and why. */
export async function failMail(id: string, err: unknown): Promise<void> {
  await db().query(`UPDATE mail_log SET status = 'failed', error = $2, updated_at = now() WHERE id = $1`, {
    bind: [id, String((err as Error)?.message ?? err).slice(0, 500)],
  });
}

/** Log, then send. */
export async function sendLogged(mail: OutgoingMail, meta: MailMeta): Promise<{ messageId: string }> {
  return sendLoggedRow(await logMail(mail, meta), mail);
}
