/**
 * The ways to close the pass-through, side by side for one opening and one signed envelope
 * (docs/method.md §7, "Pass-through design options"): overlapping rigid frames with compressible seals, a flexible boot on hard
 * frames, or both (a primary bulb seal on the frames and a fabric boot inside them).
 *
 * Opening W × H with corner radius r; nominal fore-aft gap g; envelope: the gap opens by O and
 * closes by C, lateral ±L, vertical ±V (each already with the envelope's margin, allowance and
 * rounding). The envelope is the worst of the whole perimeter, so every side is given it.
 *
 * Frames. The cab frame keeps the opening; the body frame's flange reaches inwards so the cab
 * frame's seal line never leaves it: each frame overlaps the other by the movement plus the overlap
 * margin m on every side, L + m left and right, V + m top and bottom. The body frame's inner edge
 * is the clear opening:  w = W − 2(L + m),  h = H − 2(V + m),  lost = 1 − w·h / (W·H).
 * The seal bridges the fore-aft gap, from g − C to g + O; compression % = (free − gap) / free × 100
 * (seal makers' guidance); the free heights that follow are [(g + O)/(1 − min%), (g − C)/(1 − max%)].
 *
 * Boot. Each edge of a side panel moves with its frame, so its span runs from the shortest state
 * (gap closed by C, no shear) to the longest (gap opened by O with both shears at once):
 *   shortest = g − C,  longest = √((g + O)² + L² + V²),  extension ratio = longest / shortest.
 * Flat length of a panel across the gap = longest × (1 + slack) + 2 × attachment allowance (the
 * flange each edge fastens to). Its width along the side = the straight side + a quarter of each
 * corner arc's circle at both ends (πr/2 in all) + 2 × seam allowance. The fabric beyond the
 * shortest span folds away: folds = ⌈(longest × (1 + slack) − shortest) / (2 × fold depth)⌉, since
 * one fold of depth p takes up 2p. A person crawls through the overlap of the two frames' openings
 * at the worst offset: w = W − L, h = H − V.
 *
 * Both. The frames as above, the boot fastened inside them on the clear opening of both frames
 * (the cab frame carries a matching inner lip): spans as for the boot, panel widths along the clear
 * opening (corner radius r − the larger overlap, not below 0), and the clear passage is the clear
 * opening less the worst offset: w = W − 2(L + m) − L, h = H − 2(V + m) − V.
 * Areas are of the width × height rectangle (corners not subtracted), so the % lost is simple to
 * check by hand and slightly conservative for rounded openings.
 * Sources: seal compression formula and ranges (seal makers' guidance); slack, seam, attachment and
 * fold allowances, overlap margin and the minimum clear opening are common practice, set by the
 * engineer; boots take shear and axial motion, torsion is avoided (expansion-joint makers' guidance).
 */
import { FlexInputError, requireLength, requireNonNegative, requirePositiveLength } from './errors';
import type { StraightSide } from './perimeter';

export type PassThroughOption = 'frames' | 'boot' | 'both';
export const PASS_THROUGH_OPTIONS: readonly PassThroughOption[] = ['frames', 'boot', 'both'];
const SIDES: readonly StraightSide[] = ['top', 'bottom', 'left', 'right'];

/** The envelope's design movement, mm, each ≥ 0 (closing as a size, not a signed value). */
export interface DesignMovement {
  foreAftOpeningMm: number;
  foreAftClosingMm: number;
  lateralMm: number;
  verticalMm: number;
}

/** The allowances the engineer sets (defaults: DEFAULT_PASS_THROUGH_ALLOWANCES, common practice). */
export interface PassThroughAllowances {
  /** The smallest clear opening a person must still crawl through, mm. */
  minClearWidthMm: number;
  minClearHeightMm: number;
  /** Overlap of the frames beyond the movement, mm, every side. */
  overlapMarginMm: number;
  /** Extra boot length beyond the longest span, percent. */
  slackPercent: number;
  /** Sewn into each side of a panel where it meets the next, mm. */
  seamAllowanceMm: number;
  /** The flange each boot edge fastens to, mm: added to both edges of a panel. */
  flangeWidthMm: number;
  /** Depth of one fold (pleat) of the boot, mm. */
  foldDepthMm: number;
}

/** Common practice starting values (not from a standard): the engineer changes them. */
export const DEFAULT_PASS_THROUGH_ALLOWANCES: PassThroughAllowances = {
  minClearWidthMm: 450,
  minClearHeightMm: 500,
  overlapMarginMm: 10,
  slackPercent: 10,
  seamAllowanceMm: 15,
  flangeWidthMm: 40,
  foldDepthMm: 25,
};

export interface PassThroughInput {
  opening: { widthMm: number; heightMm: number; cornerRadiusMm: number };
  nominalGapMm: number;
  movement: DesignMovement;
  allowances: PassThroughAllowances;
  /** The seal on the frames; without one the free heights that follow are given. */
  seal: { freeHeightMm: number; minCompressionPercent: number; maxCompressionPercent: number } | null;
}

export interface ClearOpening {
  widthMm: number;
  heightMm: number;
  /** Share of the opening's width × height no longer clear, percent. */
  lostPercent: number;
  /** How far below the minimum, mm; 0 where it meets it. */
  shortOfWidthMm: number;
  shortOfHeightMm: number;
  meetsMinimum: boolean;
}

export interface FrameSeal {
  freeHeightMm: number;
  minCompressionPercent: number;
  maxCompressionPercent: number;
  /** At the widest gap (least compressed) and at the narrowest (most). */
  compressionAtWidestPercent: number;
  compressionAtNarrowestPercent: number;
  follows: boolean;
}

export interface FramesOption {
  option: 'frames';
  /** How far each frame overlaps the other, per side, mm. */
  overlapMm: Record<StraightSide, number>;
  clear: ClearOpening;
  gapMinMm: number;
  gapMaxMm: number;
  /** Free heights that follow the gap range at the seal's compression limits; null if none. */
  sealFreeHeightRangeMm: { min: number; max: number } | null;
  seal: FrameSeal | null;
}

export interface BootPanel {
  side: StraightSide;
  shortestSpanMm: number;
  longestSpanMm: number;
  /** null when the gap closes fully (shortest span 0). */
  extensionRatio: number | null;
  /** The edge the panel is fastened along (straight side + its share of the corners), mm. */
  edgeLengthMm: number;
  /** Cut size: across the gap (with slack and both flanges) × along the side (with both seams). */
  flatLengthMm: number;
  flatWidthMm: number;
  /** Fabric to fold away at the shortest span, mm, and the folds of foldDepthMm it takes. */
  foldUpMm: number;
  folds: number;
}

export interface BootOption {
  option: 'boot' | 'both';
  panels: Record<StraightSide, BootPanel>;
  clear: ClearOpening;
  /** The gap closes to 0 or less: cab and body touch, and no boot bridges that. */
  contact: boolean;
}

export interface PassThroughResult {
  frames: FramesOption;
  boot: BootOption;
  /** Frames with a seal, and the boot inside them. */
  both: { frames: FramesOption; boot: BootOption };
}

const FN = 'passThroughOptions';

function clearOpening(widthMm: number, heightMm: number, openingArea: number, a: PassThroughAllowances): ClearOpening {
  const w = Math.max(0, widthMm);
  const h = Math.max(0, heightMm);
  const shortOfWidthMm = Math.max(0, a.minClearWidthMm - w);
  const shortOfHeightMm = Math.max(0, a.minClearHeightMm - h);
  return {
    widthMm: w,
    heightMm: h,
    lostPercent: (1 - (w * h) / openingArea) * 100,
    shortOfWidthMm,
    shortOfHeightMm,
    meetsMinimum: shortOfWidthMm === 0 && shortOfHeightMm === 0,
  };
}

/**
 * A seal's free height to start from: the middle of the heights that follow, to the nearest 5 mm
 * when that still follows; null when no height follows.
 * @example startingSealFreeHeight({ min: 133.33, max: 140 }) // => 135
 */
export function startingSealFreeHeight(range: { min: number; max: number } | null): number | null {
  if (range === null) return null;
  const middle = (range.min + range.max) / 2;
  const rounded = Math.round(middle / 5) * 5;
  return rounded >= range.min && rounded <= range.max ? rounded : Math.round(middle * 10) / 10;
}

/** The free heights that follow [gapMin, gapMax] at the compression limits, or null. */
export function sealFollowRange(gapMinMm: number, gapMaxMm: number, minPercent: number, maxPercent: number): { min: number; max: number } | null {
  const min = gapMaxMm / (1 - minPercent / 100);
  const max = gapMinMm / (1 - maxPercent / 100);
  return gapMinMm > 0 && min <= max ? { min, max } : null;
}

function framesOption(input: PassThroughInput, openingArea: number): FramesOption {
  const { opening, nominalGapMm: g, movement: mv, allowances: a, seal } = input;
  const sideways = mv.lateralMm + a.overlapMarginMm;
  const upDown = mv.verticalMm + a.overlapMarginMm;
  const gapMinMm = g - mv.foreAftClosingMm;
  const gapMaxMm = g + mv.foreAftOpeningMm;
  const limits = seal ?? { minCompressionPercent: 25, maxCompressionPercent: 50 };
  const compression = (free: number, gapMm: number) => ((free - gapMm) / free) * 100;
  return {
    option: 'frames',
    overlapMm: { top: upDown, bottom: upDown, left: sideways, right: sideways },
    clear: clearOpening(opening.widthMm - 2 * sideways, opening.heightMm - 2 * upDown, openingArea, a),
    gapMinMm,
    gapMaxMm,
    sealFreeHeightRangeMm: sealFollowRange(gapMinMm, gapMaxMm, limits.minCompressionPercent, limits.maxCompressionPercent),
    seal:
      seal === null
        ? null
        : {
            ...seal,
            compressionAtWidestPercent: compression(seal.freeHeightMm, gapMaxMm),
            compressionAtNarrowestPercent: compression(seal.freeHeightMm, gapMinMm),
            follows:
              gapMinMm > 0 &&
              compression(seal.freeHeightMm, gapMaxMm) >= seal.minCompressionPercent &&
              compression(seal.freeHeightMm, gapMinMm) <= seal.maxCompressionPercent,
          },
  };
}

function bootOption(
  option: 'boot' | 'both',
  input: PassThroughInput,
  outline: { widthMm: number; heightMm: number; cornerRadiusMm: number },
  clear: { widthMm: number; heightMm: number },
  openingArea: number,
): BootOption {
  const { nominalGapMm: g, movement: mv, allowances: a } = input;
  const shortest = Math.max(0, g - mv.foreAftClosingMm);
  const longest = Math.hypot(g + mv.foreAftOpeningMm, mv.lateralMm, mv.verticalMm);
  const fabric = longest * (1 + a.slackPercent / 100);
  const foldUpMm = fabric - shortest;
  const r = outline.cornerRadiusMm;
  const cornerShare = (Math.PI * r) / 2;
  const panels = {} as Record<StraightSide, BootPanel>;
  for (const side of SIDES) {
    const straight = side === 'top' || side === 'bottom' ? outline.widthMm - 2 * r : outline.heightMm - 2 * r;
    const edgeLengthMm = straight + cornerShare;
    panels[side] = {
      side,
      shortestSpanMm: shortest,
      longestSpanMm: longest,
      extensionRatio: shortest > 0 ? longest / shortest : null,
      edgeLengthMm,
      flatLengthMm: fabric + 2 * a.flangeWidthMm,
      flatWidthMm: edgeLengthMm + 2 * a.seamAllowanceMm,
      foldUpMm,
      folds: Math.max(0, Math.ceil(foldUpMm / (2 * a.foldDepthMm) - 1e-9)),
    };
  }
  return {
    option,
    panels,
    clear: clearOpening(clear.widthMm - mv.lateralMm, clear.heightMm - mv.verticalMm, openingArea, a),
    contact: shortest <= 0,
  };
}

/**
 * @param input the opening, the nominal gap, the envelope's movement, the allowances and the seal.
 * @returns each option's figures: overlap, clear opening and seal for frames; spans, extension
 *   ratios and cut panels for the boot; both together.
 * @example passThroughOptions({ opening: { widthMm: 600, heightMm: 800, cornerRadiusMm: 50 }, nominalGapMm: 80,
 *   movement: { foreAftOpeningMm: 20, foreAftClosingMm: 10, lateralMm: 60, verticalMm: 15 },
 *   allowances: DEFAULT_PASS_THROUGH_ALLOWANCES, seal: null }).frames.clear.widthMm // => 460
 */
export function passThroughOptions(input: PassThroughInput): PassThroughResult {
  if (input === null || typeof input !== 'object') throw new FlexInputError(FN, 'input', 'must be an object');
  const { opening, movement, allowances } = input;
  requirePositiveLength(FN, 'opening.widthMm', opening.widthMm);
  requirePositiveLength(FN, 'opening.heightMm', opening.heightMm);
  requireLength(FN, 'opening.cornerRadiusMm', opening.cornerRadiusMm);
  requirePositiveLength(FN, 'nominalGapMm', input.nominalGapMm);
  for (const key of ['foreAftOpeningMm', 'foreAftClosingMm', 'lateralMm', 'verticalMm'] as const) requireNonNegative(FN, `movement.${key}`, movement[key]);
  for (const key of Object.keys(DEFAULT_PASS_THROUGH_ALLOWANCES) as (keyof PassThroughAllowances)[])
    requireNonNegative(FN, `allowances.${key}`, allowances[key]);
  requirePositiveLength(FN, 'allowances.foldDepthMm', allowances.foldDepthMm);
  const openingArea = opening.widthMm * opening.heightMm;
  const frames = framesOption(input, openingArea);
  const boot = bootOption('boot', input, opening, { widthMm: opening.widthMm, heightMm: opening.heightMm }, openingArea);
  const inner = {
    widthMm: Math.max(0, frames.clear.widthMm),
    heightMm: Math.max(0, frames.clear.heightMm),
    cornerRadiusMm: Math.max(0, opening.cornerRadiusMm - Math.max(frames.overlapMm.left, frames.overlapMm.top)),
  };
  return { frames, boot, both: { frames, boot: bootOption('both', input, inner, inner, openingArea) } };
}
