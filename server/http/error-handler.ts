import type { ErrorRequestHandler } from 'express';
import { AppError } from './errors';
import { isDatabaseUnavailable } from '../db';

/** The one JSON error handler: typed errors keep their status; anything else is a 500 with no details. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (err instanceof AppError) {
    res.status(err.status).json({ error: { code: err.code, message: err.message, fields: err.fields } });
    return;
  }
  // Errors raised by body parsers and multer carry an HTTP status of their own.
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status === 413 || err?.type === 'entity.too.large' || err?.code === 'LIMIT_FILE_SIZE') {
    res.status(413).json({ error: { code: 'too_large', message: 'request body is too large', fields: [] } });
    return;
  }
  if (status >= 400 && status < 500) {
    const message = err?.type === 'entity.parse.failed' ? 'request body is not valid JSON' : String(err?.message ?? 'bad request');
    res.status(status).json({ error: { code: 'bad_request', message, fields: [] } });
    return;
  }
  if (isDatabaseUnavailable(err)) {
    res.status(503).json({ error: { code: 'unavailable', message: 'the database cannot be reached right now; try again shortly', fields: [] } });
    return;
  }
  req.log?.error({ err }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'something went wrong on the server', fields: [] } });
};
