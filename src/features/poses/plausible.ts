// Whether a typed value is plausible for this vehicle, checked before it is saved so a misread
// tape or a slipped digit is caught while the tester still stands at the gauge point. A doubtful
// value is not refused: the tester confirms it and it is saved as typed.
//
// The bounds are this product's rule of thumb (common practice for a flex test, not a published
// limit), chosen to catch unit slips and extra digits while leaving every real reading through:
//   - a raw fore-aft gap is read with a tape across the gap: it cannot be negative, and more than
//     three times the nominal gap means the body and cab are far apart or a digit slipped;
//   - a fore-aft displacement cannot close the gap by more than the nominal gap (the cab would be
//     inside the body) and rarely opens it by more than twice that;
//   - lateral and vertical values (offsets from a mark, or displacements) beyond half the
//     opening's larger side would put the cab's edge across the middle of the pass-through;
//   - a wheel lift that tilts its axle more than 30° (lift > track × tan 30°) is beyond any pose
//     held still for readings.
import type { Axis, TestSession, UnitSystem, Vehicle } from '@shared/schemas';
import { formatLength } from '@shared/units';

type VehicleSize = Pick<Vehicle, 'nominalGapMm' | 'opening'>;

export function readingDoubt(valueMm: number, axis: Axis, mode: TestSession['readingMode'], vehicle: VehicleSize, unit: UnitSystem): string | null {
  const nominal = vehicle.nominalGapMm;
  const halfOpening = Math.max(vehicle.opening.widthMm, vehicle.opening.heightMm) / 2;
  const size = (mm: number) => formatLength(mm, unit);
  if (axis === 'foreAft' && nominal > 0) {
    if (mode === 'gap') {
      if (valueMm < 0) return 'a gap read with a tape cannot be negative.';
      if (valueMm > 3 * nominal) return `more than three times the nominal gap of ${size(nominal)}.`;
      return null;
    }
    if (valueMm < -nominal) return `it closes the gap by more than its nominal ${size(nominal)}: the cab would be inside the body.`;
    if (valueMm > 2 * nominal) return `it opens the gap by more than twice its nominal ${size(nominal)}.`;
    return null;
  }
  if (Math.abs(valueMm) > halfOpening) return `more than half the opening (${size(halfOpening)}) away.`;
  return null;
}

const MAX_AXLE_TILT_DEG = 30;

export function liftDoubt(liftMm: number, trackMm: number, unit: UnitSystem): string | null {
  const most = trackMm * Math.tan((MAX_AXLE_TILT_DEG * Math.PI) / 180);
  return Math.abs(liftMm) > most ? `it would tilt the axle more than ${MAX_AXLE_TILT_DEG}° (over ${formatLength(most, unit)} on this track).` : null;
}
