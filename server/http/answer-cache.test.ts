import { afterEach, describe, expect, it } from 'vitest';
import zlib from 'node:zlib';
import { randomBytes } from 'node:crypto';
import { answerCacheUse, cachedAnswer, configureAnswerCache, DEFAULT_ANSWER_CACHE_BYTES } from './answer-cache';

/** JSON text of about `bytes` bytes that compresses about as a review does (repeated keys, varied numbers). */
function answerText(bytes: number, seed: string): string {
  const rows: string[] = [];
  let size = 0;
  for (let i = 0; size < bytes; i++) {
    const row = JSON.stringify({ id: `${seed}-${i}`, valueMm: (i * 7.3) % 91, note: randomBytes(4).toString('hex') });
    rows.push(row);
    size += row.length + 1;
  }
  return `[${rows.join(',')}]`;
}

afterEach(() => configureAnswerCache(DEFAULT_ANSWER_CACHE_BYTES));

describe('the answer cache', () => {
  it('stays under its bound in bytes however many answers pass through it', async () => {
    // Small enough to finish well inside the test's time on a loaded machine: a test that runs out
    // of time leaves its loop running into the next test's cache.
    const bound = 1024 * 1024;
    configureAnswerCache(bound);
    let peak = 0;
    for (let i = 0; i < 24; i++) {
      const text = answerText(100_000, `answer${i}`);
      for (const encoding of ['identity', 'br', 'gzip'] as const) {
        await cachedAnswer(`review team session ${i}`, encoding, async () => text);
        peak = Math.max(peak, answerCacheUse().bytes);
      }
    }
    // 24 answers of 100 kB (plus their compressed copies), over twice the bound, went through: the
    // cache kept only the latest that fit.
    expect(peak).toBeLessThanOrEqual(bound);
    expect(answerCacheUse().bytes).toBeGreaterThan(bound / 2);
    expect(answerCacheUse().entries).toBeLessThan(24 * 3);
  });

  it('builds an answer once for requests that ask for it at the same moment, and once for each encoding', async () => {
    const text = answerText(50_000, 'once');
    let builds = 0;
    const build = async () => {
      builds += 1;
      await new Promise((resolve) => setTimeout(resolve, 20));
      return text;
    };
    const answers = await Promise.all([
      ...Array.from({ length: 10 }, () => cachedAnswer('review t s 1', 'identity', build)),
      ...Array.from({ length: 10 }, () => cachedAnswer('review t s 1', 'br', build)),
      ...Array.from({ length: 10 }, () => cachedAnswer('review t s 1', 'gzip', build)),
    ]);
    expect(builds).toBe(1);
    expect(answerCacheUse().entries).toBe(3);
    expect(answers[0].toString('utf8')).toBe(text);
    expect(zlib.brotliDecompressSync(answers[10]).toString('utf8')).toBe(text);
    expect(zlib.gunzipSync(answers[20]).toString('utf8')).toBe(text);
    expect(answers[10].length).toBeLessThan(text.length / 2);
  });

  it('builds again for a new key, and keeps nothing of a build that failed', async () => {
    expect((await cachedAnswer('pull t p 0 2000 7 0', 'identity', async () => '{"cursor":7}')).toString()).toBe('{"cursor":7}');
    expect((await cachedAnswer('pull t p 0 2000 8 0', 'identity', async () => '{"cursor":8}')).toString()).toBe('{"cursor":8}');
    await expect(
      cachedAnswer('review t gone 1', 'br', async () => {
        throw new Error('session not found');
      }),
    ).rejects.toThrow('session not found');
    expect((await cachedAnswer('review t gone 1', 'identity', async () => '{"ok":true}')).toString()).toBe('{"ok":true}');
  });

  it('keeps nothing when configured with 0 bytes: every request builds', async () => {
    configureAnswerCache(0);
    let builds = 0;
    for (let i = 0; i < 3; i++) await cachedAnswer('review t s 1', 'br', async () => `{"n":${++builds}}`);
    expect(builds).toBe(3);
    expect(answerCacheUse()).toEqual({ bytes: 0, entries: 0, maxBytes: 0 });
  });
});
