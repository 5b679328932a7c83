// Single-use tokens for e-mailed links (invitations, password resets, sign-up confirmations).
// The link carries 256 random bits; only their SHA-256 is stored, so a copy of the database
// opens no account.
import { createHash, randomBytes } from 'node:crypto';
import { AppError } from '../http/errors';

export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export const hashToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

/** Link lifetimes. */
export const TOKEN_TTL = {
  invitation: 7 * 24 * 60 * 60 * 1000,
  passwordReset: 60 * 60 * 1000,
  signUp: 24 * 60 * 60 * 1000,
} as const;

/** One answer for an unknown, used, expired or replaced link: nothing to learn by trying. */
export class LinkInvalid extends AppError {
  constructor() {
    super(400, 'link_invalid', 'This link is not valid any more: it was used already, it expired, or a newer one replaced it.');
  }
}
