import type { GaugePoint, Pose, Reading, TestSession, UnitSystem, Vehicle } from '@shared/schemas';
import { crossAxleTwistDeg } from '@shared/flex/twist';
import { rampTravelIndex, roundRti } from '@shared/flex/rti';
import { computeDisplacements } from '@shared/flex/displacements';
import { fitRelativeMotion } from '@shared/flex/relative-motion';
import { formatLength } from '@shared/units';
import { outlineOf } from '@shared/desk-envelope';

const axisName = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' } as const;

export interface PoseCheckResult {
  twistDeg: number;
  rti: number | null;
  fit: ReturnType<typeof fitRelativeMotion> | null;
  note: string | null;
  /** "pointId|axis" of readings that look inconsistent with the others. */
  suspect: Set<string>;
}

/** Twist, RTI and a rough relative-motion fit of the pose as typed so far (shared/flex). */
export function checkPose(
  vehicle: Vehicle,
  session: TestSession,
  points: GaugePoint[],
  pose: Pose,
  readings: Reading[],
  baseline: Reading[] | null,
): PoseCheckResult {
  const twistDeg = crossAxleTwistDeg({ fl: pose.liftFlMm, fr: pose.liftFrMm, rl: pose.liftRlMm, rr: pose.liftRrMm }, vehicle.trackFrontMm, vehicle.trackRearMm);
  const rti = pose.kind === 'ramp' && pose.rampDistanceMm != null ? roundRti(rampTravelIndex(pose.rampDistanceMm, vehicle.wheelbaseMm)) : null;
  const result: PoseCheckResult = { twistDeg, rti, fit: null, note: null, suspect: new Set() };
  const own = readings.map((r) => ({ pointId: r.gaugePointId, axis: r.axis, value: r.valueMm }));
  if (!own.length) return { ...result, note: 'No readings yet.' };
  let values = own;
  if (session.readingMode === 'gap') {
    if (pose.kind === 'level') return { ...result, note: 'Level pose: these gaps are the baseline for the other poses.' };
    if (!baseline) return { ...result, note: 'No level pose yet: record the baseline gaps first.' };
  }
  try {
    if (session.readingMode === 'gap' && baseline) {
      values = computeDisplacements(
        baseline.map((r) => ({ pointId: r.gaugePointId, axis: r.axis, value: r.valueMm })),
        own,
      ).displacements;
      if (!values.length) return { ...result, note: 'No baseline reading at these points and axes yet.' };
    }
    const fit = fitRelativeMotion(
      points.map((p) => ({ id: p.id, y: p.yMm, z: p.zMm })),
      values,
      outlineOf(vehicle.opening),
    );
    for (const o of fit.outliers) result.suspect.add(`${o.pointId}|${o.axis}`);
    return { ...result, fit };
  } catch (err) {
    return { ...result, note: `No fit: ${(err as Error).message}` };
  }
}

export function PoseCheck({ check, points, unit }: { check: PoseCheckResult; points: GaugePoint[]; unit: UnitSystem }) {
  const label = (id: string) => points.find((p) => p.id === id)?.label ?? '?';
  const fit = check.fit;
  return (
    <section aria-label="Pose check" className="card space-y-1">
      <p className="text-xl font-bold" data-testid="pose-twist">
        Twist {check.twistDeg.toFixed(1)}°{check.rti != null && ` · RTI ${check.rti.toFixed(1)}`}
      </p>
      {check.note && <p>{check.note}</p>}
      {fit && (
        <>
          <p>
            Rough fit: lateral shift {formatLength(fit.motion.t.y, unit)}, vertical {formatLength(fit.motion.t.z, unit)}, fore-aft{' '}
            {formatLength(fit.motion.t.x, unit)}; roll {((fit.motion.omega.x * 180) / Math.PI).toFixed(2)}°; residual RMS {formatLength(fit.residualRms, unit)}.
          </p>
          {[fit.inPlane.reason, fit.outOfPlane.reason].filter(Boolean).map((r) => (
            <p key={r} className="text-sm">
              {r}
            </p>
          ))}
          {(['outOfPlane', 'inPlane'] as const)
            .filter((part) => fit[part].misfit)
            .map((part) => (
              <p key={part} role="alert" className="rounded bg-signal/25 p-2 font-bold">
                The {part === 'outOfPlane' ? 'fore-aft' : 'lateral and vertical'} readings do not agree with one another, and there are too few of them to tell
                which one is off. Re-read them if you can.
              </p>
            ))}
          {fit.outliers.map((o) => (
            <p key={`${o.pointId}${o.axis}`} role="alert" className="rounded bg-signal/25 p-2 font-bold">
              Check {label(o.pointId)} {axisName[o.axis]}: it looks inconsistent with the other readings ({formatLength(o.residual, unit)} off the fit). Re-read
              it if you can.
            </p>
          ))}
        </>
      )}
    </section>
  );
}
