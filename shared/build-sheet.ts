// What a boot maker builds from, in the reader's unit: the drawing number, the one figure to build
// to, the gauge points dimensioned on the opening with L/R as driver/passenger, and the build lines
// of the chosen pass-through option. The fabrication sheet (PDF) and the envelope CSV print these
// same lines, so the two never disagree. In inches, every build figure also reads to the nearest
// 1/16 in, as a tape does.
import { startingSealFreeHeight } from './flex';
import { SIDE_NAMES, formatBuildLength, formatLength, formatRatio } from './format';
import { OPTION_NAMES } from './pass-through-rows';
import { plural } from './plural';
import type { UnitSystem } from './schemas/common';
import { DEFAULT_PASS_THROUGH_DESIGN, FASTENING_NAMES, type EnvelopeSnapshot, type PassThroughDesign } from './schemas/envelope';

export interface BuildLine {
  /** What the line is about: a frame, the boot, the attachment, the tolerances. */
  part: 'frames' | 'boot' | 'attachment' | 'tolerances';
  item: string;
  figure: string;
}

/** The drawing number of a session's sheets: one per session, its revision beside it. */
export function drawingNumber(s: Pick<EnvelopeSnapshot, 'session'>): string {
  return `TWL-${s.session.id.replace(/-/g, '').slice(0, 8).toUpperCase()}`;
}

/** The design settings of a snapshot: revisions signed before they existed take the starting values. */
export function designOf(s: EnvelopeSnapshot): PassThroughDesign {
  return { ...DEFAULT_PASS_THROUGH_DESIGN, ...(s.params.design ?? {}) };
}

/** A side of the vehicle in the boot maker's words: "L (+y), driver side" once the driver's side is set. */
export function sideWords(side: 'left' | 'right', driverSide: PassThroughDesign['driverSide']): string {
  const base = side === 'left' ? 'L (+y)' : 'R (−y)';
  if (driverSide === null) return base;
  return `${base}, ${side === driverSide ? 'driver' : 'passenger'} side`;
}

export interface GaugePointDimension {
  label: string;
  /** Across from the opening's centre line, towards L or R, in words. */
  across: string;
  /** Up from the opening's bottom edge. */
  up: string;
  /** From the vehicle's centreline and the top of the frame rail, as the gauge point was placed. */
  placed: string;
}

/** Each gauge point dimensioned on the opening, with L/R marked as driver/passenger where known. */
export function gaugePointDimensions(s: EnvelopeSnapshot, unit: UnitSystem): GaugePointDimension[] {
  const o = s.vehicle.opening;
  const driver = designOf(s).driverSide;
  return s.gaugePoints.map((g) => {
    const dy = g.yMm - o.centreYMm;
    return {
      label: g.label,
      across: Math.abs(dy) < 0.05 ? `on the centre line` : `${formatBuildLength(Math.abs(dy), unit)} towards ${sideWords(dy > 0 ? 'left' : 'right', driver)}`,
      up: formatBuildLength(g.zMm - o.bottomZMm, unit),
      placed: `y ${formatLength(g.yMm, unit)}, z ${formatLength(g.zMm, unit)}`,
    };
  });
}

/** The figure to build to, stated once: the design movement and the chosen option. */
export function buildToSentence(s: EnvelopeSnapshot, unit: UnitSystem): string {
  const L = (mm: number) => formatBuildLength(mm, unit);
  const design = designOf(s);
  const movement =
    s.format === 2
      ? `the cab moves against the body by up to ${L(s.result.measures.lateral.envelopeMm)} either way sideways and ${L(s.result.measures.vertical.envelopeMm)} either way up and down; the fore-aft gap of ${L(s.vehicle.nominalGapMm)} opens by up to ${L(s.result.measures.foreAftOpening.envelopeMm)} and closes by up to ${L(s.result.measures.foreAftClosing.envelopeMm)}`
      : `the cab moves against the body by up to ${L(s.result.axes.lateral.envelopeMm)} sideways, ${L(s.result.axes.vertical.envelopeMm)} up and down and ${L(s.result.axes.foreAft.envelopeMm)} fore-aft`;
  const option =
    design.option === null ? 'No closing option was chosen at sign-off.' : `Chosen: ${OPTION_NAMES[design.option]}, built as listed under "Build".`;
  return `Build to: ${movement}. ${option}`;
}

/** The build lines of the chosen option, then attachment and tolerances; none for an option not chosen. */
export function buildLines(s: EnvelopeSnapshot, unit: UnitSystem): BuildLine[] {
  const L = (mm: number) => formatBuildLength(mm, unit);
  const design = designOf(s);
  const lines: BuildLine[] = [];
  const pass = s.format === 2 ? (s.passThrough ?? null) : null;
  const o = s.vehicle.opening;
  if (pass && design.option !== null) {
    const frames = pass.frames;
    const boot = design.option === 'both' ? pass.both.boot : pass.boot;
    if (design.option !== 'boot') {
      lines.push({
        part: 'frames',
        item: 'cab-side frame, inner edge (the opening)',
        figure: `${L(o.widthMm)} × ${L(o.heightMm)}, corner radius ${L(o.cornerRadiusMm)}`,
      });
      lines.push({
        part: 'frames',
        item: 'body-side frame, inner edge (the clear opening)',
        figure: `${L(frames.clear.widthMm)} × ${L(frames.clear.heightMm)}`,
      });
      lines.push({ part: 'frames', item: `frame overlap, ${SIDE_NAMES.left} and ${SIDE_NAMES.right}`, figure: L(frames.overlapMm.left) });
      lines.push({ part: 'frames', item: 'frame overlap, top and bottom', figure: L(frames.overlapMm.top) });
      const seal = frames.seal?.freeHeightMm ?? startingSealFreeHeight(frames.sealFreeHeightRangeMm);
      lines.push({
        part: 'frames',
        item: 'bulb seal free height',
        figure:
          seal === null
            ? 'no single seal follows this gap range'
            : `${L(seal)}, compressed ${(((seal - frames.gapMaxMm) / seal) * 100).toFixed(0)} % at the widest gap and ${(((seal - frames.gapMinMm) / seal) * 100).toFixed(0)} % at the narrowest` +
              (frames.seal && !frames.seal.follows
                ? `: outside the ${frames.seal.minCompressionPercent}–${frames.seal.maxCompressionPercent} % allowed, so it does NOT follow`
                : ''),
      });
    }
    if (design.option !== 'frames') {
      const top = boot.panels.top;
      for (const side of ['top', 'bottom', 'left', 'right'] as const) {
        const p = boot.panels[side];
        const name = side === 'left' || side === 'right' ? sideWords(side, design.driverSide) : side;
        lines.push({ part: 'boot', item: `${name} panel, cut flat (across the gap × along the side)`, figure: `${L(p.flatLengthMm)} × ${L(p.flatWidthMm)}` });
      }
      lines.push({
        part: 'boot',
        item: 'folds in each panel',
        figure: `${plural(top.folds, 'fold')} of ${L(design.foldDepthMm)} depth, taking up ${L(top.foldUpMm)}`,
      });
      lines.push({
        part: 'boot',
        item: 'span between the frames',
        figure: boot.contact
          ? 'the gap closes fully: cab and body touch'
          : `${L(top.shortestSpanMm)} to ${L(top.longestSpanMm)} (extension ratio ${formatRatio(top.extensionRatio)})`,
      });
      lines.push({
        part: 'boot',
        item: 'slack and seam allowance included',
        figure: `${design.slackPercent} % slack, ${L(design.seamAllowanceMm)} seam allowance at each side edge`,
      });
    }
    lines.push({ part: 'attachment', item: 'flange width (each edge fastens to one)', figure: L(design.flangeWidthMm) });
    lines.push({ part: 'attachment', item: 'fastening', figure: FASTENING_NAMES[design.fastening] });
  }
  if (design.material) lines.push({ part: 'attachment', item: 'material', figure: design.material });
  if (design.drain) lines.push({ part: 'attachment', item: 'drain', figure: design.drain });
  lines.push({ part: 'tolerances', item: 'fabric cut', figure: `± ${formatLength(design.fabricToleranceMm, unit)}` });
  lines.push({ part: 'tolerances', item: 'frames', figure: `± ${formatLength(design.frameToleranceMm, unit)}` });
  return lines;
}
