// Sending without making the person wait, and without the answer depending on the send: used
// where the answer must be the same whether or not an e-mail goes out (sign-up, password reset).
// Logged like every e-mail the app sends (mail-log.ts).
import type { Logger } from 'pino';
import type { OutgoingMail } from './mailer';
import { sendLogged, type MailMeta } from './mail-log';

export function sendInBackground(mail: OutgoingMail, meta: MailMeta, log?: Pick<Logger, 'error'>): void {
  sendLogged(mail, meta).catch((err) => {
    if (log) log.error({ err, subject: mail.subject }, 'e-mail could not be sent');
    else process.stderr.write(`e-mail could not be sent (${mail.subject}): ${err?.message ?? err}\n`);
  });
}
