// The desk's records: design parameters of an envelope, the envelope revision as the API returns
// it, the frozen snapshot a sign-off stores, the review edits of a reading, and the fabrication
// sheet's e-mail. One schema each: the server validates with them, the client's forms too.
import * as z from 'zod';
import { DEFAULT_ENVELOPE_PARAMETERS } from '../flex/envelope';
import { DEFAULT_PASS_THROUGH_ALLOWANCES } from '../flex/pass-through';
import { axis, id, isoDate, isoDateTime, text } from './common';
import type { BootSpanResult, EnvelopeFlag, EnvelopeResult, PassThroughResult } from '../flex';

/** Seal check inputs: free height and the allowed compression range (25–50 % is common practice). */
export const sealSpec = z
  .object({
    freeHeightMm: z.number().finite().gt(0).max(1_000),
    minCompressionPercent: z.number().finite().min(0).max(99),
    maxCompressionPercent: z.number().finite().min(0).max(99),
  })
  .refine((s) => s.minCompressionPercent <= s.maxCompressionPercent, {
    message: 'the least compression must not exceed the most',
    path: ['minCompressionPercent'],
  });
export type SealSpecInput = z.infer<typeof sealSpec>;

/** How a boot edge is fastened to its frame's flange (our words; the engineer chooses). */
export const fastening = z.enum(['hookAndLoop', 'snaps', 'magnets', 'elastic', 'bead']);
export type Fastening = z.infer<typeof fastening>;
export const FASTENING_NAMES: Record<Fastening, string> = {
  hookAndLoop: 'hook-and-loop strip',
  snaps: 'snap fasteners',
  magnets: 'magnets sewn into the hem',
  elastic: 'elastic hem over the flange',
  bead: 'bead (keder) in a channel',
};

/**
 * How the pass-through is closed (shared/flex/pass-through.ts), with the allowances and the sheet's
 * construction notes. Frozen with the sign-off like every parameter. Lengths in mm.
 */
export const passThroughDesign = z.object({
  /** The option the engineer picked; null until one is. */
  option: z.enum(['frames', 'boot', 'both']).nullable(),
  /**
   * Which side of the vehicle the driver sits on (+y is the vehicle's left, ISO 8855), so the sheet
   * can mark L/R as driver/passenger; null until the engineer says.
   */
  driverSide: z.enum(['left', 'right']).nullable(),
  minClearWidthMm: z.number().finite().min(0).max(3_000),
  minClearHeightMm: z.number().finite().min(0).max(3_000),
  overlapMarginMm: z.number().finite().min(0).max(500),
  slackPercent: z.number().finite().min(0).max(200),
  seamAllowanceMm: z.number().finite().min(0).max(200),
  flangeWidthMm: z.number().finite().min(0).max(300),
  foldDepthMm: z.number().finite().gt(0).max(300),
  fastening,
  material: text(200),
  drain: text(300),
  /** Cutting tolerance of the fabric and of the frames, ± mm. */
  fabricToleranceMm: z.number().finite().gt(0).max(50),
  frameToleranceMm: z.number().finite().gt(0).max(50),
});
export type PassThroughDesign = z.infer<typeof passThroughDesign>;

/** Starting values, common practice (not from a standard): the engineer changes them per build. */
export const DEFAULT_PASS_THROUGH_DESIGN: PassThroughDesign = {
  option: null,
  driverSide: null,
  ...DEFAULT_PASS_THROUGH_ALLOWANCES,
  fastening: 'hookAndLoop',
  material: 'coated polyester fabric, UV-stable, waterproof',
  drain: 'one grommeted drain hole at the lowest point of the bottom panel',
  fabricToleranceMm: 3,
  frameToleranceMm: 1,
};

/** What the engineer sets; lengths in mm, fractions as fractions (0.15 = 15 %). */
export const envelopeParams = z.object({
  designTwistDeg: z.number().finite().gt(0).max(90),
  method: z.enum(['prediction', 'tolerance']),
  confidence: z.number().finite().gt(0.5).lt(1),
  coverage: z.number().finite().gt(0.5).lt(1),
  margin: z.number().finite().min(0).max(2),
  allowanceMm: z.number().finite().min(0).max(500),
  incrementMm: z.number().finite().gt(0).max(100),
  throughOrigin: z.boolean(),
  /** Tolerance method: runs within ± this many degrees of their median twist count as repeats. Drafts saved before it existed take 1°. */
  repeatBandDeg: z.number().finite().gt(0).max(10).default(DEFAULT_ENVELOPE_PARAMETERS.repeatBandDeg),
  seal: sealSpec.nullable(),
  /** Drafts saved before the design options existed take the starting values. */
  design: passThroughDesign.default(DEFAULT_PASS_THROUGH_DESIGN),
});
export type EnvelopeParams = z.infer<typeof envelopeParams>;

/**
 * A first draft's parameters: the flex module's defaults (common practice), a design twist the
 * engineer is expected to change, and the seal check off until a seal is chosen.
 */
export const DEFAULT_DRAFT_PARAMS: EnvelopeParams = {
  designTwistDeg: 12,
  ...DEFAULT_ENVELOPE_PARAMETERS,
  seal: null,
  design: DEFAULT_PASS_THROUGH_DESIGN,
};

export const envelopeStatus = z.enum(['draft', 'signed', 'superseded']);
export type EnvelopeStatus = z.infer<typeof envelopeStatus>;

/** A pose as the snapshot keeps it: `key` is the name the computation and its reasons use. */
export interface SnapshotPose {
  id: string;
  key: string;
  seq: number;
  label: string;
  kind: 'level' | 'wheels' | 'ramp';
  liftsMm: { fl: number; fr: number; rl: number; rr: number };
}

/**
 * A flagged reading the engineer kept in the computation at sign-off, and said so: frozen in the
 * snapshot and printed on the fabrication sheet.
 */
export interface AcknowledgedFlag extends Omit<EnvelopeFlag, 'poseId' | 'pointId'> {
  readingId: string;
  /** The pose and gauge point as the crew named them. */
  poseLabel: string;
  pointLabel: string;
  /** The reading as entered (a raw gap or a displacement, per the session's reading mode). */
  enteredMm: number;
  /** The engineer's note; may be empty. */
  note: string;
}

/** The result of a format-1 snapshot (signed before fore-aft opening and closing were apart): display fields only. */
export interface LegacyEnvelopeResult {
  axes: Record<
    z.infer<typeof axis>,
    { measuredWorstMm: number; upperBoundMm: number | null; governing: 'measured' | 'upperBound'; envelopeMm: number; reasons: string[] }
  >;
  notes: string[];
  readingNotes?: undefined;
}

interface SnapshotBase {
  signedBy: { id: string; name: string };
  signedAt: string;
  revision: number;
  vehicle: {
    id: string;
    name: string;
    wheelbaseMm: number;
    trackFrontMm: number;
    trackRearMm: number;
    nominalGapMm: number;
    opening: { widthMm: number; heightMm: number; cornerRadiusMm: number; centreYMm: number; bottomZMm: number };
  };
  session: { id: string; title: string; testedOn: string; readingMode: 'gap' | 'displacement' };
  gaugePoints: { id: string; label: string; yMm: number; zMm: number }[];
  poses: SnapshotPose[];
  readings: { id: string; poseId: string; gaugePointId: string; axis: z.infer<typeof axis>; valueMm: number; version: number }[];
  excludedReadings: { id: string; reason: string }[];
  params: EnvelopeParams;
  boot: BootSpanResult | null;
  bootNote: string | null;
}

/** Signed before this version of the method: one fore-aft envelope, no acknowledgements. Read, never written. */
export interface EnvelopeSnapshotV1 extends SnapshotBase {
  format: 1;
  result: LegacyEnvelopeResult;
}

/**
 * Everything a sign-off freezes: the inputs as read from the database at that moment, the
 * parameters, the results of shared/flex, the flagged readings the engineer kept and acknowledged,
 * and who signed when. Its canonical JSON is hashed.
 */
export interface EnvelopeSnapshotV2 extends SnapshotBase {
  format: 2;
  result: EnvelopeResult;
  acknowledgedFlags: AcknowledgedFlag[];
  /** The pass-through options at sign-off (absent in revisions signed before they existed; null without a nominal gap). */
  passThrough?: PassThroughResult | null;
  /** The signed revision this one superseded at sign-off (null: the first; absent in older snapshots). */
  supersedesRevision?: number | null;
}

export type EnvelopeSnapshot = EnvelopeSnapshotV1 | EnvelopeSnapshotV2;

export interface EnvelopeSendRecord {
  id: string;
  toEmail: string;
  sentBy: string;
  sentAt: string;
}

/** An envelope revision as the API returns it. */
export interface EnvelopeRecord {
  id: string;
  sessionId: string;
  vehicleId: string;
  vehicleName: string;
  sessionTitle: string;
  testedOn: string;
  revision: number;
  status: EnvelopeStatus;
  version: number;
  params: EnvelopeParams;
  snapshot: EnvelopeSnapshot | null;
  contentHash: string | null;
  /** The stored snapshot still hashes to contentHash; null for a draft. */
  hashVerifies: boolean | null;
  signedBy: { id: string; name: string } | null;
  signedAt: string | null;
  createdAt: string;
  sends: EnvelopeSendRecord[];
}

export const saveDraftInput = z.object({ version: z.number().int().min(1), params: envelopeParams });
/** One flagged reading kept in the computation, acknowledged by the engineer at sign-off. */
export const flagAcknowledgement = z.object({ readingId: id, note: text(500).default('') });
export const signOffInput = z.object({
  version: z.number().int().min(1),
  /** Every reading the outlier rule flags and the engineer keeps must be listed here. */
  acknowledgements: z.array(flagAcknowledgement).max(1_000).default([]),
});
export type SignOffInput = z.infer<typeof signOffInput>;
export const createDraftInput = z.object({ params: envelopeParams.optional() });

/** A review edit of one reading: exclusion (with its reason), a flag note, a corrected value. */
export const readingReviewInput = z
  .object({
    version: z.number().int().min(1),
    excluded: z.boolean().optional(),
    excludeReason: text(500).nullable().optional(),
    flagNote: text(500).nullable().optional(),
    valueMm: z.number().finite().min(-20_000).max(20_000).optional(),
  })
  .refine((r) => r.excluded !== true || (r.excludeReason ?? '').length > 0, {
    message: 'excluding a reading needs a reason',
    path: ['excludeReason'],
  });
export type ReadingReviewInput = z.infer<typeof readingReviewInput>;

export const sendSheetInput = z.object({
  to: z
    .email()
    .max(254)
    .transform((e) => e.toLowerCase()),
  note: text(2_000).optional(),
});
export type SendSheetInput = z.infer<typeof sendSheetInput>;

export const compareQuery = z.object({
  sessionIds: z
    .string()
    .transform((s) => s.split(',').filter(Boolean))
    .pipe(z.array(id).min(1).max(12)),
});

/** One session in a comparison; lengths in mm. */
export interface ComparedSession {
  sessionId: string;
  vehicleId: string;
  vehicleName: string;
  title: string;
  testedOn: string;
  poseCount: number;
  twistReachedDeg: number;
  worstMm: Record<z.infer<typeof axis>, number>;
  slopeMmPerDeg: Record<z.infer<typeof axis>, number | null>;
}

export const historyEvent = z.object({
  id: z.number(),
  entity: z.string(),
  entityId: id,
  action: z.string(),
  userName: z.string().nullable(),
  detail: z.record(z.string(), z.unknown()),
  createdAt: isoDateTime,
});
export type HistoryEventRecord = z.infer<typeof historyEvent>;

export const signedEnvelopeSummary = z.object({
  id,
  vehicleName: z.string(),
  sessionTitle: z.string(),
  testedOn: isoDate,
  revision: z.number().int(),
  signedAt: isoDateTime,
  signedBy: z.string(),
  contentHash: z.string(),
});
export type SignedEnvelopeSummary = z.infer<typeof signedEnvelopeSummary>;
