// The envelope form's text state and its conversion to parameters: lengths typed in the person's
// unit, fractions typed in percent, and every refusal said in those words.
import { envelopeParams, type EnvelopeParams, type Fastening, type PassThroughDesign } from '@shared/schemas/envelope';
import type { UnitSystem } from '@shared/schemas/common';
import { fromDisplay, toDisplay } from '@shared/units';

/** The form's text state: what the engineer typed, in the display unit and in percent. */
export interface ParamsFormState {
  designTwistDeg: string;
  method: 'prediction' | 'tolerance';
  confidencePct: string;
  coveragePct: string;
  marginPct: string;
  allowance: string;
  increment: string;
  throughOrigin: boolean;
  repeatBandDeg: string;
  sealOn: boolean;
  sealFreeHeight: string;
  sealMinPct: string;
  sealMaxPct: string;
  design: DesignFormState;
}

/** The pass-through design as typed: lengths in the display unit, slack in percent. */
export interface DesignFormState {
  option: PassThroughDesign['option'];
  driverSide: PassThroughDesign['driverSide'];
  minClearWidth: string;
  minClearHeight: string;
  overlapMargin: string;
  slackPct: string;
  seamAllowance: string;
  flangeWidth: string;
  foldDepth: string;
  fastening: Fastening;
  material: string;
  drain: string;
  fabricTolerance: string;
  frameTolerance: string;
}

/** Design fields typed as lengths (display unit ↔ mm). */
export const DESIGN_LENGTHS = [
  ['minClearWidth', 'minClearWidthMm'],
  ['minClearHeight', 'minClearHeightMm'],
  ['overlapMargin', 'overlapMarginMm'],
  ['seamAllowance', 'seamAllowanceMm'],
  ['flangeWidth', 'flangeWidthMm'],
  ['foldDepth', 'foldDepthMm'],
  ['fabricTolerance', 'fabricToleranceMm'],
  ['frameTolerance', 'frameToleranceMm'],
] as const;
export type DesignLength = (typeof DESIGN_LENGTHS)[number][0];

// Enough digits that a value round-trips (6.35 mm = 0.25 in), without float noise.
const show = (value: number) => String(Number(value.toFixed(4)));

export function toFormState(p: EnvelopeParams, unit: UnitSystem): ParamsFormState {
  return {
    designTwistDeg: show(p.designTwistDeg),
    method: p.method,
    confidencePct: show(p.confidence * 100),
    coveragePct: show(p.coverage * 100),
    marginPct: show(p.margin * 100),
    allowance: show(toDisplay(p.allowanceMm, unit)),
    increment: show(toDisplay(p.incrementMm, unit)),
    throughOrigin: p.throughOrigin,
    repeatBandDeg: show(p.repeatBandDeg),
    sealOn: p.seal !== null,
    sealFreeHeight: p.seal ? show(toDisplay(p.seal.freeHeightMm, unit)) : '',
    sealMinPct: show(p.seal?.minCompressionPercent ?? 25),
    sealMaxPct: show(p.seal?.maxCompressionPercent ?? 50),
    design: {
      option: p.design.option,
      driverSide: p.design.driverSide,
      ...(Object.fromEntries(DESIGN_LENGTHS.map(([field, key]) => [field, show(toDisplay(p.design[key], unit))])) as Record<
        (typeof DESIGN_LENGTHS)[number][0],
        string
      >),
      slackPct: show(p.design.slackPercent),
      fastening: p.design.fastening,
      material: p.design.material,
      drain: p.design.drain,
    },
  };
}

const FIELD_LABELS: Record<string, string> = {
  designTwistDeg: 'Design twist',
  confidence: 'Confidence',
  coverage: 'Coverage',
  margin: 'Margin',
  allowanceMm: 'Allowance',
  incrementMm: 'Fabrication increment',
  repeatBandDeg: 'Repeat band',
  'seal.freeHeightMm': 'Seal free height',
  'seal.minCompressionPercent': 'Least compression',
  'seal.maxCompressionPercent': 'Most compression',
  'design.minClearWidthMm': 'Least clear width',
  'design.minClearHeightMm': 'Least clear height',
  'design.overlapMarginMm': 'Overlap margin',
  'design.slackPercent': 'Boot slack',
  'design.seamAllowanceMm': 'Seam allowance',
  'design.flangeWidthMm': 'Flange width',
  'design.foldDepthMm': 'Fold depth',
  'design.material': 'Material',
  'design.drain': 'Drain',
  'design.fabricToleranceMm': 'Fabric tolerance',
  'design.frameToleranceMm': 'Frame tolerance',
};

/** Fields kept as fractions but typed in percent: their limits are said in percent. */
const FRACTION_FIELDS = new Set(['confidence', 'coverage', 'margin']);
const PERCENT_FIELDS = new Set(['seal.minCompressionPercent', 'seal.maxCompressionPercent', 'design.slackPercent']);

/** A field's allowed range in the words and unit the engineer typed it in: "Margin must be between 0 and 200 %". */
function rangeWords(path: string, label: string, unit: UnitSystem, issue: { code: string; minimum?: unknown; maximum?: unknown }): string | null {
  if (issue.code !== 'too_small' && issue.code !== 'too_big') return null;
  const range = RANGES[path];
  if (!range) return null;
  const [lo, hi] = range;
  if (FRACTION_FIELDS.has(path)) return `${label} must be between ${show(lo * 100)} and ${show(hi * 100)} %`;
  if (PERCENT_FIELDS.has(path)) return `${label} must be between ${show(lo)} and ${show(hi)} %`;
  if (path.endsWith('Deg')) return `${label} must be between ${show(lo)} and ${show(hi)}°`;
  return `${label} must be between ${show(toDisplay(lo, unit))} and ${show(toDisplay(hi, unit))} ${unit}`;
}

/** The limits of each numeric field, read from the one schema (never retyped). */
const RANGES: Record<string, [number, number]> = (() => {
  const out: Record<string, [number, number]> = {};
  const walk = (shape: Record<string, unknown>, prefix: string) => {
    for (const [key, schema] of Object.entries(shape)) {
      const inner = unwrap(schema);
      const bag = inner as { minValue?: number | null; maxValue?: number | null; shape?: Record<string, unknown> };
      if (bag.shape) walk(bag.shape, `${prefix}${key}.`);
      else if (typeof bag.minValue === 'number' && typeof bag.maxValue === 'number') out[`${prefix}${key}`] = [bag.minValue, bag.maxValue];
    }
  };
  walk(envelopeParams.shape, '');
  return out;
})();

function unwrap(schema: unknown): unknown {
  let s = schema as { unwrap?: () => unknown; def?: { innerType?: unknown; in?: unknown } };
  for (let i = 0; i < 5; i++) {
    const next = s.def?.innerType ?? (typeof s.unwrap === 'function' && !('shape' in s) ? s.unwrap() : undefined);
    if (!next) break;
    s = next as typeof s;
  }
  return s;
}

/** The typed form as parameters in mm and fractions, or the problems that name each field. */
export function fromFormState(f: ParamsFormState, unit: UnitSystem): { params: EnvelopeParams | null; problems: string[] } {
  const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));
  const candidate = {
    designTwistDeg: num(f.designTwistDeg),
    method: f.method,
    confidence: num(f.confidencePct) / 100,
    coverage: num(f.coveragePct) / 100,
    margin: num(f.marginPct) / 100,
    allowanceMm: fromDisplay(num(f.allowance), unit),
    incrementMm: fromDisplay(num(f.increment), unit),
    throughOrigin: f.throughOrigin,
    repeatBandDeg: num(f.repeatBandDeg),
    seal: f.sealOn
      ? { freeHeightMm: fromDisplay(num(f.sealFreeHeight), unit), minCompressionPercent: num(f.sealMinPct), maxCompressionPercent: num(f.sealMaxPct) }
      : null,
    design: {
      option: f.design.option,
      driverSide: f.design.driverSide,
      ...Object.fromEntries(DESIGN_LENGTHS.map(([field, key]) => [key, fromDisplay(num(f.design[field]), unit)])),
      slackPercent: num(f.design.slackPct),
      fastening: f.design.fastening,
      material: f.design.material,
      drain: f.design.drain,
    },
  };
  const parsed = envelopeParams.safeParse(candidate);
  if (parsed.success) return { params: parsed.data, problems: [] };
  return {
    params: null,
    problems: parsed.error.issues.map((i) => {
      const path = i.path.join('.');
      const label = FIELD_LABELS[path] ?? path;
      const typed = i.path.reduce<unknown>((at, key) => (at as Record<PropertyKey, unknown> | undefined)?.[key], candidate);
      if (typeof typed === 'number' && Number.isNaN(typed)) return `${label}: enter a number`;
      return rangeWords(path, label, unit, i) ?? `${label}: ${i.message}`;
    }),
  };
}
