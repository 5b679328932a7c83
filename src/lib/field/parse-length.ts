// What a tester types for a length, read as the trade writes it, or refused with a reason that
// names what was wrong. Nothing is guessed: "9o" is not 9, "3800abc" is not 3800, "3 5/8" is not 3.
//
// Accepted, in the field's unit:
//   decimals with a point or a comma: 12, 12.5, 12,5, .5 ;
//   a sign in front: -12, +12, −12 (the typographic minus some keyboards give) ;
//   in inches only, fractions as on a tape measure: 5/8, 3 5/8, 3-5/8, 3½, and a unit mark after
//   the number (12 in, 12", 12 mm in mm) when it names the field's unit.
// The value must lie within the field's limits (in millimetres, the stored unit).
import type { UnitSystem } from '@shared/schemas';
import { fromDisplay, toDisplay } from '@shared/units';

export type LengthParse =
  | { kind: 'empty' }
  | { kind: 'value'; mm: number }
  /** `unfinished`: the text can still become a length by typing on (a sign, "3 5/"), so say it gently. */
  | { kind: 'refused'; reason: string; unfinished: boolean };

export interface LengthLimits {
  minMm: number;
  maxMm: number;
}

const VULGAR: Record<string, string> = { '½': '1/2', '¼': '1/4', '¾': '3/4', '⅛': '1/8', '⅜': '3/8', '⅝': '5/8', '⅞': '7/8' };
const SIGN = '[-+\u2212]';
const DECIMAL = /^(\d+(?:[.,]\d*)?|[.,]\d+)$/;
const FRACTION = /^(?:(\d+)(?:\s+|\s*-\s*))?(\d+)\s*\/\s*(\d+)$/;
// Prefixes of a fraction that a tester is still typing (inches only; in mm they are refused).
const UNFINISHED_INCH = [/^\d+\s*-$/, /^\d+(?:\s+|\s*-\s*)\d+$/, /^(?:\d+(?:\s+|\s*-\s*))?\d+\s*\/$/];

const UNIT_NAME: Record<UnitSystem, string> = { mm: 'millimetres', in: 'inches' };

const refuse = (reason: string, unfinished = false): LengthParse => ({ kind: 'refused', reason, unfinished });

/** A length in the display unit, trimmed of needless zeros: 12.5, 3.625. */
export const showLength = (mm: number, unit: UnitSystem) => String(Number(toDisplay(mm, unit).toFixed(unit === 'in' ? 3 : 1)));

/**
 * Reads `text` as a length in `unit` and returns it in millimetres, or why it is refused.
 * `parseLength('3 5/8', 'in') // => { kind: 'value', mm: 92.075 }`
 */
export function parseLength(text: string, unit: UnitSystem, limits: LengthLimits): LengthParse {
  const typed = text.trim();
  if (typed === '') return { kind: 'empty' };
  let body = typed.replace(/[½¼¾⅛⅜⅝⅞]/g, (c) => ` ${VULGAR[c]}`).trim();

  let negative = false;
  const sign = new RegExp(`^${SIGN}\\s*`).exec(body);
  if (sign) {
    negative = sign[0].trim() !== '+';
    body = body.slice(sign[0].length);
  }

  const mark = /\s*(mm|in|"|″)$/i.exec(body);
  if (mark && body.length > mark[0].length) {
    const said: UnitSystem = mark[1].toLowerCase() === 'mm' ? 'mm' : 'in';
    if (said !== unit)
      return refuse(`“${typed}” is in ${UNIT_NAME[said]}; this field is in ${UNIT_NAME[unit]}. Switch the unit, or type the value in ${unit}.`);
    body = body.slice(0, -mark[0].length);
  }

  if (body === '' || /^[.,]$/.test(body)) return refuse(`“${typed}” is not finished: type the number.`, true);
  if (unit === 'in' && UNFINISHED_INCH.some((r) => r.test(body))) return refuse(`“${typed}” is not finished: a fraction is written 3 5/8.`, true);

  let value: number;
  if (DECIMAL.test(body)) {
    value = Number(body.replace(',', '.'));
  } else if (FRACTION.test(body)) {
    if (unit === 'mm') return refuse(`“${typed}” is a fraction: fractions are inch readings. Switch the unit to in, or type mm as a decimal.`);
    const [, whole, num, den] = FRACTION.exec(body)!;
    if (Number(den) === 0) return refuse(`“${typed}”: a fraction needs a number above 0 below the line.`);
    if (whole !== undefined && Number(num) >= Number(den)) return refuse(`“${typed}”: the fraction after the whole inches must be less than 1 (e.g. 3 5/8).`);
    value = Number(whole ?? 0) + Number(num) / Number(den);
  } else {
    return refuse(whyNotALength(typed, body));
  }

  const mm = fromDisplay(negative ? -value : value, unit);
  if (!Number.isFinite(mm) || mm > limits.maxMm)
    return refuse(`Too large: ${typed} ${unit} is more than the ${showLength(limits.maxMm, unit)} ${unit} this field takes.`);
  if (mm < limits.minMm) {
    return refuse(
      limits.minMm === 0 && mm < 0
        ? `“${typed}”: this length cannot be negative.`
        : `Too small: ${typed} ${unit} is less than the ${showLength(limits.minMm, unit)} ${unit} this field takes.`,
    );
  }
  // Inches times 25.4 leave binary noise (3 in → 76.19999999999999 mm): a micrometre is far below
  // any tape's resolution, so round there and store the value a person would write.
  const clean = Math.round(mm * 1e6) / 1e6;
  return { kind: 'value', mm: clean === 0 ? 0 : clean };
}

function whyNotALength(typed: string, body: string): string {
  const letter = /\p{L}/u.exec(body);
  if (letter) return `Not a length: “${typed}” has the letter “${letter[0]}”.`;
  if (/[.,].*[.,]/.test(body)) return `Not a length: “${typed}” has more than one decimal mark.`;
  if (/\d\s+\d/.test(body)) return `Not a length: “${typed}” is two numbers.`;
  const odd = /[^\d.,\s/-]/u.exec(body);
  if (odd) return `Not a length: “${typed}” has “${odd[0]}” in it.`;
  return `Not a length: “${typed}”.`;
}

/** The ± key: puts a minus in front of the text, or takes it away. `toggleSign('12') // => '-12'` */
export function toggleSign(text: string): string {
  const t = text.trimStart();
  return new RegExp(`^${SIGN}`).test(t) ? t.slice(1).trimStart() : `-${t}`;
}

export type AngleParse = { kind: 'empty' } | { kind: 'value'; deg: number } | { kind: 'refused'; reason: string };

/**
 * A ramp angle in degrees, as typed: a decimal with a point or a comma, an optional ° after it,
 * above 0° and below 90°. `parseAngle('20°') // => { kind: 'value', deg: 20 }`
 */
export function parseAngle(text: string): AngleParse {
  const typed = text.trim();
  if (typed === '') return { kind: 'empty' };
  const body = typed.replace(/\s*°$/, '');
  if (!DECIMAL.test(body)) return { kind: 'refused', reason: whyNotALength(typed, body).replace('a length', 'an angle') };
  const deg = Number(body.replace(',', '.'));
  if (!(deg > 0 && deg < 90)) return { kind: 'refused', reason: `A ramp angle is above 0° and below 90°, not ${typed}.` };
  return { kind: 'value', deg };
}
