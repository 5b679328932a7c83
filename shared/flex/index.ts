/**
 * The flex computation: pure functions shared by the browser and the server. Lengths in mm, angles
 * in degrees (rotations of a fitted motion in rad). Each function's module documents its formula and
 * source, and docs/method.md the method as a whole; this file only re-exports them.
 */
export { FlexInputError, MAX_ABS_MM } from './errors';
export { inToMm, mmToIn } from './units';
export { AXES, isAxis } from './types';
export type { Axis, Displacement, FitPartStatus, GaugeLocation, GaugeValue, RigidMotion, Vec3, WheelLifts } from './types';
export { axleRollDeg, crossAxleTwistDeg } from './twist';
export { rampTravelIndex, roundRti } from './rti';
export { computeDisplacements } from './displacements';
export type { DisplacementResult } from './displacements';
export { READING_SD_MM, fitRelativeMotion } from './relative-motion';
export type { FitOptions } from './relative-motion';
export type { FitPart, FlaggedReading, RelativeMotionFit } from './fit-summary';
export { MAX_EDGE_ERROR_RATIO } from './pose-fit';
export { OUTLIER_FALSE_ALARM_RATE } from './outlier-rule';
export type { OutlierCheck } from './outlier-rule';
export { predictDisplacement, scaleMotion } from './predict-displacement';
export { outlineCorners, perimeterWorst, perimeterWorstOn, sampleOutline } from './perimeter';
export type { AxisWorst, OpeningOutline, OutlinePoint, OutlineSide, OutlineValue, PerimeterWorst, StraightSide } from './perimeter';
export { linearFit } from './linear-fit';
export type { LinearFit, LinearFitOptions } from './linear-fit';
export { predictionLeverage, upperPredictionBoundAt } from './prediction-bound';
export type { LinearFitSummary, ScatterModel } from './prediction-bound';
export { studentTCdf, studentTQuantile } from './student-t';
export { normalCdf, normalDensity, normalQuantile } from './normal';
export { noncentralTCdf, noncentralTQuantile } from './noncentral-t';
export { natrellaToleranceFactor, oneSidedToleranceFactor } from './tolerance-factor';
export { residualScale, residualScaleInPlace } from './robust-scale';
export { roundUpToIncrement } from './round-up';
export { MIN_FIT_TWIST_DEG } from './direction-bound';
export type { DirectionBound, ToleranceSummary, TwistDirection } from './direction-bound';
export { DEFAULT_ENVELOPE_PARAMETERS, ENVELOPE_MEASURES, MEASURE_AXIS, TWIST_DIRECTIONS, TWIST_DIRECTION_NAMES, designEnvelope } from './envelope';
export type {
  EnvelopeFlag,
  EnvelopeInput,
  EnvelopeMeasure,
  EnvelopeMethod,
  EnvelopeParameters,
  EnvelopePose,
  EnvelopeResult,
  MeasureEnvelope,
  PoseMeasure,
  PoseResult,
  ReadingMode,
} from './envelope';
export { bootSpan, sealCompressionPercent } from './boot';
export { sealReason } from './seal-reason';
export { DEFAULT_PASS_THROUGH_ALLOWANCES, PASS_THROUGH_OPTIONS, passThroughOptions, sealFollowRange, startingSealFreeHeight } from './pass-through';
export type {
  BootOption,
  BootPanel,
  ClearOpening,
  DesignMovement,
  FrameSeal,
  FramesOption,
  PassThroughAllowances,
  PassThroughInput,
  PassThroughOption,
  PassThroughResult,
} from './pass-through';
export type { SealFacts } from './seal-reason';
export { MM_WORDS } from './length-words';
export type { LengthWords } from './length-words';
export { measureReasons } from './measure-reasons';
export type { MeasureTerms, ReasonParameters } from './measure-reasons';
export { BASELINE_TWIST_NOTE_DEG, readingRemarks } from './reading-remarks';
export type { ReadingFacts } from './reading-remarks';
export type { BootSpanInput, BootSpanResult, SealCheck, SealSpec, SideSpan } from './boot';
export { compareSessions, poseSummaries } from './compare-sessions';
export type { SessionComparison, SessionForComparison, SessionPoseSummary } from './compare-sessions';
export { DEMO_MOTION_PER_DEG, DEMO_OUTLINE, buildSyntheticSession, seededNormal, seededRandom, syntheticEnvelopeInput } from './synthetic-session';
export type { SyntheticPose, SyntheticSession, SyntheticSessionOptions } from './synthetic-session';
