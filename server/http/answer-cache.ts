// The finished bytes of large answers (the review, the pull), kept per instance and per encoding,
// keyed by the validator their ETag is made of (http/validator.ts). The validator is read from
// PostgreSQL on every request, so after a write through any instance the key is new and the old
// bytes are never served again: the cache only saves building and compressing bytes that are
// known to be the same. Memory is bounded in bytes (lru-cache drops the least recently used);
// requests for a key being built wait for that one build instead of each building it again.
import zlib from 'node:zlib';
import { promisify } from 'node:util';
import { LRUCache } from 'lru-cache';
import Negotiator from 'negotiator';
import type { Request, Response } from 'express';
import { compactJsonBytes } from './compact-json';

export type AnswerEncoding = 'br' | 'gzip' | 'identity';

/** 64 MB unless configured (ANSWER_CACHE_MB): about 170 reviews of 370 kB, each with both compressed copies. */
export const DEFAULT_ANSWER_CACHE_BYTES = 64 * 1024 * 1024;

const brotli = promisify(zlib.brotliCompress);
const gzip = promisify(zlib.gzip);

// Compressed once per change, then sent many times: a little more effort than the compression
// middleware's per-answer quality 4 pays back on every slow phone link.
const compress: Record<Exclude<AnswerEncoding, 'identity'>, (b: Buffer) => Promise<Buffer>> = {
  br: (b) => brotli(b, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 5, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: b.length } }),
  gzip: (b) => gzip(b, { level: 6 }),
};

type Build = () => Promise<Buffer>;

function newCache(maxBytes: number) {
  return new LRUCache<string, Buffer, Build>({
    maxSize: maxBytes,
    sizeCalculation: (bytes, key) => bytes.length + key.length,
    fetchMethod: (_key, _stale, { context }) => context(),
  });
}

let cache: ReturnType<typeof newCache> | null = newCache(DEFAULT_ANSWER_CACHE_BYTES);

/** Sets the bound (at start-up; empties the cache); 0 keeps nothing: every answer is built. */
export function configureAnswerCache(maxBytes: number): void {
  cache = maxBytes > 0 ? newCache(maxBytes) : null;
}

/** What the cache holds now, for tests. */
export const answerCacheUse = () => ({ bytes: cache?.calculatedSize ?? 0, entries: cache?.size ?? 0, maxBytes: cache?.maxSize ?? 0 });

/**
 * The encoding to send: the one the client weighs highest of brotli and gzip (brotli when it
 * weighs both alike, as browsers do), else the bytes as they are.
 */
export function answerEncoding(req: Request): AnswerEncoding {
  const best = new Negotiator(req).encoding(['br', 'gzip', 'identity'], { preferred: ['br', 'gzip'] });
  return best === 'br' || best === 'gzip' ? best : 'identity';
}

/** The answer's bytes in `encoding`, from the cache or built once (and compressed once) for `key`. */
export async function cachedAnswer(key: string, encoding: AnswerEncoding, build: () => Promise<Buffer | string>): Promise<Buffer> {
  const kept = async (k: string, make: Build) => (cache ? (await cache.fetch(k, { context: make }))! : make());
  const plain = () =>
    kept(`${key} identity`, async () => {
      const built = await build();
      return typeof built === 'string' ? Buffer.from(built, 'utf8') : built;
    });
  if (encoding === 'identity') return plain();
  return kept(`${key} ${encoding}`, async () => compress[encoding](await plain()));
}

/**
 * Sends a JSON answer through the cache: `key` names exactly the state the answer shows (the
 * validator's parts and whose answer it is), `build` gives its JSON text on a miss, kept without
 * the whitespace between its tokens (compact-json.ts).
 */
export async function sendCachedJson(req: Request, res: Response, key: string, build: () => Promise<string>): Promise<void> {
  const encoding = answerEncoding(req);
  const bytes = await cachedAnswer(key, encoding, async () => compactJsonBytes(await build()));
  res.vary('Accept-Encoding');
  if (encoding !== 'identity') res.setHeader('Content-Encoding', encoding);
  res.type('application/json').send(bytes);
}
