/**
 * The flex computation: pure functions shared by the browser and the server. Lengths in mm, angles
 * in degrees (rotations of a fitted motion in rad). Each function's module documents its formula and
 * source; this file only re-exports them.
 */
export { FlexInputError, MAX_ABS_MM } from './errors';
export { inToMm, mmToIn } from './units';
export { AXES, isAxis } from './types';
export type { Axis, Displacement, GaugePoint, Reading, RigidMotion, Vec3, WheelLifts } from './types';
export { axleRollDeg, crossAxleTwistDeg } from './twist';
export { rampTravelIndex, roundRti } from './rti';
export { computeDisplacements } from './displacements';
export type { DisplacementResult } from './displacements';
export { COLLINEAR_RATIO, MIN_LEVER_MM, fitRelativeMotion } from './relative-motion';
export type { FitOptions, FitPart, FitPartStatus, ReadingResidual, RelativeMotionFit } from './relative-motion';
export { predictDisplacement, scaleMotion } from './predict-displacement';
export { perimeterWorst, sampleOutline } from './perimeter';
export type { AxisWorst, OpeningOutline, OutlinePoint, OutlineSide, PerimeterWorst, StraightSide } from './perimeter';
export { linearFit } from './linear-fit';
export type { LinearFit, LinearFitOptions, LinearFitSummary } from './linear-fit';
export { studentTCdf, studentTQuantile } from './student-t';
export { normalCdf, normalQuantile } from './normal';
export { noncentralTCdf, noncentralTQuantile } from './noncentral-t';
export { natrellaToleranceFactor, oneSidedToleranceFactor } from './tolerance-factor';
export { MODIFIED_Z_THRESHOLD, READING_RESOLUTION_MM, modifiedZScores } from './robust-scale';
export { roundUpToIncrement } from './round-up';
export { DEFAULT_ENVELOPE_PARAMETERS, designEnvelope } from './envelope';
export type {
  AxisEnvelope,
  EnvelopeInput,
  EnvelopeMethod,
  EnvelopeParameters,
  EnvelopePose,
  EnvelopeResult,
  PoseResult,
  ReadingMode,
  ToleranceSummary,
} from './envelope';
export { bootSpan, sealCompressionPercent } from './boot';
export type { BootSpanInput, BootSpanResult, SealCheck, SealSpec, SideSpan } from './boot';
export { compareSessions, poseSummaries } from './compare-sessions';
export type { SessionComparison, SessionForComparison, SessionPoseSummary } from './compare-sessions';
export { DEMO_MOTION_PER_DEG, DEMO_OUTLINE, buildSyntheticSession, seededNormal, seededRandom } from './synthetic-session';
export type { SyntheticPose, SyntheticSession, SyntheticSessionOptions } from './synthetic-session';
