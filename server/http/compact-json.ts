// PostgreSQL writes the JSON it builds (json_build_object, json_agg) with a space on each side of
// every colon, after every comma and a newline between the elements of an aggregate: about a tenth
// of the review's and the pull's bytes. The answers keep their meaning byte for byte but for that
// whitespace: it is dropped once, when an answer is built (answer-cache.ts), before it is kept,
// compressed or sent.

const QUOTE = 0x22;
const BACKSLASH = 0x5c;

/**
 * The UTF-8 bytes of the JSON text `json` without the whitespace between its tokens; strings
 * (with their escapes) are copied unchanged. Every byte of a multi-byte UTF-8 character is 0x80 or
 * above, so the ASCII bytes looked at here are always whole characters.
 */
export function compactJsonBytes(json: string): Buffer {
  const bytes = Buffer.from(json, 'utf8');
  let to = 0;
  let inString = false;
  for (let from = 0; from < bytes.length; from++) {
    const b = bytes[from];
    if (inString) {
      bytes[to++] = b;
      if (b === BACKSLASH) bytes[to++] = bytes[++from];
      else if (b === QUOTE) inString = false;
    } else if (b === QUOTE) {
      bytes[to++] = b;
      inString = true;
    } else if (b !== 0x20 && b !== 0x0a && b !== 0x0d && b !== 0x09) {
      bytes[to++] = b;
    }
  }
  return bytes.subarray(0, to);
}
