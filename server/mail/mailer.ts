// Outgoing e-mail through SMTP (nodemailer). In development and tests the SMTP server is the
// local sink (mail/sink.ts); in production the SMTP_* settings name the real one.
import nodemailer, { type Transporter } from 'nodemailer';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
}

export interface SmtpSettings {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  pass?: string;
  from: string;
}

let transport: Transporter | undefined;
let from = 'Twistlog <no-reply@twistlog.invalid>';

export function configureMailer(s: SmtpSettings) {
  from = s.from;
  transport = nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: s.secure,
    auth: s.user ? { user: s.user, pass: s.pass ?? '' } : undefined,
    // The local sink speaks plain SMTP on loopback; a real server upgrades with STARTTLS.
    ignoreTLS: s.host === '127.0.0.1' || s.host === 'localhost',
  });
}

export function smtpSettingsFromEnv(env: NodeJS.ProcessEnv = process.env): SmtpSettings {
  return {
    host: env.SMTP_HOST ?? '127.0.0.1',
    port: Number(env.SMTP_PORT ?? 2525),
    secure: env.SMTP_SECURE === 'true',
    user: env.SMTP_USER,
    pass: env.SMTP_PASS,
    from: env.MAIL_FROM ?? from,
  };
}

export async function sendMail(mail: OutgoingMail): Promise<{ messageId: string }> {
  if (!transport) configureMailer(smtpSettingsFromEnv());
  const info = await transport!.sendMail({ from, ...mail });
  return { messageId: info.messageId };
}
