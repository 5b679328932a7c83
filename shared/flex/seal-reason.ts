/**
 * Whether a seal follows a side's fore-aft gap range, in words (docs/method.md §7).
 *
 * Compression % = (free height − gap) / free height × 100 (seal makers' guidance). A seal follows
 * the range when it is compressed at least the minimum at the widest gap and at most the maximum at
 * the narrowest. The words never print a negative compression: a seal no taller than the widest gap
 * does not touch both faces there, and that is what they say, with the free heights that would
 * follow: [widest / (1 − min %), narrowest / (1 − max %)].
 * Source: seal makers' guidance (compression formula); the 25–50 % range is common practice.
 */
import { MM_WORDS, type LengthWords } from './length-words';

export interface SealFacts {
  freeHeightMm: number;
  minCompressionPercent: number;
  maxCompressionPercent: number;
}

/**
 * @param seal the seal's free height and its allowed compression range (%).
 * @param gapMinMm the narrowest fore-aft gap of the side. @param gapMaxMm the widest.
 * @param words how lengths are written (default: mm).
 * @returns one sentence: why the seal does not follow, or that it does.
 * @example sealReason({ freeHeightMm: 56, minCompressionPercent: 25, maxCompressionPercent: 50 }, 30, 40)
 *   // => 'stays within 25–50 % compression over the fore-aft range (29 % at the widest gap, 46 % at the narrowest)'
 */
export function sealReason(seal: SealFacts, gapMinMm: number, gapMaxMm: number, words: LengthWords = MM_WORDS): string {
  const { freeHeightMm: free, minCompressionPercent: minPct, maxCompressionPercent: maxPct } = seal;
  const L = words.length;
  if (gapMinMm <= 0) return `the gap closes fully (down to ${L(gapMinMm)}): cab and body touch, and no seal can follow that`;
  const lowest = gapMaxMm / (1 - minPct / 100);
  const highest = gapMinMm / (1 - maxPct / 100);
  const follows =
    lowest <= highest ? `choose a free height of ${L(lowest)} to ${L(highest)}` : `no free height follows this range at ${minPct}–${maxPct} % compression`;
  if (free <= gapMaxMm) {
    return `the seal (free height ${L(free)}) is shorter than the gap it must fill (${L(gapMinMm)} to ${L(gapMaxMm)}): it does not touch both faces; ${follows}`;
  }
  const atWidest = ((free - gapMaxMm) / free) * 100;
  const atNarrowest = ((free - gapMinMm) / free) * 100;
  const problems: string[] = [];
  if (atWidest < minPct)
    problems.push(`at the widest gap (${L(gapMaxMm)}) it is compressed only ${atWidest.toFixed(0)} %, less than the ${minPct} % it needs to seal`);
  if (atNarrowest > maxPct)
    problems.push(`at the narrowest gap (${L(gapMinMm)}) it is compressed ${atNarrowest.toFixed(0)} %, more than the ${maxPct} % it takes without damage`);
  if (problems.length > 0) return `${problems.join('; ')}; ${follows}`;
  return `stays within ${minPct}–${maxPct} % compression over the fore-aft range (${atWidest.toFixed(0)} % at the widest gap, ${atNarrowest.toFixed(0)} % at the narrowest)`;
}
