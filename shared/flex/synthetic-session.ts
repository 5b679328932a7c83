/**
 * Synthetic flex-test sessions for tests, the benchmark and demo data: an invented truck, gauge
 * points around its pass-through opening, and poses whose readings follow a rigid motion that grows
 * in proportion to the cross-axle twist, plus seeded Gaussian reading noise.
 *
 * Formula: per pose, motion = twist (deg) × motionPerDeg; readings = predictDisplacement at each point
 * + N(0, noiseSdMm²) noise (mulberry32 uniform generator, Box–Muller normal), optionally as raw gaps
 * (nominal gap + displacement) with a level baseline pose.
 * Source: the model of relative-motion.ts; Box & Muller, Ann. Math. Stat. 29 (1958) 610–611.
 *
 * Example: buildSyntheticSession({ poses: 4, seed: 1 }).poses.length // => 5 (baseline + 4)
 */
import { predictDisplacement, scaleMotion } from './predict-displacement';
import { crossAxleTwistDeg } from './twist';
import type { Axis, GaugePoint, Reading, RigidMotion, WheelLifts } from './types';
import type { OpeningOutline } from './perimeter';

export interface SyntheticPose {
  id: string;
  lifts: WheelLifts;
  readings: Reading[];
}

export interface SyntheticSessionOptions {
  /** Poses besides the level baseline; default 8. */
  poses?: number;
  /** Gauge points spread around the opening; default 12 (at least 3). */
  gaugePoints?: number;
  seed?: number;
  noiseSdMm?: number;
  /** Rigid motion per degree of twist (mm/deg and rad/deg). */
  motionPerDeg?: RigidMotion;
  /** Largest front-wheel lift in mm; poses step up to it, alternating sides. Default 450. */
  maxLiftMm?: number;
  /** 'gap' readings add the nominal gap and include a level baseline pose with raw gaps. */
  mode?: 'gap' | 'displacement';
  nominalGapMm?: number;
}

export interface SyntheticSession {
  tracks: { frontMm: number; rearMm: number };
  outline: OpeningOutline;
  gaugePoints: GaugePoint[];
  baselinePoseId: string;
  poses: SyntheticPose[];
  motionPerDeg: RigidMotion;
}

/** mulberry32: a small, well-mixed 32-bit generator; deterministic for a seed. */
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

function gaugePointsAround(outline: OpeningOutline, count: number): GaugePoint[] {
  const centreY = outline.centreY ?? 0;
  const bottomZ = outline.bottomZ ?? 0;
  const halfW = outline.width / 2;
  const points: GaugePoint[] = [];
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

export function buildSyntheticSession(options: SyntheticSessionOptions = {}): SyntheticSession {
  const poseCount = options.poses ?? 8;
  const pointCount = Math.max(3, options.gaugePoints ?? 12);
  const noiseSd = options.noiseSdMm ?? 0.5;
  const perDeg = options.motionPerDeg ?? DEMO_MOTION_PER_DEG;
  const maxLift = options.maxLiftMm ?? 450;
  const mode = options.mode ?? 'displacement';
  const nominalGap = options.nominalGapMm ?? 60;
  const normal = seededNormal(options.seed ?? 1);
  const tracks = { frontMm: 1900, rearMm: 1850 };
  const outline = DEMO_OUTLINE;
  const gaugePoints = gaugePointsAround(outline, pointCount);
  const axes: Axis[] = ['foreAft', 'lateral', 'vertical'];

  const readingsFor = (twistDeg: number, baseline: boolean): Reading[] => {
    const motion = scaleMotion(perDeg, twistDeg);
    const readings: Reading[] = [];
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

  const poses: SyntheticPose[] = [{ id: 'level', lifts: { fl: 0, fr: 0, rl: 0, rr: 0 }, readings: readingsFor(0, true) }];
  for (let i = 0; i < poseCount; i++) {
    // Step the lift up to the maximum and alternate the diagonal, as a crew works through a flex test.
    const lift = maxLift * ((Math.floor(i / 2) % 4) + 1) / 4;
    const lifts: WheelLifts = i % 2 === 0 ? { fl: lift, fr: 0, rl: 0, rr: lift * 0.8 } : { fl: 0, fr: lift, rl: lift * 0.8, rr: 0 };
    const twist = crossAxleTwistDeg(lifts, tracks.frontMm, tracks.rearMm);
    poses.push({ id: `pose-${i + 1}`, lifts, readings: readingsFor(twist, false) });
  }
  return { tracks, outline, gaugePoints, baselinePoseId: 'level', poses, motionPerDeg: perDeg };
}
