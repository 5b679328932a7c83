// JSON bodies: parsed per route, only after the route's access check (route.ts), within a small
// limit everywhere but the routes that declare a larger one (sync push), and refused before
// JSON.parse when nested deeper than any record of ours, so nobody spends the server's CPU on a
// body they may not send.
import express, { type RequestHandler } from 'express';
import { AppError, Invalid } from './errors';

/** Every route's body limit unless it declares its own: a form, a review edit, an invitation. */
export const DEFAULT_BODY_LIMIT = 64 * 1024;
/** Deepest nesting any request of ours needs (a push: body → changes → change → record → opening). */
export const MAX_JSON_DEPTH = 32;

const OPEN_SQUARE = 0x5b;
const OPEN_CURLY = 0x7b;
const CLOSE_SQUARE = 0x5d;
const CLOSE_CURLY = 0x7d;
const QUOTE = 0x22;
const BACKSLASH = 0x5c;

/**
 * Whether raw JSON text nests arrays and objects deeper than `max` (brackets inside strings do not
 * count). A string is skipped whole with the native indexOf to its closing quote (one not escaped
 * by an odd run of backslashes), so only the bytes between strings are looked at one by one: a
 * push of 1,000 readings is mostly ids and field names.
 */
export function nestsDeeperThan(buf: Uint8Array, max: number): boolean {
  const bytes = Buffer.isBuffer(buf) ? buf : Buffer.from(buf.buffer, buf.byteOffset, buf.byteLength);
  let depth = 0;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b === QUOTE) {
      for (;;) {
        const end = bytes.indexOf(QUOTE, i + 1);
        // An unterminated string: JSON.parse refuses the body, and nothing after it can nest.
        if (end < 0) return false;
        let backslashes = 0;
        while (bytes[end - 1 - backslashes] === BACKSLASH) backslashes++;
        i = end;
        if (backslashes % 2 === 0) break;
      }
    } else if (b === OPEN_SQUARE || b === OPEN_CURLY) {
      if (++depth > max) return true;
    } else if (b === CLOSE_SQUARE || b === CLOSE_CURLY) depth--;
  }
  return false;
}

export const formatBytes = (n: number) => (n >= 1024 * 1024 ? `${n / 1024 / 1024} MB` : `${n / 1024} kB`);

export class BodyTooLarge extends AppError {
  constructor(limit: number) {
    super(413, 'too_large', `request body is larger than ${formatBytes(limit)}, the most this route takes`);
  }
}

export function jsonBody(limit = DEFAULT_BODY_LIMIT): RequestHandler {
  const parse = express.json({
    limit,
    verify: (_req, _res, buf) => {
      if (nestsDeeperThan(buf, MAX_JSON_DEPTH)) {
        throw new Invalid(`request body is nested deeper than ${MAX_JSON_DEPTH} levels`, [
          { field: 'body', message: `nested deeper than ${MAX_JSON_DEPTH} levels` },
        ]);
      }
    },
  });
  return (req, res, next) =>
    parse(req, res, (err?: unknown) => {
      if ((err as { type?: string } | undefined)?.type === 'entity.too.large') return next(new BodyTooLarge(limit));
      next(err);
    });
}
