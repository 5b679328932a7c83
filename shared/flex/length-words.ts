/**
 * How the computation's sentences write lengths. The computation works in mm and its stored
 * reasons and remarks are written in mm; the desk, the sheet and the CSV write the same sentences
 * again from the same numbers in the reader's unit (shared/format.ts `lengthWords`), so a person
 * who reads inches never meets a sentence in mm.
 */
export interface LengthWords {
  /** A length as shown beside the envelope: `185.0 mm`. */
  length: (mm: number) => string;
  /** A small length read more finely (a scatter, a reading resolution): `0.52 mm`. */
  fine: (mm: number) => string;
  /** A fabrication increment as chosen: `5 mm`, `1/4 in`. */
  increment: (mm: number) => string;
}

/**
 * The computation's own words, in mm: 1 decimal for lengths, 2 for fine ones, increments as given.
 * @example MM_WORDS.length(185) // => '185.0 mm' ; MM_WORDS.increment(5) // => '5 mm'
 */
export const MM_WORDS: LengthWords = {
  length: (mm) => `${mm.toFixed(1)} mm`,
  fine: (mm) => `${mm.toFixed(2)} mm`,
  increment: (mm) => `${Number(mm.toFixed(3))} mm`,
};
