// Mail quotas: the app sends fabrication sheets and invitations to outside addresses, so it must
// not be a relay for spam or phishing. Each kind is counted per person and per workshop, over the
// last hour and the last 24 hours, from the mail log in PostgreSQL, under an advisory lock per
// workshop and per person, so several app instances count the same sends and two requests at once
// cannot both take the last place. A new workshop (its first e-mail address not yet confirmed, or
// no envelope signed off yet) has small quotas. Over quota: a 429 saying when to try again.
import type { Transaction } from 'sequelize';
import { QueryTypes } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { TooManyRequests, waitText } from '../http/errors';
import { TeamModel } from '../models';
import type { OutgoingMail } from './mailer';
import { failMail, logMail, sendLoggedRow } from './mail-log';

export type CountedKind = 'sheet' | 'invitation';
interface Limits {
  person: { hour: number; day: number };
  workshop: { hour: number; day: number };
}

/** The quotas (the README's security paragraph states them). */
export const mailQuotas: Record<'established' | 'newWorkshop', Record<CountedKind, Limits>> = {
  established: {
    sheet: { person: { hour: 20, day: 60 }, workshop: { hour: 40, day: 150 } },
    invitation: { person: { hour: 20, day: 50 }, workshop: { hour: 30, day: 100 } },
  },
  newWorkshop: {
    sheet: { person: { hour: 3, day: 5 }, workshop: { hour: 3, day: 5 } },
    invitation: { person: { hour: 5, day: 10 }, workshop: { hour: 5, day: 10 } },
  },
};

const NOUN: Record<CountedKind, [string, string]> = { sheet: ['fabrication sheet', 'fabrication sheets'], invitation: ['invitation', 'invitations'] };
const WINDOW = { hour: { seconds: 3600, words: 'the last hour' }, day: { seconds: 24 * 3600, words: 'the last 24 hours' } } as const;

const db = () => TeamModel.sequelize!;

async function lock(key: string, transaction: Transaction) {
  await db().query('SELECT pg_advisory_xact_lock(hashtextextended($1, 0))', { bind: [key], transaction });
}

/** Established: its first e-mail address confirmed and at least one envelope signed off. */
async function isEstablished(teamId: string, transaction: Transaction): Promise<boolean> {
  const [row] = await db().query<{ established: boolean }>(
    `SELECT t.email_confirmed_at IS NOT NULL
        AND EXISTS (SELECT 1 FROM envelopes e WHERE e.team_id = t.id AND e.status IN ('signed', 'superseded')) AS established
     FROM teams t WHERE t.id = $1`,
    { bind: [teamId], type: QueryTypes.SELECT, transaction },
  );
  return row?.established ?? false;
}

/** Seconds until the sends counted in the window drop below the limit (the oldest ones leave it). */
async function secondsUntilFree(
  scope: 'team_id' | 'user_id',
  id: string,
  kind: CountedKind,
  window: keyof typeof WINDOW,
  limit: number,
  count: number,
  transaction: Transaction,
) {
  const [row] = await db().query<{ wait: number }>(
    `SELECT extract(epoch FROM created_at + make_interval(secs => $4) - now())::float8 AS wait
     FROM mail_log WHERE ${scope} = $1 AND kind = $2 AND created_at > now() - make_interval(secs => $4)
     ORDER BY created_at OFFSET $3 LIMIT 1`,
    { bind: [id, kind, count - limit, WINDOW[window].seconds], type: QueryTypes.SELECT, transaction },
  );
  return Math.max(1, row?.wait ?? 1);
}

async function counts(scope: 'team_id' | 'user_id', id: string, kind: CountedKind, transaction: Transaction) {
  const [row] = await db().query<{ hour: number; day: number }>(
    `SELECT count(*) FILTER (WHERE created_at > now() - interval '1 hour')::int AS hour, count(*)::int AS day
     FROM mail_log WHERE ${scope} = $1 AND kind = $2 AND created_at > now() - interval '24 hours'`,
    { bind: [id, kind], type: QueryTypes.SELECT, transaction },
  );
  return row;
}

/**
 * Takes a place in the quota for one e-mail (its row in the log, 'sending') or throws a 429
 * naming the limit reached and when a place frees up. Person limits count across workshops.
 */
async function reserve(auth: Pick<AuthContext, 'teamId' | 'userId'>, kind: CountedKind, mail: Pick<OutgoingMail, 'to' | 'subject'>): Promise<string> {
  return db().transaction(async (transaction) => {
    await lock(`mail-quota:team:${auth.teamId}`, transaction);
    await lock(`mail-quota:person:${auth.userId}`, transaction);
    const established = await isEstablished(auth.teamId, transaction);
    const limits = mailQuotas[established ? 'established' : 'newWorkshop'][kind];
    const scopes = [
      { scope: 'user_id' as const, id: auth.userId, who: 'you have', limits: limits.person, most: 'one person may send' },
      { scope: 'team_id' as const, id: auth.teamId, who: 'this workshop has', limits: limits.workshop, most: 'a workshop may send' },
    ];
    for (const s of scopes) {
      const n = await counts(s.scope, s.id, kind, transaction);
      for (const window of ['hour', 'day'] as const) {
        const limit = s.limits[window];
        if (n[window] < limit) continue;
        const wait = await secondsUntilFree(s.scope, s.id, kind, window, limit, n[window], transaction);
        const standing = established
          ? s.most
          : `${s.most} from a new workshop, until it has confirmed its first e-mail address and signed off its first envelope`;
        const said = `${s.who} sent ${n[window]} ${NOUN[kind][1]} in ${WINDOW[window].words}, the most ${standing}`;
        throw new TooManyRequests(`${said[0].toUpperCase()}${said.slice(1)}. Nothing was sent: try again in ${waitText(wait)}.`, wait);
      }
    }
    return logMail(mail, { kind, teamId: auth.teamId, userId: auth.userId }, transaction);
  });
}

/**
 * Send a sheet or an invitation within the quotas, logged. The place is taken before the message
 * is built (`build`, e.g. a PDF), so a refused request costs no work.
 */
export async function sendWithinQuota(
  auth: Pick<AuthContext, 'teamId' | 'userId'>,
  kind: CountedKind,
  head: Pick<OutgoingMail, 'to' | 'subject'>,
  build: () => Promise<OutgoingMail>,
): Promise<{ messageId: string }> {
  const id = await reserve(auth, kind, head);
  let mail: OutgoingMail;
  try {
    mail = await build();
  } catch (err) {
    await failMail(id, err);
    throw err;
  }
  return sendLoggedRow(id, mail);
}
