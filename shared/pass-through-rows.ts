// The pass-through options as rows for people, in the reader's unit: the desk's comparison, the
// fabrication sheet and the CSV print the same rows from the same frozen numbers.
import type { BootOption, FramesOption, PassThroughOption, PassThroughResult } from './flex';
import { startingSealFreeHeight } from './flex';
import { formatLength, formatLengthValue, formatRatio } from './format';
import { plural } from './plural';
import type { UnitSystem } from './schemas/common';

export const OPTION_NAMES: Record<PassThroughOption, string> = {
  frames: 'Overlapping rigid frames with seals',
  boot: 'Flexible boot on hard frames',
  both: 'Both: bulb seal on the frames, fabric boot inside',
};

/** One line of the comparison: a label and each option's figure ('—' where it does not apply). */
export interface OptionRow {
  key: string;
  label: string;
  values: Record<PassThroughOption, string>;
  /** An option whose figure is a problem (below the minimum, no seal follows, the gap closes). */
  problem: Partial<Record<PassThroughOption, boolean>>;
}

const NONE = '—';

function clearText(o: FramesOption | BootOption, unit: UnitSystem): string {
  return `${formatLengthValue(o.clear.widthMm, unit)} × ${formatLength(o.clear.heightMm, unit)}`;
}

function shortText(o: FramesOption | BootOption, unit: UnitSystem): string {
  const c = o.clear;
  if (c.meetsMinimum) return 'meets the minimum';
  const parts = [
    c.shortOfWidthMm > 0 ? `${formatLength(c.shortOfWidthMm, unit)} too narrow` : '',
    c.shortOfHeightMm > 0 ? `${formatLength(c.shortOfHeightMm, unit)} too low` : '',
  ];
  return parts.filter(Boolean).join(', ');
}

function sealText(f: FramesOption, unit: UnitSystem): string {
  if (f.seal) {
    const s = f.seal;
    return `${formatLength(s.freeHeightMm, unit)} seal: ${s.compressionAtWidestPercent.toFixed(0)} % to ${s.compressionAtNarrowestPercent.toFixed(0)} % compressed (${s.minCompressionPercent}–${s.maxCompressionPercent} % allowed): ${s.follows ? 'follows' : 'does not follow'}`;
  }
  const range = f.sealFreeHeightRangeMm;
  if (range === null) return 'no single seal follows this gap range';
  return `free height ${formatLengthValue(range.min, unit)} to ${formatLength(range.max, unit)} follows; start from ${formatLength(startingSealFreeHeight(range)!, unit)}`;
}

/**
 * The comparison rows, in reading order.
 * @example optionRows(result, 'mm')[0] // => { key: 'clear', label: 'Clear opening (w × h)', values: { frames: '460.0 × 750.0 mm', … } }
 */
export function optionRows(r: PassThroughResult, unit: UnitSystem): OptionRow[] {
  const L = (mm: number) => formatLength(mm, unit);
  const { frames, boot, both } = r;
  const panel = (b: BootOption) => b.panels.top;
  const bootCells = (f: (b: BootOption) => string) => ({ frames: NONE, boot: f(boot), both: f(both.boot) });
  const frameCells = (f: (x: FramesOption) => string) => ({ frames: f(frames), boot: NONE, both: f(both.frames) });
  return [
    {
      key: 'clear',
      label: 'Clear opening for a person (w × h)',
      values: { frames: clearText(frames, unit), boot: clearText(boot, unit), both: clearText(both.boot, unit) },
      problem: {},
    },
    {
      key: 'lost',
      label: 'Share of the opening lost',
      values: {
        frames: `${frames.clear.lostPercent.toFixed(1)} %`,
        boot: `${boot.clear.lostPercent.toFixed(1)} %`,
        both: `${both.boot.clear.lostPercent.toFixed(1)} %`,
      },
      problem: {},
    },
    {
      key: 'minimum',
      label: 'Against the least clear opening',
      values: { frames: shortText(frames, unit), boot: shortText(boot, unit), both: shortText(both.boot, unit) },
      problem: { frames: !frames.clear.meetsMinimum, boot: !boot.clear.meetsMinimum, both: !both.boot.clear.meetsMinimum },
    },
    {
      key: 'overlap',
      label: 'Frame overlap: left and right / top and bottom',
      values: frameCells((f) => `${L(f.overlapMm.left)} / ${L(f.overlapMm.top)}`),
      problem: {},
    },
    {
      key: 'gap',
      label: 'Fore-aft gap, narrowest to widest',
      values: {
        frames: `${formatLengthValue(frames.gapMinMm, unit)} to ${L(frames.gapMaxMm)}`,
        boot: `${formatLengthValue(frames.gapMinMm, unit)} to ${L(frames.gapMaxMm)}`,
        both: `${formatLengthValue(frames.gapMinMm, unit)} to ${L(frames.gapMaxMm)}`,
      },
      problem: {},
    },
    {
      key: 'seal',
      label: 'Seal compression',
      values: frameCells((f) => sealText(f, unit)),
      problem: {
        frames: frames.seal ? !frames.seal.follows : frames.sealFreeHeightRangeMm === null,
        both: frames.seal ? !frames.seal.follows : frames.sealFreeHeightRangeMm === null,
      },
    },
    {
      key: 'span',
      label: 'Boot span, shortest to longest (every side)',
      values: bootCells((b) =>
        b.contact ? 'the gap closes fully: cab and body touch' : `${formatLengthValue(panel(b).shortestSpanMm, unit)} to ${L(panel(b).longestSpanMm)}`,
      ),
      problem: { boot: boot.contact, both: both.boot.contact },
    },
    {
      key: 'ratio',
      label: 'Boot extension ratio',
      values: bootCells((b) => formatRatio(panel(b).extensionRatio)),
      problem: {},
    },
    {
      key: 'panels',
      label: 'Boot panels, cut flat (across the gap × along the side)',
      values: bootCells((b) =>
        (['top', 'bottom', 'left', 'right'] as const)
          .map((side) => `${side} ${formatLengthValue(b.panels[side].flatLengthMm, unit)} × ${L(b.panels[side].flatWidthMm)}`)
          .join('; '),
      ),
      problem: {},
    },
    {
      key: 'folds',
      label: 'Folds to take up at the shortest span',
      values: bootCells((b) => `${plural(panel(b).folds, 'fold')} (${L(panel(b).foldUpMm)} of fabric)`),
      problem: {},
    },
  ];
}
