// Counts in words, the same everywhere (screen, sheet, CSV, e-mail, server messages): "1 reading",
// "3 readings", never "1 readings" or "reading(s)".

/**
 * The noun that goes with a count.
 * @param count how many (any number; only exactly 1 takes the singular).
 * @param singular the noun for one, e.g. 'reading'.
 * @param pluralForm the noun for any other count; default singular + 's'.
 * @example nounFor(1, 'pose') // => 'pose' ; nounFor(0, 'pose') // => 'poses'
 */
export function nounFor(count: number, singular: string, pluralForm = `${singular}s`): string {
  return count === 1 ? singular : pluralForm;
}

/**
 * A count with its noun.
 * @example plural(1, 'record') // => '1 record' ; plural(2, 'unknown') // => '2 unknowns' ; plural(3, 'reading', 'readings') // => '3 readings'
 */
export function plural(count: number, singular: string, pluralForm = `${singular}s`): string {
  return `${count} ${nounFor(count, singular, pluralForm)}`;
}

/**
 * Items joined as a person lists them: `listInWords(['a', 'b', 'c']) // => 'a, b and c'`.
 * @param items the words, in order; an empty list gives ''.
 */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items[0] ?? '';
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
