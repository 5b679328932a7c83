import type { RequestHandler } from 'express';
import { Forbidden } from '../http/errors';

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * CSRF guard: every state-changing request must carry an Origin header naming this very host.
 * A missing or foreign Origin is refused with 403. (Written by hand: the well-known snippet
 * for this forgets to call next().)
 */
export const checkOrigin: RequestHandler = (req, _res, next) => {
  if (safeMethods.has(req.method)) return next();
  const origin = req.headers.origin;
  if (!origin) return next(new Forbidden('missing Origin header on a state-changing request'));
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    return next(new Forbidden('malformed Origin header'));
  }
  const host = req.headers['x-forwarded-host'] && req.app.get('trust proxy') ? String(req.headers['x-forwarded-host']) : req.headers.host;
  if (!host || originHost !== host) return next(new Forbidden('request from a foreign origin'));
  next();
};
