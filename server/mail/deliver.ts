// Sending without making the person wait, and without the answer depending on the send: used
// where the answer must be the same whether or not an e-mail goes out (sign-up, password reset).
import type { Logger } from 'pino';
import { sendMail, type OutgoingMail } from './mailer';

export function sendInBackground(mail: OutgoingMail, log?: Pick<Logger, 'error'>): void {
  sendMail(mail).catch((err) => {
    if (log) log.error({ err, subject: mail.subject }, 'e-mail could not be sent');
    else process.stderr.write(`e-mail could not be sent (${mail.subject}): ${err?.message ?? err}\n`);
  });
}
