import type { ErrorRequestHandler } from 'express';
import { AppError, Unavailable } from './errors';

/** An answer with no field at fault, in the one error shape (shared/schemas/error.ts). */
const answer = (status: number, code: string, message: string) => new AppError(status, code, message).toAnswer();
import { databaseUnavailability, type Unavailability } from '../db';

const UNAVAILABLE_MESSAGES: Record<Unavailability, string> = {
  unreachable: 'the database cannot be reached just now; try again shortly',
  locked: 'the record is being changed by someone else just now; try again shortly',
  slow: 'the database took too long to answer; try again shortly',
  busy: 'the database is busy just now; try again shortly',
};

/** A database failure a retry may cure becomes a 503 with Retry-After, never a 500. */
function asUnavailable(err: unknown): Unavailable | null {
  const why = databaseUnavailability(err);
  return why ? new Unavailable(UNAVAILABLE_MESSAGES[why]) : null;
}

/** The one JSON error handler: typed errors keep their status; anything else is a 500 with no details. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const known = err instanceof AppError ? err : asUnavailable(err);
  if (known) {
    const retryAfterS = (known as { retryAfterS?: number }).retryAfterS;
    if (retryAfterS !== undefined) res.setHeader('Retry-After', String(Math.max(1, Math.ceil(retryAfterS))));
    if (!(err instanceof AppError)) req.log?.warn({ err }, 'database unavailable');
    res.status(known.status).json(known.toAnswer());
    return;
  }
  // Errors raised by body parsers and multer carry an HTTP status of their own.
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status === 413 || err?.type === 'entity.too.large' || err?.code === 'LIMIT_FILE_SIZE') {
    res.status(413).json(answer(413, 'too_large', 'request body is too large'));
    return;
  }
  if (status >= 400 && status < 500) {
    const message = err?.type === 'entity.parse.failed' ? 'request body is not valid JSON' : String(err?.message ?? 'bad request');
    res.status(status).json(answer(status, 'bad_request', message));
    return;
  }
  req.log?.error({ err }, 'unhandled error');
  res.status(500).json(answer(500, 'internal', 'something went wrong on the server'));
};
