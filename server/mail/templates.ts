// The account e-mails: invitation, password reset, sign-up confirmation and the "you already
// have an account" answer. Plain text first (the mailbox page shows it; every mail client reads
// it), each link on a line of its own. Links point at the configured public URL of the app,
// never at the Host header of a request.
import type { OutgoingMail } from './mailer';
import type { Role } from '../../shared/schemas/common';

let appUrl = (process.env.PUBLIC_URL ?? `http://${process.env.HOST ?? '127.0.0.1'}:${process.env.PORT ?? 5180}`).replace(/\/$/, '');

/** The app's public URL, the base of every link in an e-mail (main.ts and the tests set it). */
export function setAppUrl(url: string) {
  appUrl = url.replace(/\/$/, '');
}
export const link = (path: string) => `${appUrl}${path}`;
/** The app's public URL as set now. */
export const publicAppUrl = () => appUrl;

const sign = '\n\n— Twistlog\n';
const article = (role: Role) => (role === 'admin' || role === 'engineer' ? 'an' : 'a');

export function invitationMail(p: { to: string; teamName: string; role: Role; invitedBy: string; token: string; expiresAt: Date }): OutgoingMail {
  const url = link(`/invite/${p.token}`);
  return {
    to: p.to,
    subject: `${p.invitedBy} invited you to ${p.teamName} on Twistlog`,
    text:
      `${p.invitedBy} invited you to join ${p.teamName} on Twistlog as ${article(p.role)} ${p.role}.\n\n` +
      `Open this link to choose your name and password and join:\n\n${url}\n\n` +
      `The link works once and expires on ${p.expiresAt.toUTCString()}. ` +
      `If you did not expect this, ignore this e-mail.` +
      sign,
  };
}

export function passwordResetMail(p: { to: string; name: string; token: string }): OutgoingMail {
  const url = link(`/reset-password/${p.token}`);
  return {
    to: p.to,
    subject: 'Reset your Twistlog password',
    text:
      `Hello ${p.name},\n\nSomeone (we hope you) asked to reset the password of your Twistlog account.\n\n` +
      `Open this link to choose a new one:\n\n${url}\n\n` +
      `The link works once and expires in one hour. Setting a new password signs you out on every device. ` +
      `If you did not ask for this, ignore this e-mail: your password stays as it is.` +
      sign,
  };
}

export function passwordChangedMail(p: { to: string; name: string }): OutgoingMail {
  return {
    to: p.to,
    subject: 'Your Twistlog password was changed',
    text:
      `Hello ${p.name},\n\nThe password of your Twistlog account was just changed, and every device was signed out.\n\n` +
      `If this was not you, reset your password at once:\n\n${link('/forgot-password')}` +
      sign,
  };
}

export function signUpConfirmMail(p: { to: string; name: string; teamName: string; token: string }): OutgoingMail {
  const url = link(`/sign-up/confirm/${p.token}`);
  return {
    to: p.to,
    subject: `Confirm your e-mail to create ${p.teamName} on Twistlog`,
    text:
      `Hello ${p.name},\n\nConfirm your e-mail address to create the workshop ${p.teamName} on Twistlog, with you as its admin:\n\n${url}\n\n` +
      `The link works once and expires in 24 hours. If you did not sign up, ignore this e-mail and nothing is created.` +
      sign,
  };
}

export function accountExistsMail(p: { to: string; name: string }): OutgoingMail {
  return {
    to: p.to,
    subject: 'You already have a Twistlog account',
    text:
      `Hello ${p.name},\n\nSomeone (we hope you) tried to sign up to Twistlog with this e-mail address, but you already have an account, ` +
      `so nothing new was created.\n\nSign in here:\n\n${link('/sign-in')}\n\n` +
      `Forgot your password? Choose a new one here:\n\n${link('/forgot-password')}` +
      sign,
  };
}
