// The fabrication sheet: one PDF per signed envelope revision, for whoever sews the boot or cuts the
// seal. It prints only the frozen snapshot (never a recomputation), every number through
// shared/format.ts so it reads as on screen and in the CSV, and the planning-aid notice.
// Fonts: Atkinson Hyperlegible (SIL OFL 1.1, fonts/OFL.txt), read by pdfkit's fontkit from WOFF.
import type PDFKit from 'pdfkit';
import path from 'node:path';
import { repoRoot } from '../paths';
import type { UnitSystem } from '../../shared/schemas/common';
import type { EnvelopeSnapshot } from '../../shared/schemas/envelope';
import { envelopeRemarks, envelopeRows } from '../../shared/envelope-rows';
import { buildLines, buildToSentence, designOf, drawingNumber, gaugePointDimensions, sideWords } from '../../shared/build-sheet';
import { OPTION_NAMES } from '../../shared/pass-through-rows';
import { revisionName } from '../../shared/revision-name';
import {
  AXIS_NAMES,
  SIDE_NAMES,
  UNIT_WORDS,
  formatDeg,
  formatBuildLength,
  formatIncrement,
  formatLength,
  formatLengthValue,
  formatPercent,
  formatRatio,
  formatTimestamp,
  lengthWords,
} from '../../shared/format';
import { sealReason } from '../../shared/flex';

const FONT_DIR = path.join(repoRoot, 'fonts');
const REGULAR = path.join(FONT_DIR, 'atkinson-hyperlegible-regular.woff');
const BOLD = path.join(FONT_DIR, 'atkinson-hyperlegible-bold.woff');

export const PLANNING_AID_NOTICE =
  'Planning aid only. This envelope helps plan a boot, bellows or seal across the cab-to-body gap; it is not a structural or road-legality approval. Local codes and qualified professionals decide. Flex testing can roll or drop a vehicle: keep a spotter in sight and nobody beside or under it while it moves.';

const INK = '#0d1b1e';
const MUTED = '#4a5a5e';
const LINE = '#10333d';
const MARGIN = 48;

export interface SheetInput {
  snapshot: EnvelopeSnapshot;
  contentHash: string;
  status: 'signed' | 'superseded';
  unit: UnitSystem;
}

type Doc = InstanceType<typeof PDFKit>;

function heading(doc: Doc, text: string) {
  doc.moveDown(0.6).font('bold').fontSize(12).fillColor(LINE).text(text, MARGIN).moveDown(0.2);
  doc.font('regular').fontSize(9).fillColor(INK);
}

/** A plain table: a bold header row, then rows; column widths in points. */
function table(doc: Doc, columns: { title: string; width: number; align?: 'left' | 'right' }[], rows: string[][]) {
  const draw = (cells: string[], bold: boolean) => {
    if (doc.y > doc.page.height - MARGIN - 40) doc.addPage();
    const y = doc.y;
    let x = MARGIN;
    let height = 0;
    doc.font(bold ? 'bold' : 'regular').fontSize(9);
    cells.forEach((cell, i) => {
      const c = columns[i];
      doc.text(cell, x, y, { width: c.width - 6, align: c.align ?? 'left' });
      height = Math.max(height, doc.y - y);
      x += c.width;
    });
    doc.x = MARGIN;
    doc.y = y + height + 3;
    doc
      .moveTo(MARGIN, doc.y - 1.5)
      .lineTo(x, doc.y - 1.5)
      .lineWidth(0.3)
      .strokeColor(bold ? LINE : '#c9c3b3')
      .stroke();
  };
  draw(
    columns.map((c) => c.title),
    true,
  );
  for (const row of rows) draw(row, false);
  doc.font('regular');
}

function arrowLine(doc: Doc, x1: number, y1: number, x2: number, y2: number) {
  doc.moveTo(x1, y1).lineTo(x2, y2).lineWidth(0.6).strokeColor(LINE).stroke();
  const a = Math.atan2(y2 - y1, x2 - x1);
  for (const [x, y, dir] of [
    [x1, y1, a],
    [x2, y2, a + Math.PI],
  ] as const) {
    doc
      .moveTo(x, y)
      .lineTo(x + 5 * Math.cos(dir + 0.35), y + 5 * Math.sin(dir + 0.35))
      .lineTo(x + 5 * Math.cos(dir - 0.35), y + 5 * Math.sin(dir - 0.35))
      .closePath()
      .fillColor(LINE)
      .fill();
  }
}

/**
 * One frame to scale, seen from the cab looking rearward (the vehicle's left, +y, on the drawing's
 * right), with its outline dimensioned, the gauge points by label, L and R marked, and for the
 * body-side frame of an overlapping design its inner (clear) edge.
 */
function frameDrawing(
  doc: Doc,
  s: EnvelopeSnapshot,
  unit: UnitSystem,
  at: { left: number; top: number; title: string; inner: { widthMm: number; heightMm: number } | null },
) {
  const o = s.vehicle.opening;
  const boxW = 190;
  const boxH = 150;
  const scale = Math.min(boxW / o.widthMm, boxH / o.heightMm);
  const w = o.widthMm * scale;
  const h = o.heightMm * scale;
  const left = at.left + 22;
  const top = at.top + 36;
  const driver = designOf(s).driverSide;
  doc
    .font('bold')
    .fontSize(10)
    .fillColor(LINE)
    .text(at.title, at.left, at.top, { width: boxW + 60 });
  doc
    .roundedRect(left, top, w, h, o.cornerRadiusMm * scale)
    .lineWidth(1.5)
    .strokeColor(INK)
    .stroke();
  if (at.inner) {
    const iw = at.inner.widthMm * scale;
    const ih = at.inner.heightMm * scale;
    doc
      .rect(left + (w - iw) / 2, top + (h - ih) / 2, iw, ih)
      .lineWidth(0.8)
      .dash(3, { space: 2 })
      .strokeColor(LINE)
      .stroke()
      .undash();
  }
  const px = (y: number) => left + w / 2 + (y - o.centreYMm) * scale;
  const py = (z: number) => top + h - (z - o.bottomZMm) * scale;
  for (const g of s.gaugePoints) {
    doc.circle(px(g.yMm), py(g.zMm), 3).fillColor('#8a4b00').fill();
    doc
      .font('bold')
      .fontSize(8)
      .fillColor(INK)
      .text(g.label, px(g.yMm) + 4, py(g.zMm) - 10, { lineBreak: false });
  }
  arrowLine(doc, left, top - 8, left + w, top - 8);
  doc
    .font('regular')
    .fontSize(8)
    .fillColor(INK)
    .text(formatBuildLength(o.widthMm, unit), left, top - 19, { width: w, align: 'center' });
  arrowLine(doc, left - 10, top, left - 10, top + h);
  doc.save().rotate(-90, { origin: [left - 14, top + h / 2] });
  doc.text(formatBuildLength(o.heightMm, unit), left - 14 - h / 2, top + h / 2 - 9, { width: h, align: 'center' });
  doc.restore();
  // Each side's mark under its edge, one line each so they never run together on a narrow opening.
  doc
    .font('bold')
    .fontSize(8)
    .text(sideWords('right', driver), left - 10, top + h + 4, { lineBreak: false });
  doc.text(sideWords('left', driver), left - 10, top + h + 15, { width: w + 20, align: 'right', lineBreak: false });
  doc.font('regular');
  return top + h + 30;
}

/** Both frames side by side, then every gauge point dimensioned on the opening. */
function framesSection(doc: Doc, s: EnvelopeSnapshot, unit: UnitSystem) {
  const design = designOf(s);
  const pass = s.format === 2 ? (s.passThrough ?? null) : null;
  const overlapping = pass !== null && (design.option === 'frames' || design.option === 'both');
  if (doc.y > doc.page.height - MARGIN - 300) doc.addPage();
  const top = doc.y;
  const bottom = Math.max(
    frameDrawing(doc, s, unit, { left: MARGIN, top, title: 'Cab-side frame', inner: null }),
    frameDrawing(doc, s, unit, { left: MARGIN + 260, top, title: 'Body-side frame', inner: overlapping ? pass.frames.clear : null }),
  );
  doc.x = MARGIN;
  doc.y = bottom;
  const o = s.vehicle.opening;
  doc.fontSize(8).fillColor(MUTED);
  doc.text(
    `Both seen from the cab, looking rearward: the vehicle's left (+y) is on the right of each drawing. Corner radius ${formatBuildLength(o.cornerRadiusMm, unit)}; ` +
      `the opening's centre is ${formatLength(o.centreYMm, unit)} from the vehicle centreline (+ = left) and its bottom edge ${formatLength(o.bottomZMm, unit)} above the top of the frame rail; ` +
      `nominal fore-aft gap ${formatBuildLength(s.vehicle.nominalGapMm, unit)}.${overlapping ? " Dashed: the body-side frame's inner edge (the clear opening)." : ''}` +
      (design.driverSide === null ? " The driver's side was not set: L and R are the vehicle's left and right." : ''),
    MARGIN,
    doc.y,
    { width: doc.page.width - 2 * MARGIN },
  );
  doc.fillColor(INK);
  table(
    doc,
    [
      { title: 'gauge point', width: 70 },
      { title: "across, from the opening's centre line", width: 190 },
      { title: "up, from the opening's bottom edge", width: 130 },
      { title: 'as placed (y, z)', width: 110 },
    ],
    gaugePointDimensions(s, unit).map((g) => [g.label, g.across, g.up, g.placed]),
  );
}

/** The chosen option's build lines, then attachment, material, drain and tolerances. */
function buildSection(doc: Doc, s: EnvelopeSnapshot, unit: UnitSystem) {
  const design = designOf(s);
  heading(doc, design.option === null ? 'Build' : `Build: ${OPTION_NAMES[design.option]}`);
  if (design.option === null) doc.text('No pass-through option was chosen at sign-off: the sheet gives the design envelope and the boot spans only.', MARGIN);
  table(
    doc,
    [
      { title: 'item', width: 210 },
      { title: `figure (${unit})`, width: 290 },
    ],
    buildLines(s, unit).map((l) => [l.item, l.figure]),
  );
}

/**
 * On every page, so a page handed on alone still says what it is and who signed it: the drawing
 * number and revision, the revision it supersedes, the signature and hash, and "page x of y".
 */
function signOffFooters(doc: Doc, s: EnvelopeSnapshot, contentHash: string, status: SheetInput['status']) {
  const range = doc.bufferedPageRange();
  const supersedes =
    s.format === 2 && s.supersedesRevision !== undefined
      ? s.supersedesRevision === null
        ? 'supersedes none'
        : `supersedes revision ${s.supersedesRevision}`
      : 'supersedes: not recorded';
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottomMargin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - MARGIN + 8;
    doc
      .moveTo(MARGIN, y - 4)
      .lineTo(doc.page.width - MARGIN, y - 4)
      .lineWidth(0.5)
      .strokeColor(LINE)
      .stroke();
    doc.font('regular').fontSize(7.5).fillColor(INK);
    doc.text(
      `Drawing ${drawingNumber(s)} revision ${s.revision} (${supersedes})${status === 'superseded' ? ' · SUPERSEDED' : ''} · signed off by ${s.signedBy.name} on ${formatTimestamp(s.signedAt)} · hash ${contentHash.slice(0, 16)}…`,
      MARGIN,
      y,
      { width: doc.page.width - 2 * MARGIN - 70, lineBreak: false },
    );
    doc.font('bold').text(`page ${i - range.start + 1} of ${range.count}`, doc.page.width - MARGIN - 70, y, { width: 70, align: 'right', lineBreak: false });
    doc.page.margins.bottom = bottomMargin;
  }
}

// pdfkit is loaded with the first sheet, not at start-up (it takes a tenth of a second to load).
export async function buildSheetPdf({ snapshot: s, contentHash, status, unit }: SheetInput): Promise<Buffer> {
  const { default: PDFDocument } = await import('pdfkit');
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    // Kept until the end, so each page's footer can say "page x of y".
    bufferPages: true,
    // Dated at the sign-off, so the same revision always prints to the same file.
    info: {
      Title: `Fabrication sheet: ${s.vehicle.name}, revision ${s.revision}`,
      Author: s.signedBy.name,
      Creator: 'Twistlog',
      CreationDate: new Date(s.signedAt),
    },
  });
  doc.registerFont('regular', REGULAR);
  doc.registerFont('bold', BOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  doc.font('bold').fontSize(18).fillColor(LINE).text('Fabrication sheet: pass-through boot and seal');
  doc.font('regular').fontSize(10).fillColor(INK);
  doc.text(`${revisionName({ vehicleName: s.vehicle.name, sessionTitle: s.session.title, revision: s.revision })} · tested ${s.session.testedOn}`);
  doc.text(
    `Drawing ${drawingNumber(s)}, revision ${s.revision}${s.format === 2 && s.supersedesRevision != null ? `, supersedes revision ${s.supersedesRevision}` : ''}.`,
  );
  doc.text(
    `All lengths in ${UNIT_WORDS[unit]}${unit === 'in' ? ', to 0.01 in, with build figures also to the nearest 1/16 in' : ''}. Axes: fore-aft (+ = gap opens), lateral (+ = cab moves left), vertical (+ = cab moves up).`,
  );
  if (status === 'superseded') {
    doc
      .moveDown(0.3)
      .font('bold')
      .fillColor('#b3261e')
      .text('SUPERSEDED: a later revision of this envelope has been signed off. Do not fabricate from this sheet.');
    doc.font('regular').fillColor(INK);
  }

  doc
    .moveDown(0.5)
    .font('bold')
    .fontSize(11)
    .fillColor(LINE)
    .text(buildToSentence(s, unit), MARGIN, doc.y, { width: doc.page.width - 2 * MARGIN });
  doc.font('regular').fontSize(9).fillColor(INK);

  heading(doc, 'Frames and gauge points');
  framesSection(doc, s, unit);
  buildSection(doc, s, unit);

  heading(doc, 'Design envelope');
  const rows = envelopeRows(s.result, unit);
  table(
    doc,
    [
      { title: 'movement', width: 110 },
      { title: `measured worst (${unit})`, width: 80, align: 'right' },
      { title: `upper bound (${unit})`, width: 80, align: 'right' },
      { title: 'governs', width: 150 },
      { title: `envelope (${unit})`, width: 90, align: 'right' },
    ],
    rows.map((r) => [
      r.name,
      formatLengthValue(r.measuredWorstMm, unit),
      r.upperBoundMm === null ? '—' : formatLengthValue(r.upperBoundMm, unit),
      r.governs,
      `${r.sign}${formatLengthValue(r.envelopeMm, unit)}`,
    ]),
  );
  doc.fontSize(8).fillColor(MUTED);
  doc.text('Fore-aft: + the gap opens by up to the envelope, − it closes by up to it. Lateral and vertical: ± either way.', MARGIN);
  for (const r of rows) doc.text(`${r.name}: ${r.reasons.join(' ')}`, MARGIN);
  doc.fillColor(INK);

  heading(doc, 'Boot spans per side');
  if (s.boot === null) {
    doc.text(s.bootNote ?? 'no boot check', MARGIN);
  } else {
    const boot = s.boot;
    table(
      doc,
      [
        { title: 'side', width: 62 },
        { title: `gap min (${unit})`, width: 62, align: 'right' },
        { title: `gap max (${unit})`, width: 62, align: 'right' },
        { title: `largest shear (${unit})`, width: 70, align: 'right' },
        { title: `shortest span (${unit})`, width: 70, align: 'right' },
        { title: `longest span (${unit})`, width: 70, align: 'right' },
        { title: 'extension ratio', width: 60, align: 'right' },
        { title: 'contact', width: 44 },
      ],
      (['top', 'bottom', 'left', 'right'] as const).map((side) => {
        const b = boot[side];
        return [
          SIDE_NAMES[side],
          formatLengthValue(b.gapMinMm, unit),
          formatLengthValue(b.gapMaxMm, unit),
          formatLengthValue(b.largestShearMm, unit),
          formatLengthValue(b.shortestMm, unit),
          formatLengthValue(b.longestMm, unit),
          formatRatio(b.extensionRatio),
          b.contact ? 'yes' : 'no',
        ];
      }),
    );
    doc.fontSize(8).fillColor(MUTED).text(`The spans ${s.bootNote}.`, MARGIN).fillColor(INK);

    heading(doc, 'Seal check');
    const seal = s.params.seal;
    if (seal === null) {
      doc.text('No seal chosen. Free heights that follow each side at 25–50 % compression (common practice):', MARGIN);
    } else {
      doc.text(
        `Seal free height ${formatLength(seal.freeHeightMm, unit)}, allowed compression ${seal.minCompressionPercent}–${seal.maxCompressionPercent} %.`,
        MARGIN,
      );
    }
    table(
      doc,
      [
        { title: 'side', width: 70 },
        { title: `free heights that follow (${unit})`, width: 140 },
        { title: 'this seal', width: 318 },
      ],
      (['top', 'bottom', 'left', 'right'] as const).map((side) => {
        const b = boot[side];
        const range = b.sealFreeHeightRangeMm
          ? `${formatLengthValue(b.sealFreeHeightRangeMm.min, unit)} to ${formatLengthValue(b.sealFreeHeightRangeMm.max, unit)}`
          : 'none';
        const check = b.seal ? `${b.seal.follows ? 'follows' : 'does NOT follow'}: ${sealReason(b.seal, b.gapMinMm, b.gapMaxMm, lengthWords(unit))}` : '—';
        return [SIDE_NAMES[side], range, check];
      }),
    );
  }

  heading(doc, 'Parameters');
  const p = s.params;
  const method =
    p.method === 'prediction'
      ? `one-sided prediction bound at ${formatPercent(p.confidence)} confidence per twist direction, line ${p.throughOrigin ? 'through the origin' : 'with intercept'}, scatter growing with twist`
      : `one-sided tolerance bound, coverage ${formatPercent(p.coverage)} at ${formatPercent(p.confidence)} confidence, repeated runs within ±${formatDeg(p.repeatBandDeg ?? 1)}`;
  doc.text(`Design twist ${formatDeg(p.designTwistDeg)}; ${method}.`, MARGIN);
  doc.text(`Margin ${formatPercent(p.margin)}; allowance ${formatLength(p.allowanceMm, unit)}; rounded up to ${formatIncrement(p.incrementMm, unit)}.`);
  doc.text(`${s.poses.length} poses, ${s.readings.length} readings used, ${s.excludedReadings.length} excluded by the engineer.`);
  const remarks = envelopeRemarks(s.result, unit);
  for (const [title, list] of [
    ['Remarks on the readings and the fit', remarks.readings],
    ['Remarks on the bound', remarks.bound],
  ] as const) {
    if (list.length === 0) continue;
    heading(doc, title);
    doc.fontSize(8).fillColor(MUTED);
    for (const note of list) doc.text(`• ${note}`, MARGIN);
    doc.fontSize(9).fillColor(INK);
  }
  if (s.format === 2 && s.acknowledgedFlags.length > 0) {
    heading(doc, 'Flagged readings kept in the computation');
    doc.text(`The outlier rule flagged these readings; ${s.signedBy.name} checked each and kept it in the computation at sign-off.`, MARGIN);
    table(
      doc,
      [
        { title: 'pose', width: 120 },
        { title: 'point', width: 40 },
        { title: 'axis', width: 55 },
        { title: `entered (${unit})`, width: 60, align: 'right' },
        { title: `off the fit (${unit})`, width: 65, align: 'right' },
        { title: 'acknowledged, note', width: 160 },
      ],
      s.acknowledgedFlags.map((f) => [
        f.poseLabel,
        f.pointLabel,
        AXIS_NAMES[f.axis],
        formatLengthValue(f.enteredMm, unit),
        formatLengthValue(f.residualMm, unit),
        `acknowledged${f.kind === 'misfit' ? ' (part of a set that does not fit)' : ''}${f.note ? `: ${f.note}` : ''}`,
      ]),
    );
  }

  heading(doc, 'Sign-off');
  doc.text(`Signed off by ${s.signedBy.name} on ${formatTimestamp(s.signedAt)}, revision ${s.revision}.`, MARGIN);
  doc.fontSize(8).text(`Content hash (SHA-256 of the snapshot's canonical JSON): ${contentHash}`);

  doc
    .moveDown(0.8)
    .fontSize(9)
    .font('bold')
    .text(PLANNING_AID_NOTICE, MARGIN, doc.y, { width: doc.page.width - 2 * MARGIN });
  signOffFooters(doc, s, contentHash, status);
  doc.end();
  return done;
}
