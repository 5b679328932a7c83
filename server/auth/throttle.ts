// Throttling of sign-in, password reset, sign-up and the e-mailed links: per account (the
// e-mail address asked about) and per address (the client's IP, as Express sees it through the
// explicit 'trust proxy' setting in app.ts). A throttled answer is the same whether or not the
// account exists, so it tells nothing about who has one.
import type { Request, RequestHandler } from 'express';
import { MemoryStore, rateLimit } from 'express-rate-limit';
import { AppError } from '../http/errors';

const MINUTE = 60_000;

class TooManyRequests extends AppError {
  constructor(retryAfterS: number) {
    super(429, 'too_many_requests', `too many attempts: wait ${Math.max(1, Math.ceil(retryAfterS / 60))} min and try again`);
  }
}

const emailOf = (req: Request) => {
  const e = (req.body as { email?: unknown } | undefined)?.email;
  return typeof e === 'string' ? e.trim().toLowerCase() : '';
};

const stores: MemoryStore[] = [];

function limiter(opts: {
  name: string;
  windowMs: number;
  limit: number;
  /** Count only answers of 400 and above (failed sign-ins, bad tokens). */
  failuresOnly?: boolean;
  perAccount?: boolean;
  /** Key by the signed-in person instead of the client's address. */
  perUser?: boolean;
}): RequestHandler {
  const store = new MemoryStore();
  stores.push(store);
  return rateLimit({
    store,
    windowMs: opts.windowMs,
    limit: opts.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    identifier: opts.name,
    skipSuccessfulRequests: opts.failuresOnly ?? false,
    ...(opts.perAccount
      ? { keyGenerator: (req: Request) => `${opts.name}:${emailOf(req)}`, skip: (req: Request) => emailOf(req) === '' }
      : {}),
    ...(opts.perUser ? { keyGenerator: (req: Request) => `${opts.name}:${req.auth?.userId ?? ''}` } : {}),
    handler: (_req, res, next, o) => {
      const reset = (_req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
      const retryAfterS = reset ? Math.ceil((reset.getTime() - Date.now()) / 1000) : o.windowMs / 1000;
      res.setHeader('Retry-After', String(Math.max(1, retryAfterS)));
      next(new TooManyRequests(retryAfterS));
    },
  });
}

/** The limits, in one place (the README's "Roles and permissions" section names them). */
export const throttleLimits = {
  signInPerAccount: { windowMs: 15 * MINUTE, limit: 10 },
  signInPerAddress: { windowMs: 15 * MINUTE, limit: 30 },
  resetPerAccount: { windowMs: 60 * MINUTE, limit: 3 },
  resetPerAddress: { windowMs: 60 * MINUTE, limit: 20 },
  signUpPerAccount: { windowMs: 60 * MINUTE, limit: 3 },
  signUpPerAddress: { windowMs: 60 * MINUTE, limit: 10 },
  tokenPerAddress: { windowMs: 15 * MINUTE, limit: 60 },
  changePasswordPerUser: { windowMs: 15 * MINUTE, limit: 10 },
} as const;

const L = throttleLimits;

export const throttle = {
  /** Sign-in: failed attempts per e-mail and per address. */
  signIn: [
    limiter({ name: 'sign-in-address', ...L.signInPerAddress, failuresOnly: true }),
    limiter({ name: 'sign-in-account', ...L.signInPerAccount, failuresOnly: true, perAccount: true }),
  ],
  /** Password reset requests: every request counts (each may send an e-mail). */
  passwordReset: [
    limiter({ name: 'reset-address', ...L.resetPerAddress }),
    limiter({ name: 'reset-account', ...L.resetPerAccount, perAccount: true }),
  ],
  signUp: [
    limiter({ name: 'sign-up-address', ...L.signUpPerAddress }),
    limiter({ name: 'sign-up-account', ...L.signUpPerAccount, perAccount: true }),
  ],
  /** Using an e-mailed link (reset, invitation, sign-up confirmation): failures per address. */
  token: [limiter({ name: 'token-address', ...L.tokenPerAddress, failuresOnly: true })],
  /** Change password: wrong current passwords per signed-in person. */
  changePassword: [limiter({ name: 'change-password-user', ...L.changePasswordPerUser, failuresOnly: true, perUser: true })],
};

/** Forget every count (tests). */
export async function resetThrottles(): Promise<void> {
  await Promise.all(stores.map((s) => s.resetAll()));
}
