// Throttling, with every count in PostgreSQL so that all app instances see the same numbers.
//
// Sign-in is throttled per (account, address): a few failures are free, then each further one
// doubles the wait before the next attempt from that address for that account (1 s, 2 s, 4 s … up
// to 15 min). Someone guessing a person's password from one address slows only themselves: the
// owner on their own phone's address signs in at once, and colleagues behind the same shared
// address are not touched. One address failing on many different accounts (credential stuffing)
// is stopped for that address. Each attempt counts as a failure from the moment it starts (a
// success clears it), so a burst of parallel guesses gets no more tries than a sequence.
//
// Password reset, sign-up, e-mailed links and password changes keep fixed windows per account
// and per address (rate-limiter-flexible's PostgreSQL store, table rate_limits). The account is
// stored as a SHA-256 of the e-mail address. A throttled answer is the same whether or not the
// account exists. The client's address is what Express makes of it through the explicit
// 'trust proxy' setting (app.ts).
import { createHash } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import { QueryTypes, type Sequelize } from 'sequelize';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { TooManyRequests, waitText } from '../http/errors';
import { VehicleModel } from '../models';

const MINUTE = 60_000;

const tooMany = (retryAfterS: number) => new TooManyRequests(`too many attempts: wait ${waitText(retryAfterS)} and try again`, retryAfterS);

const emailOf = (req: Request) => {
  const e = (req.body as { email?: unknown } | undefined)?.email;
  return typeof e === 'string' ? e.trim().toLowerCase() : '';
};
const accountKey = (email: string) => createHash('sha256').update(email, 'utf8').digest('hex');
const db = (): Sequelize => VehicleModel.sequelize!;

// ---------------------------------------------------------------------------------------------
// Sign-in: growing waits per (account, address).

export const signInThrottle = {
  /** Failures per (account, address) answered at once before waits begin. */
  freeFailures: 5,
  /** The longest wait between attempts, in seconds. */
  maxWaitS: 15 * 60,
  /** Failures are forgotten after this long without an attempt. */
  forgetAfterS: 60 * 60,
  /** Different accounts one address may fail on within `accountsWindowS` before it is stopped. */
  accountsPerAddress: 20,
  accountsWindowS: 15 * 60,
} as const;

const S = signInThrottle;

/** Seconds to wait after the n-th failure in a row: none for the free ones, then 1, 2, 4 … up to the ceiling. */
export const waitAfterFailure = (n: number) => (n <= S.freeFailures ? 0 : Math.min(2 ** (n - S.freeFailures - 1), S.maxWaitS));

interface Claim {
  account: string;
  address: string;
}

/** Take one attempt for (account, address), or throw 429 while it must wait. */
async function claimSignIn(email: string, address: string): Promise<Claim> {
  const claim = { account: accountKey(email), address };
  await db().transaction(async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[]) => db().query<T>(sql, { bind, type: QueryTypes.SELECT, transaction });
    const [stuffing] = await q<{ accounts: number; wait: number | null }>(
      `SELECT count(*)::int AS accounts, extract(epoch FROM min(updated_at) + make_interval(secs => $3) - now())::float8 AS wait
       FROM sign_in_throttle WHERE address = $1 AND account <> $2 AND failures > 0 AND updated_at > now() - make_interval(secs => $3)`,
      [address, claim.account, S.accountsWindowS],
    );
    if (stuffing.accounts >= S.accountsPerAddress) throw tooMany(stuffing.wait ?? S.accountsWindowS);
    await q(`INSERT INTO sign_in_throttle (account, address, failures, next_at) VALUES ($1, $2, 0, now()) ON CONFLICT DO NOTHING`, [claim.account, address]);
    const [row] = await q<{ failures: number; wait: number; stale: boolean }>(
      `SELECT failures, extract(epoch FROM next_at - now())::float8 AS wait, updated_at < now() - make_interval(secs => $3) AS stale
       FROM sign_in_throttle WHERE account = $1 AND address = $2 FOR UPDATE`,
      [claim.account, address, S.forgetAfterS],
    );
    const failures = row.stale ? 0 : row.failures;
    if (!row.stale && row.wait > 0) throw tooMany(row.wait);
    await q(`UPDATE sign_in_throttle SET failures = $3, next_at = now() + make_interval(secs => $4), updated_at = now() WHERE account = $1 AND address = $2`, [
      claim.account,
      address,
      failures + 1,
      waitAfterFailure(failures + 1),
    ]);
  });
  return claim;
}

/** A successful sign-in clears the (account, address) record. */
async function clearSignIn(claim: Claim): Promise<void> {
  await db().query('DELETE FROM sign_in_throttle WHERE account = $1 AND address = $2', { bind: [claim.account, claim.address] });
}

const signInGuard: RequestHandler = async (req, res, next) => {
  const email = emailOf(req);
  if (!email) return next();
  try {
    const claim = await claimSignIn(email, req.ip ?? '');
    res.on('finish', () => {
      if (res.statusCode < 400) clearSignIn(claim).catch((err) => req.log?.error({ err }, 'sign-in throttle not cleared'));
    });
    next();
  } catch (err) {
    next(err);
  }
};

// ---------------------------------------------------------------------------------------------
// Fixed windows (rate-limiter-flexible, PostgreSQL store).

interface WindowLimit {
  windowMs: number;
  limit: number;
}

const limiters = new WeakMap<Sequelize, Map<string, RateLimiterPostgres>>();

/** One limiter per name, on the database the models use now (tests start several servers). */
function limiterFor(name: string, w: WindowLimit): RateLimiterPostgres {
  const sequelize = db();
  if (!limiters.has(sequelize)) limiters.set(sequelize, new Map());
  const mine = limiters.get(sequelize)!;
  if (!mine.has(name)) {
    mine.set(
      name,
      new RateLimiterPostgres({
        storeClient: sequelize,
        storeType: 'sequelize',
        tableName: 'rate_limits',
        tableCreated: true,
        // Expired rows are pruned by server/services/prune.ts.
        clearExpiredByTimeout: false,
        keyPrefix: name,
        points: w.limit,
        duration: w.windowMs / 1000,
      }),
    );
  }
  return mine.get(name)!;
}

function window(opts: {
  name: string;
  limit: WindowLimit;
  /** What the count is kept per. */
  key: 'address' | 'account' | 'user';
  /** Count only answers of 400 and above (bad tokens, wrong current passwords). */
  failuresOnly?: boolean;
}): RequestHandler {
  const keyOf = (req: Request) =>
    opts.key === 'address' ? (req.ip ?? '') : opts.key === 'account' ? (emailOf(req) ? accountKey(emailOf(req)) : '') : (req.auth?.userId ?? '');
  return async (req, res, next) => {
    const key = keyOf(req);
    if (!key) return next();
    const limiter = limiterFor(opts.name, opts.limit);
    try {
      if (opts.failuresOnly) {
        const seen = await limiter.get(key);
        if (seen && seen.consumedPoints >= opts.limit.limit) throw tooMany(seen.msBeforeNext / 1000);
        res.on('finish', () => {
          if (res.statusCode >= 400) limiter.consume(key).catch(() => undefined);
        });
      } else {
        await limiter.consume(key);
      }
      next();
    } catch (err) {
      next(err instanceof RateLimiterRes ? tooMany(err.msBeforeNext / 1000) : err);
    }
  };
}

/**
 * At most `limit` requests of a person on their way at once (e.g. photo uploads, each buffered in
 * memory): a place is taken before the body is read and given back when the answer is sent or
 * the connection drops. A place held by an instance that died frees itself after `holdS`.
 */
export function inFlightPerPerson(name: string, limit: number, holdS: number, what: string): RequestHandler {
  return async (req, res, next) => {
    const key = req.auth?.userId;
    if (!key) return next();
    const limiter = limiterFor(name, { limit, windowMs: holdS * 1000 });
    try {
      await limiter.consume(key);
    } catch (err) {
      if (!(err instanceof RateLimiterRes)) return next(err);
      return next(new TooManyRequests(`you have ${limit} ${what} on their way already, the most at a time: the next one goes when one is in`, 5));
    }
    let given = false;
    const giveBack = () => {
      if (given) return;
      given = true;
      limiter.reward(key, 1).catch((err) => req.log?.error({ err }, `${name}: place not given back`));
    };
    res.on('finish', giveBack);
    res.on('close', giveBack);
    next();
  };
}

/** The limits, in one place (the README's security paragraph names them). */
export const throttleLimits = {
  resetPerAccount: { windowMs: 60 * MINUTE, limit: 3 },
  resetPerAddress: { windowMs: 60 * MINUTE, limit: 20 },
  signUpPerAccount: { windowMs: 60 * MINUTE, limit: 3 },
  signUpPerAddress: { windowMs: 60 * MINUTE, limit: 10 },
  tokenPerAddress: { windowMs: 15 * MINUTE, limit: 60 },
  changePasswordPerUser: { windowMs: 15 * MINUTE, limit: 10 },
} as const;

const L = throttleLimits;

export const throttle = {
  signIn: [signInGuard],
  /** Password reset requests: every request counts (each may send an e-mail). */
  passwordReset: [
    window({ name: 'reset-address', limit: L.resetPerAddress, key: 'address' }),
    window({ name: 'reset-account', limit: L.resetPerAccount, key: 'account' }),
  ],
  signUp: [
    window({ name: 'sign-up-address', limit: L.signUpPerAddress, key: 'address' }),
    window({ name: 'sign-up-account', limit: L.signUpPerAccount, key: 'account' }),
  ],
  /** Using an e-mailed link (reset, invitation, sign-up confirmation): failures per address. */
  token: [window({ name: 'token-address', limit: L.tokenPerAddress, key: 'address', failuresOnly: true })],
  /** Change password: wrong current passwords per signed-in person. */
  changePassword: [window({ name: 'change-password-user', limit: L.changePasswordPerUser, key: 'user', failuresOnly: true })],
};

/** Forget every count (tests). */
export async function resetThrottles(): Promise<void> {
  await db().query('DELETE FROM rate_limits; DELETE FROM sign_in_throttle');
}
