/**
 * Comparison across sessions and vehicles (docs/method.md §8): the twist each session reached, its worst
 * perimeter displacement per axis, and the slope in mm per degree of twist, so trucks tested to
 * different twists compare fairly.
 *
 * Formula: twist reached = max |twist|; worst = the value of largest |worst| (sign kept);
 * slope through the origin = Σ|twist|·|worst| / Σ twist² (least squares with no intercept:
 * no twist, no motion); null when no pose is twisted.
 * Source: least squares through the origin, Montgomery, Peck & Vining, Introduction to Linear
 * Regression Analysis (5th ed.), ch. 2 (regression through the origin).
 */
import { FlexInputError, requireFinite, requireLength } from './errors';
import type { EnvelopeResult } from './envelope';
import { AXES, type Axis } from './types';

export interface SessionPoseSummary {
  twistDeg: number;
  /** Worst perimeter displacement per axis, mm (sign kept). */
  worstMm: Record<Axis, number>;
}

export interface SessionForComparison {
  sessionId: string;
  vehicleId?: string;
  label?: string;
  poses: SessionPoseSummary[];
}

export interface SessionComparison {
  sessionId: string;
  vehicleId: string | null;
  label: string | null;
  poseCount: number;
  twistReachedDeg: number;
  worstMm: Record<Axis, number>;
  slopeMmPerDeg: Record<Axis, number | null>;
}

const FN = 'compareSessions';

/**
 * The pose summaries of a computed envelope (baseline and unfitted poses left out).
 * @param result a designEnvelope result.
 * @returns per fitted pose its twist (relative to the baseline) and worst displacement per axis.
 * @example poseSummaries(designEnvelope(input))[0].worstMm.lateral // => 41.2
 */
export function poseSummaries(result: EnvelopeResult): SessionPoseSummary[] {
  const summaries: SessionPoseSummary[] = [];
  for (const pose of result.poses) {
    if (pose.worst === null) continue;
    summaries.push({
      twistDeg: pose.twistDeg,
      worstMm: { foreAft: pose.worst.foreAft.valueMm, lateral: pose.worst.lateral.valueMm, vertical: pose.worst.vertical.valueMm },
    });
  }
  return summaries;
}

/**
 * Compares sessions (and so vehicles) by twist reached, worst displacement and slope per degree.
 * @param sessions each with an id, optional vehicle id and label, and its pose summaries.
 * @returns per session: poses, twist reached, worst per axis (sign kept) and slope in mm per degree (null without twist).
 * @example compareSessions([{ sessionId: 's1', poses: [{ twistDeg: 10, worstMm: { foreAft: 5,
 *   lateral: 80, vertical: 20 } }] }])[0].slopeMmPerDeg.lateral // => 8
 */
export function compareSessions(sessions: readonly SessionForComparison[]): SessionComparison[] {
  if (!Array.isArray(sessions)) throw new FlexInputError(FN, 'sessions', 'must be an array');
  return sessions.map((session, s) => {
    if (session === null || typeof session !== 'object' || typeof session.sessionId !== 'string') {
      throw new FlexInputError(FN, `sessions[${s}].sessionId`, 'must be a string');
    }
    // Typed before the check: Array.isArray would widen a typed array to any[].
    const poses: SessionPoseSummary[] = session.poses;
    if (!Array.isArray(poses) || poses.length === 0) {
      throw new FlexInputError(FN, `sessions[${s}].poses`, 'must be a non-empty array');
    }
    poses.forEach((pose, i) => {
      requireFinite(FN, `sessions[${s}].poses[${i}].twistDeg`, pose.twistDeg);
      if (Math.abs(pose.twistDeg) > 90) throw new FlexInputError(FN, `sessions[${s}].poses[${i}].twistDeg`, `must be within ±90°, got ${pose.twistDeg}`);
      for (const axis of AXES) requireLength(FN, `sessions[${s}].poses[${i}].worstMm.${axis}`, pose.worstMm?.[axis]);
    });
    const twists = poses.map((pose) => Math.abs(pose.twistDeg));
    const sxx = twists.reduce((sum, x) => sum + x * x, 0);
    const worstMm = {} as Record<Axis, number>;
    const slopeMmPerDeg = {} as Record<Axis, number | null>;
    for (const axis of AXES) {
      let worst = 0;
      let sxy = 0;
      poses.forEach((pose, i) => {
        const value = pose.worstMm[axis];
        if (Math.abs(value) > Math.abs(worst)) worst = value;
        sxy += twists[i] * Math.abs(value);
      });
      worstMm[axis] = worst;
      slopeMmPerDeg[axis] = sxx > 0 ? sxy / sxx : null;
    }
    return {
      sessionId: session.sessionId,
      vehicleId: session.vehicleId ?? null,
      label: session.label ?? null,
      poseCount: session.poses.length,
      twistReachedDeg: Math.max(...twists),
      worstMm,
      slopeMmPerDeg,
    };
  });
}
