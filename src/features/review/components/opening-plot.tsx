import { useState } from 'react';
import { predictDisplacement, sampleOutline, type EnvelopeResult } from '@shared/flex';
import { outlineOf, poseKeys } from '@shared/desk-envelope';
import type { UnitSystem } from '@shared/schemas/common';
import { formatLength } from '@shared/format';
import type { SessionReview } from '../api/get-review';

/** A round magnification (1, 2 or 5 × 10ⁿ) that makes the largest shear about a tenth of the opening. */
function niceMagnification(largestShearMm: number, openingMm: number): number {
  if (largestShearMm <= 0) return 1;
  const raw = (0.1 * openingMm) / largestShearMm;
  if (raw <= 1) return 1;
  const power = 10 ** Math.floor(Math.log10(raw));
  return [5, 2, 1].map((m) => m * power).find((m) => m <= raw) ?? power;
}

/**
 * The opening to scale (seen from the cab, looking rearward: the vehicle's left on the right) with
 * the gauge points, and the outline displaced in its plane (lateral, vertical) by the chosen pose's
 * fitted motion, magnified so it can be seen.
 */
export function OpeningPlot({ review, result, unit }: { review: SessionReview; result: EnvelopeResult | null; unit: UnitSystem }) {
  const keys = poseKeys(review.poses);
  const fitted = (result?.poses ?? []).filter((p) => p.fit !== null);
  const [poseKey, setPoseKey] = useState<string>(
    () => fitted.reduce((a, b) => (Math.abs(b.twistDeg) > Math.abs(a?.twistDeg ?? 0) ? b : a), fitted[0])?.poseId ?? '',
  );
  const o = review.vehicle.opening;
  const outline = sampleOutline(outlineOf(o), 10);
  const pose = fitted.find((p) => p.poseId === poseKey) ?? null;
  const shear = pose
    ? Math.max(
        ...outline.map((p) => {
          const d = predictDisplacement(pose.fit!.motion, p.y, p.z);
          return Math.hypot(d.dy, d.dz);
        }),
      )
    : 0;
  const k = niceMagnification(shear, Math.min(o.widthMm, o.heightMm));
  const pad = 0.25 * Math.max(o.widthMm, o.heightMm);
  const top = o.bottomZMm + o.heightMm;
  // SVG y grows downward: z is flipped about the opening's top.
  const sx = (y: number) => y - o.centreYMm + o.widthMm / 2 + pad;
  const sy = (z: number) => top - z + pad;
  const path = (pts: { y: number; z: number }[]) => `M ${pts.map((p) => `${sx(p.y).toFixed(1)} ${sy(p.z).toFixed(1)}`).join(' L ')} Z`;
  const displaced = pose
    ? outline.map((p) => {
        const d = predictDisplacement(pose.fit!.motion, p.y, p.z);
        return { y: p.y + k * d.dy, z: p.z + k * d.dz };
      })
    : [];
  const labelFor = new Map([...keys].map(([id, key]) => [key, review.poses.find((p) => p.id === id)?.label || key]));

  return (
    <figure className="card">
      <figcaption className="mb-2 flex flex-wrap items-end gap-3">
        <span className="font-bold">
          Opening {formatLength(o.widthMm, unit)} × {formatLength(o.heightMm, unit)}, seen from the cab
        </span>
        <label className="block">
          <span className="field-label">Pose</span>
          <select className="input" value={poseKey} onChange={(e) => setPoseKey(e.target.value)}>
            {fitted.map((p) => (
              <option key={p.poseId} value={p.poseId}>
                {labelFor.get(p.poseId)} ({p.twistDeg.toFixed(1)}°)
              </option>
            ))}
          </select>
        </label>
        {pose && <span aria-label="magnification">displacement shown × {k}</span>}
      </figcaption>
      <svg
        viewBox={`0 0 ${o.widthMm + 2 * pad} ${o.heightMm + 2 * pad}`}
        className="h-auto w-full max-w-xl"
        role="img"
        aria-label="Opening drawn to scale with the displaced outline"
      >
        <path d={path(outline)} fill="#f4f1e8" stroke="#0d1b1e" strokeWidth={4} />
        {pose && <path d={path(displaced)} fill="none" stroke="#b3261e" strokeWidth={4} strokeDasharray="14 8" />}
        {review.gaugePoints.map((g) => (
          <g key={g.id}>
            <circle cx={sx(g.yMm)} cy={sy(g.zMm)} r={10} fill="#8a4b00" />
            <text x={sx(g.yMm) + 14} y={sy(g.zMm) - 10} fontSize={Math.max(28, o.widthMm / 25)} fontWeight="bold" fill="#0d1b1e">
              {g.label}
            </text>
          </g>
        ))}
      </svg>
      <p className="text-sm">
        Solid: the opening at rest. Dashed: the cab's edge displaced in the opening's plane by the pose's fitted motion, magnified × {k}.
      </p>
    </figure>
  );
}
