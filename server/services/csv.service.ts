// CSV exports of a session's readings and of a signed envelope. Values print through
// shared/format.ts (the same digits as the screen and the sheet) in the chosen unit; the readings
// file also carries each value exactly in mm, so a spreadsheet can recompute without rounding.
// Written with papaparse's unparse (quotes fields with commas, quotes or line breaks). Free text
// that a spreadsheet would run as a formula gets a leading apostrophe; negative numbers do not.
const CSV_OPTIONS = { newline: '\r\n', escapeFormulae: /^(?:[=+@\t\r]|-(?!\d+(?:\.\d+)?$))/ };
/** How an envelope reads, in words: a bare "+" would be taken for a formula by a spreadsheet. */
const SIGN_WORDS = { '+': 'opens (+)', '−': 'closes (−)', '±': 'either way (±)' } as const;
import Papa from 'papaparse';
import type { UnitSystem } from '../../shared/schemas/common';
import type { EnvelopeSnapshot } from '../../shared/schemas/envelope';
import type { GaugePoint, Pose, Reading } from '../../shared/schemas';
import { AXES } from '../../shared/flex';
import { envelopeRows } from '../../shared/envelope-rows';
import { buildLines, buildToSentence, designOf, drawingNumber } from '../../shared/build-sheet';
import { OPTION_NAMES } from '../../shared/pass-through-rows';
import { AXIS_NAMES, SIDE_NAMES, formatDegValue, formatLengthValue, formatRatio } from '../../shared/format';

export interface ReadingsCsvInput {
  gaugePoints: Pick<GaugePoint, 'id' | 'label'>[];
  poses: Pick<Pose, 'id' | 'seq' | 'label'>[];
  readings: (Pick<Reading, 'id' | 'poseId' | 'gaugePointId' | 'axis' | 'valueMm' | 'excluded' | 'excludeReason' | 'flagNote'> & { enteredBy: string })[];
  people: Record<string, string>;
}

export function readingsCsv(data: ReadingsCsvInput, unit: UnitSystem): string {
  const poseOf = new Map(data.poses.map((p) => [p.id, p]));
  const labelOf = new Map(data.gaugePoints.map((g) => [g.id, g.label]));
  const axisOrder = (a: string) => AXES.indexOf(a as (typeof AXES)[number]);
  const rows = [...data.readings]
    .filter((r) => poseOf.has(r.poseId))
    .sort(
      (a, b) =>
        poseOf.get(a.poseId)!.seq - poseOf.get(b.poseId)!.seq ||
        (labelOf.get(a.gaugePointId) ?? '').localeCompare(labelOf.get(b.gaugePointId) ?? '') ||
        axisOrder(a.axis) - axisOrder(b.axis),
    )
    .map((r) => {
      const pose = poseOf.get(r.poseId)!;
      return {
        pose_seq: pose.seq,
        pose: pose.label,
        gauge_point: labelOf.get(r.gaugePointId) ?? '',
        axis: AXIS_NAMES[r.axis],
        [`value_${unit}`]: formatLengthValue(r.valueMm, unit),
        value_mm_exact: String(r.valueMm),
        excluded: r.excluded ? 'yes' : 'no',
        exclude_reason: r.excludeReason ?? '',
        flag_note: r.flagNote ?? '',
        entered_by: data.people[r.enteredBy] ?? '',
        reading_id: r.id,
      };
    });
  return Papa.unparse(rows, CSV_OPTIONS);
}

/**
 * The signed envelope: one row per measure (fore-aft opening and closing apart, with the sign the
 * envelope reads with), then one per side of the boot check, then one per flagged reading the
 * engineer acknowledged, each with the sign-off.
 */
export function envelopeCsv(s: EnvelopeSnapshot, contentHash: string, unit: UnitSystem): string {
  // Every row has every column, in this order (the first row's keys are the file's header); a row
  // fills in its own.
  const blank: Record<string, string | number> = {
    kind: '',
    name: '',
    sign: '',
    [`measured_worst_${unit}`]: '',
    [`upper_bound_${unit}`]: '',
    governs: '',
    [`envelope_${unit}`]: '',
    [`gap_min_${unit}`]: '',
    [`gap_max_${unit}`]: '',
    [`largest_shear_${unit}`]: '',
    extension_ratio: '',
    note: '',
    figure: '',
    option: '',
    supersedes_revision: '',
    design_twist_deg: formatDegValue(s.params.designTwistDeg),
    revision: s.revision,
    signed_by: s.signedBy.name,
    signed_at: s.signedAt,
    content_hash: contentHash,
  };
  const rows: Record<string, string | number>[] = envelopeRows(s.result, unit).map((r) => ({
    ...blank,
    kind: 'envelope',
    name: r.name,
    sign: SIGN_WORDS[r.sign],
    [`measured_worst_${unit}`]: formatLengthValue(r.measuredWorstMm, unit),
    [`upper_bound_${unit}`]: r.upperBoundMm === null ? '' : formatLengthValue(r.upperBoundMm, unit),
    governs: r.governs,
    [`envelope_${unit}`]: formatLengthValue(r.envelopeMm, unit),
  }));
  for (const side of ['top', 'bottom', 'left', 'right'] as const) {
    const b = s.boot?.[side];
    if (!b) continue;
    rows.push({
      ...blank,
      kind: 'side',
      name: SIDE_NAMES[side],
      [`gap_min_${unit}`]: formatLengthValue(b.gapMinMm, unit),
      [`gap_max_${unit}`]: formatLengthValue(b.gapMaxMm, unit),
      [`largest_shear_${unit}`]: formatLengthValue(b.largestShearMm, unit),
      extension_ratio: formatRatio(b.extensionRatio),
    });
  }
  for (const f of s.format === 2 ? s.acknowledgedFlags : []) {
    rows.push({
      ...blank,
      kind: 'acknowledged flag',
      name: `${f.poseLabel} ${f.pointLabel} ${AXIS_NAMES[f.axis]}`,
      note: `entered ${formatLengthValue(f.enteredMm, unit)} ${unit}, ${formatLengthValue(f.residualMm, unit)} ${unit} off the fit${f.note ? `; ${f.note}` : ''}`,
    });
  }
  // The sheet's drawing and build figures, the same lines the PDF prints.
  const design = designOf(s);
  rows.push({
    ...blank,
    kind: 'drawing',
    name: drawingNumber(s),
    option: design.option === null ? 'none chosen' : OPTION_NAMES[design.option],
    supersedes_revision: s.format === 2 && s.supersedesRevision != null ? s.supersedesRevision : '',
    note: buildToSentence(s, unit),
  });
  for (const line of buildLines(s, unit)) {
    rows.push({ ...blank, kind: 'build', name: line.item, figure: line.figure });
  }
  return Papa.unparse(rows, CSV_OPTIONS);
}
