/**
 * Boot and seal check per side of the opening (docs/method.md §7).
 *
 * For every state (the rest state plus each given motion) and every outline point of a side, the boot
 * spans the 3D distance between its cab and body attachment lines:
 *   span = √((g + dx)² + dy² + dz²),  g = nominal fore-aft gap, (dx, dy, dz) from predictDisplacement;
 * dx opens or closes the gap, (dy, dz) is the in-plane shear. Per side: shortest and longest span,
 * extension ratio = longest / shortest, fore-aft gap range [g + min dx, g + max dx], largest shear.
 * Corner arcs count towards both sides they join.
 * Seal check: compression % = (free height − compressed height) / free height × 100 (seal makers'
 * guidance). A seal of free height H installed across the gap follows the fore-aft range when, at the
 * widest gap, it is still compressed at least the minimum and, at the narrowest, at most the maximum:
 *   gapMax ≤ H·(1 − min%/100) and gapMin ≥ H·(1 − max%/100),
 * so the free heights that work are [gapMax / (1 − min%/100), gapMin / (1 − max%/100)].
 * Defaults 25–50 % are common practice for solid EPDM (seal makers' guidance: target 25–40 %,
 * about 50 % ceiling); closed-cell sponge should stay below about 35 %.
 * Boots take axial, lateral (shear), angular and torsional motion; large shear is better taken by two
 * in series (expansion-joint makers' guidance) — the extension ratio is the figure to give the maker.
 * Complexity O(states × outline samples).
 */
import { FlexInputError, requireFinite, requireLength, requireMotion, requirePositiveLength } from './errors';
import { sampleOutline, validateOutline, type OpeningOutline, type OutlineSide, type StraightSide } from './perimeter';
import type { RigidMotion } from './types';
import { sealReason } from './seal-reason';

export interface SealSpec {
  freeHeightMm: number;
  /** Default 25 (%). */
  minCompressionPercent?: number;
  /** Default 50 (%). */
  maxCompressionPercent?: number;
}

export interface BootSpanInput {
  outline: OpeningOutline;
  /** Fore-aft gap between cab and body at rest, mm (> 0). */
  nominalGapMm: number;
  /** Motions to check (fitted per pose, or scaled to the design twist with scaleMotion); rest is always included. */
  motions: RigidMotion[];
  seal?: SealSpec;
  /** Outline sampling step, mm; default 10. */
  stepMm?: number;
}

export interface SealCheck {
  freeHeightMm: number;
  minCompressionPercent: number;
  maxCompressionPercent: number;
  compressionAtNominalPercent: number;
  /** At the widest gap (least compressed). */
  compressionAtWidestPercent: number;
  /** At the narrowest gap (most compressed). */
  compressionAtNarrowestPercent: number;
  follows: boolean;
  reason: string;
}

export interface SideSpan {
  side: StraightSide;
  shortestMm: number;
  longestMm: number;
  /** longest / shortest; null when the gap closes fully (shortest span 0). */
  extensionRatio: number | null;
  gapMinMm: number;
  gapMaxMm: number;
  /** The fore-aft gap closes to 0 or below somewhere on this side: cab and body touch. */
  contact: boolean;
  largestShearMm: number;
  /** Seal free heights that follow this side's fore-aft range at the compression limits; null if none. */
  sealFreeHeightRangeMm: { min: number; max: number } | null;
  seal: SealCheck | null;
}

export type BootSpanResult = Record<StraightSide, SideSpan>;

const FN = 'bootSpan';

const SIDES_OF: Record<OutlineSide, StraightSide[]> = {
  top: ['top'],
  bottom: ['bottom'],
  left: ['left'],
  right: ['right'],
  topLeft: ['top', 'left'],
  topRight: ['top', 'right'],
  bottomLeft: ['bottom', 'left'],
  bottomRight: ['bottom', 'right'],
};

/**
 * Compression of a seal as a percentage of its free height.
 * @param freeHeightMm the seal's uncompressed height (> 0). @param compressedHeightMm its height as installed.
 * @returns (free − compressed) / free × 100.
 * @example sealCompressionPercent(20, 15) // => 25
 */
export function sealCompressionPercent(freeHeightMm: number, compressedHeightMm: number): number {
  requirePositiveLength('sealCompressionPercent', 'freeHeightMm', freeHeightMm);
  requireLength('sealCompressionPercent', 'compressedHeightMm', compressedHeightMm);
  return ((freeHeightMm - compressedHeightMm) / freeHeightMm) * 100;
}

function checkSeal(seal: SealSpec, gapMin: number, gapMax: number, nominal: number): SealCheck {
  const minPct = seal.minCompressionPercent ?? 25;
  const maxPct = seal.maxCompressionPercent ?? 50;
  const compressionAtWidestPercent = sealCompressionPercent(seal.freeHeightMm, gapMax);
  const compressionAtNarrowestPercent = sealCompressionPercent(seal.freeHeightMm, gapMin);
  return {
    freeHeightMm: seal.freeHeightMm,
    minCompressionPercent: minPct,
    maxCompressionPercent: maxPct,
    compressionAtNominalPercent: sealCompressionPercent(seal.freeHeightMm, nominal),
    compressionAtWidestPercent,
    compressionAtNarrowestPercent,
    follows: gapMin > 0 && compressionAtWidestPercent >= minPct && compressionAtNarrowestPercent <= maxPct,
    reason: sealReason({ freeHeightMm: seal.freeHeightMm, minCompressionPercent: minPct, maxCompressionPercent: maxPct }, gapMin, gapMax),
  };
}

/**
 * Boot spans, gap range and seal check per side of the opening.
 * @param input the outline, the nominal fore-aft gap, the motions to cover and optionally a seal.
 * @returns per straight side: shortest and longest span, extension ratio, gap range, largest shear,
 *   the seal free heights that follow it and, with a seal, whether it does.
 * @example bootSpan({ outline: { width: 700, height: 900, cornerRadius: 80 }, nominalGapMm: 90,
 *   motions: [{ t: { x: 0, y: 40, z: 0 }, omega: { x: 0, y: 0, z: 0 } }] }).left.longestMm // => 98.49 (√(90² + 40²))
 */
export function bootSpan(input: BootSpanInput): BootSpanResult {
  if (input === null || typeof input !== 'object') throw new FlexInputError(FN, 'input', 'must be an object');
  validateOutline(FN, input.outline);
  const gap = requirePositiveLength(FN, 'nominalGapMm', input.nominalGapMm);
  if (!Array.isArray(input.motions)) throw new FlexInputError(FN, 'motions', 'must be an array');
  input.motions.forEach((motion, i) => requireMotion(FN, `motions[${i}]`, motion));
  if (input.seal !== undefined) {
    requirePositiveLength(FN, 'seal.freeHeightMm', input.seal.freeHeightMm);
    const minPct = requireFinite(FN, 'seal.minCompressionPercent', input.seal.minCompressionPercent ?? 25);
    const maxPct = requireFinite(FN, 'seal.maxCompressionPercent', input.seal.maxCompressionPercent ?? 50);
    if (minPct < 0 || maxPct >= 100 || minPct > maxPct) {
      throw new FlexInputError(FN, 'seal.minCompressionPercent', `and maxCompressionPercent must satisfy 0 ≤ min ≤ max < 100, got ${minPct}–${maxPct}`);
    }
  }
  const samples = sampleOutline(input.outline, input.stepMm ?? 10);
  const rest: RigidMotion = { t: { x: 0, y: 0, z: 0 }, omega: { x: 0, y: 0, z: 0 } };
  const states = [rest, ...input.motions];

  const acc = {} as Record<StraightSide, { shortest: number; longest: number; gapMin: number; gapMax: number; shear: number }>;
  for (const side of ['top', 'bottom', 'left', 'right'] as const) {
    acc[side] = { shortest: Infinity, longest: 0, gapMin: Infinity, gapMax: -Infinity, shear: 0 };
  }
  for (const motion of states) {
    for (const point of samples) {
      // predictDisplacement, inlined: the motions were checked above and this loop is the hot one.
      const { t, omega } = motion;
      const gapHere = gap + t.x + omega.y * point.z - omega.z * point.y;
      const shear = Math.hypot(t.y - omega.x * point.z, t.z + omega.x * point.y);
      const span = Math.hypot(gapHere, shear);
      for (const side of SIDES_OF[point.side]) {
        const a = acc[side];
        a.shortest = Math.min(a.shortest, span);
        a.longest = Math.max(a.longest, span);
        a.gapMin = Math.min(a.gapMin, gapHere);
        a.gapMax = Math.max(a.gapMax, gapHere);
        a.shear = Math.max(a.shear, shear);
      }
    }
  }

  const minPct = input.seal?.minCompressionPercent ?? 25;
  const maxPct = input.seal?.maxCompressionPercent ?? 50;
  const result = {} as BootSpanResult;
  for (const side of ['top', 'bottom', 'left', 'right'] as const) {
    const a = acc[side];
    const lowest = a.gapMax / (1 - minPct / 100);
    const highest = a.gapMin / (1 - maxPct / 100);
    result[side] = {
      side,
      shortestMm: a.shortest,
      longestMm: a.longest,
      extensionRatio: a.shortest > 0 ? a.longest / a.shortest : null,
      gapMinMm: a.gapMin,
      gapMaxMm: a.gapMax,
      contact: a.gapMin <= 0,
      largestShearMm: a.shear,
      sealFreeHeightRangeMm: a.gapMin > 0 && lowest <= highest ? { min: lowest, max: highest } : null,
      seal: input.seal !== undefined ? checkSeal(input.seal, a.gapMin, a.gapMax, gap) : null,
    };
  }
  return result;
}
