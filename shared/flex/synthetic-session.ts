/**
 * Synthetic flex-test sessions for tests, the coverage study and the benchmark: an invented truck,
 * gauge points around its pass-through opening, and poses whose readings follow a rigid motion
 * that grows in proportion to the cross-axle twist, with seeded scatter.
 *
 * Formula: per pose, motion = x · perDeg(direction) · (1 + c_p·Z₁) + (N(0, c_a²) on each translation),
 * x the twist relative to the baseline (degrees), perDeg the motion per degree for positive twist
 * or, when given, another one for negative twist (an asymmetric truck); c_p is proportional scatter
 * (the scatter of the response grows with twist), c_a constant scatter; readings =
 * predictDisplacement at each point + N(0, noiseSdMm²) reading noise (mulberry32 uniform generator,
 * Box–Muller normal), optionally as raw gaps (nominal gap + displacement) with a baseline pose.
 * Source: the model of docs/method.md §2; Box & Muller, Ann. Math. Stat. 29 (1958) 610–611.
 */
import { predictDisplacement, scaleMotion } from './predict-displacement';
import { crossAxleTwistDeg } from './twist';
import type { Axis, GaugeLocation, GaugeValue, RigidMotion, WheelLifts } from './types';
import type { OpeningOutline } from './perimeter';
import type { EnvelopeInput, ReadingMode } from './envelope';

export interface SyntheticPose {
  id: string;
  lifts: WheelLifts;
  readings: GaugeValue[];
}

export interface SyntheticSessionOptions {
  /** Poses besides the level baseline; default 8. */
  poses?: number;
  /** Gauge points spread around the opening; default 12 (at least 3). */
  gaugePoints?: number;
  seed?: number;
  noiseSdMm?: number;
  /** Rigid motion per degree of twist (mm/deg and rad/deg); for negative twist too unless the next is given. */
  motionPerDeg?: RigidMotion;
  /** Rigid motion per degree of negative twist (an asymmetric truck). */
  motionPerDegNegative?: RigidMotion;
  /** The poses' twists relative to the baseline, degrees (replaces the stepped diagonals of `poses`). */
  twistsDeg?: number[];
  /** Lifts of the baseline pose (default level). */
  baselineLifts?: WheelLifts;
  /** SD of each pose's motion as a fraction of it (scatter growing with twist), default 0. */
  proportionalScatter?: number;
  /** SD added to each translation of each pose's motion, mm (scatter not growing with twist), default 0. */
  constantScatterMm?: number;
  /** Largest front-wheel lift in mm; poses step up to it, alternating sides. Default 450. */
  maxLiftMm?: number;
  /** 'gap' readings add the nominal gap and include a level baseline pose with raw gaps. */
  mode?: 'gap' | 'displacement';
  nominalGapMm?: number;
}

export interface SyntheticSession {
  tracks: { frontMm: number; rearMm: number };
  outline: OpeningOutline;
  gaugePoints: GaugeLocation[];
  baselinePoseId: string;
  poses: SyntheticPose[];
  motionPerDeg: RigidMotion;
}

/**
 * mulberry32: a small, well-mixed 32-bit generator; deterministic for a seed.
 * @param seed any number (its low 32 bits are used). @returns a function giving uniform draws in [0, 1).
 * @example seededRandom(1)() // => 0.6270739405881613
 */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Standard normal draws from seededRandom by the Box–Muller transform.
 * @param seed any number. @returns a function giving N(0, 1) draws.
 * @example seededNormal(5)() // a deterministic N(0, 1) draw
 */
export function seededNormal(seed: number): () => number {
  const uniform = seededRandom(seed);
  return () => {
    const u = 1 - uniform();
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

/** Invented medium expedition truck: opening 700 × 900 mm, 80 mm corners, centred, 600 mm above the rail. */
export const DEMO_OUTLINE: OpeningOutline = { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 };

/** Lateral shear grows with twist and carries a roll of the cab; fore-aft and vertical stay smaller. */
export const DEMO_MOTION_PER_DEG: RigidMotion = {
  t: { x: 0.6, y: 9, z: 1.2 },
  omega: { x: 0.0012, y: 0.0002, z: -0.0004 },
};

function gaugePointsAround(outline: OpeningOutline, count: number): GaugeLocation[] {
  const centreY = outline.centreY ?? 0;
  const bottomZ = outline.bottomZ ?? 0;
  const halfW = outline.width / 2;
  const points: GaugeLocation[] = [];
  for (let i = 0; i < count; i++) {
    // Walk the rectangle's perimeter at equal steps, 30 mm inside the edge where the marks go.
    const s = (i / count) * 2 * (outline.width + outline.height);
    const inset = 30;
    let y: number;
    let z: number;
    if (s < outline.width) {
      y = centreY + halfW - s;
      z = bottomZ + outline.height;
    } else if (s < outline.width + outline.height) {
      y = centreY - halfW;
      z = bottomZ + outline.height - (s - outline.width);
    } else if (s < 2 * outline.width + outline.height) {
      y = centreY - halfW + (s - outline.width - outline.height);
      z = bottomZ;
    } else {
      y = centreY + halfW;
      z = bottomZ + (s - 2 * outline.width - outline.height);
    }
    y = Math.min(centreY + halfW - inset, Math.max(centreY - halfW + inset, y));
    z = Math.min(bottomZ + outline.height - inset, Math.max(bottomZ + inset, z));
    points.push({ id: `P${String(i + 1).padStart(2, '0')}`, y, z });
  }
  return points;
}

/** Lifts that give a twist of `twistDeg` on top of the baseline: the front axle rolled by the difference. */
function liftsFor(twistDeg: number, baseline: WheelLifts, tracks: { frontMm: number; rearMm: number }): WheelLifts {
  const baseTwist = crossAxleTwistDeg(baseline, tracks.frontMm, tracks.rearMm);
  const rearRoll = Math.atan((baseline.rl - baseline.rr) / tracks.rearMm);
  const frontRoll = ((twistDeg + baseTwist) * Math.PI) / 180 + rearRoll;
  const difference = tracks.frontMm * Math.tan(frontRoll);
  return difference >= 0 ? { fl: difference, fr: 0, rl: baseline.rl, rr: baseline.rr } : { fl: 0, fr: -difference, rl: baseline.rl, rr: baseline.rr };
}

/**
 * Builds a synthetic session (see the module comment).
 * @param options poses or explicit twists, gauge points, seed, reading noise, motion per degree (one
 *   or both directions), scatter of the response, reading mode, baseline lifts.
 * @returns tracks, outline, gauge points, the baseline pose's id and the poses (baseline first).
 * @example buildSyntheticSession({ poses: 4, seed: 1 }).poses.length // => 5 (baseline + 4)
 */
export function buildSyntheticSession(options: SyntheticSessionOptions = {}): SyntheticSession {
  const pointCount = Math.max(3, options.gaugePoints ?? 12);
  const noiseSd = options.noiseSdMm ?? 0.5;
  const perDeg = options.motionPerDeg ?? DEMO_MOTION_PER_DEG;
  const perDegNegative = options.motionPerDegNegative ?? perDeg;
  const maxLift = options.maxLiftMm ?? 450;
  const mode = options.mode ?? 'displacement';
  const nominalGap = options.nominalGapMm ?? 60;
  const proportional = options.proportionalScatter ?? 0;
  const constant = options.constantScatterMm ?? 0;
  const normal = seededNormal(options.seed ?? 1);
  const tracks = { frontMm: 1900, rearMm: 1850 };
  const outline = DEMO_OUTLINE;
  const gaugePoints = gaugePointsAround(outline, pointCount);
  const axes: Axis[] = ['foreAft', 'lateral', 'vertical'];
  const baselineLifts = options.baselineLifts ?? { fl: 0, fr: 0, rl: 0, rr: 0 };
  const baseTwist = crossAxleTwistDeg(baselineLifts, tracks.frontMm, tracks.rearMm);

  const readingsFor = (twistDeg: number, baseline: boolean): GaugeValue[] => {
    // Scatter draws only when asked for, so a seed gives the same readings as before they existed.
    const factor = proportional > 0 && !baseline ? twistDeg * (1 + proportional * normal()) : twistDeg;
    const motion = scaleMotion(twistDeg >= 0 ? perDeg : perDegNegative, factor);
    if (constant > 0 && !baseline) {
      motion.t.x += constant * normal();
      motion.t.y += constant * normal();
      motion.t.z += constant * normal();
    }
    const readings: GaugeValue[] = [];
    for (const point of gaugePoints) {
      const d = predictDisplacement(motion, point.y, point.z);
      const byAxis: Record<Axis, number> = { foreAft: d.dx, lateral: d.dy, vertical: d.dz };
      for (const axis of axes) {
        const noise = baseline && mode === 'displacement' ? 0 : noiseSd * normal();
        const offset = mode === 'gap' ? nominalGap : 0;
        readings.push({ pointId: point.id, axis, value: offset + byAxis[axis] + noise });
      }
    }
    return readings;
  };

  const poses: SyntheticPose[] = [{ id: 'level', lifts: baselineLifts, readings: readingsFor(0, true) }];
  if (options.twistsDeg !== undefined) {
    options.twistsDeg.forEach((twist, i) =>
      poses.push({ id: `pose-${i + 1}`, lifts: liftsFor(twist, baselineLifts, tracks), readings: readingsFor(twist, false) }),
    );
  } else {
    for (let i = 0; i < (options.poses ?? 8); i++) {
      // Step the lift up to the maximum and alternate the diagonal, as a crew works through a flex test.
      const lift = (maxLift * ((Math.floor(i / 2) % 4) + 1)) / 4;
      const lifts: WheelLifts = i % 2 === 0 ? { fl: lift, fr: 0, rl: 0, rr: lift * 0.8 } : { fl: 0, fr: lift, rl: lift * 0.8, rr: 0 };
      const twist = crossAxleTwistDeg(lifts, tracks.frontMm, tracks.rearMm) - baseTwist;
      poses.push({ id: `pose-${i + 1}`, lifts, readings: readingsFor(twist, false) });
    }
  }
  return { tracks, outline, gaugePoints, baselinePoseId: 'level', poses, motionPerDeg: perDeg };
}

/**
 * The envelope input of a synthetic session.
 * @param session the session. @param parameters the design parameters (designTwistDeg at least).
 * @param readingMode how its readings were built: 'displacement' (default) or 'gap'.
 * @returns the input designEnvelope takes.
 * @example designEnvelope(syntheticEnvelopeInput(buildSyntheticSession({ seed: 1 }), { designTwistDeg: 20 }))
 */
export function syntheticEnvelopeInput(
  session: SyntheticSession,
  parameters: EnvelopeInput['parameters'],
  readingMode: ReadingMode = 'displacement',
): EnvelopeInput {
  return {
    tracks: session.tracks,
    gaugePoints: session.gaugePoints,
    outline: session.outline,
    readingMode,
    baselinePoseId: session.baselinePoseId,
    poses: session.poses,
    parameters,
  };
}
