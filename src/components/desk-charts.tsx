// The desk's charts, in one module loaded on demand (React.lazy), so recharts forms a single lazy
// chunk: out of the initial JavaScript and out of the service worker's precache (vite.config.ts).
import { Bar, BarChart, CartesianGrid, ComposedChart, Legend, Line, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { linearFit, type EnvelopeResult } from '@shared/flex';
import type { UnitSystem } from '@shared/schemas/common';
import type { ComparedSession } from '@shared/schemas/envelope';
import { fromDisplay, toDisplay } from '@shared/units';
import { AXIS_NAMES, formatSlopeValue } from '@shared/format';

const AXES = ['foreAft', 'lateral', 'vertical'] as const;
const STEPS = 24;

/** Worst perimeter displacement against twist per axis, with the fitted line and the upper bound. */
export function TwistChart({ result, unit }: { result: EnvelopeResult; unit: UnitSystem }) {
  const p = result.parameters;
  const measured = result.poses.filter((pose) => pose.worst !== null);
  const twists = measured.map((pose) => Math.abs(pose.twistDeg));
  const xMax = Math.max(p.designTwistDeg, ...twists) * 1.05;
  return (
    <div className="grid gap-4 lg:grid-cols-3">
      {AXES.map((axis) => {
        const a = result.axes[axis];
        const worsts = measured.map((pose) => Math.abs(pose.worst![axis].valueMm));
        const points = measured.map((pose, i) => ({ x: twists[i], y: toDisplay(worsts[i], unit), pose: pose.poseId }));
        let line: { x: number; fit: number; bound: number }[] = [];
        if (p.method === 'prediction' && a.fit !== null) {
          const fit = linearFit(twists, worsts, { throughOrigin: p.throughOrigin });
          line = Array.from({ length: STEPS + 1 }, (_, i) => {
            const x = (xMax * i) / STEPS;
            return { x, fit: toDisplay(fit.predict(x), unit), bound: toDisplay(fit.upperPredictionBound(x, p.confidence), unit) };
          });
        }
        return (
          <figure key={axis} className="card" aria-label={`${AXIS_NAMES[axis]} against twist`}>
            <figcaption className="font-bold">
              {AXIS_NAMES[axis]}: |worst| ({unit}) against |twist| (°)
            </figcaption>
            <ResponsiveContainer width="100%" height={240}>
              <ComposedChart margin={{ top: 8, right: 8, bottom: 8, left: 0 }}>
                <CartesianGrid stroke="#c9c3b3" />
                <XAxis type="number" dataKey="x" domain={[0, Math.ceil(xMax)]} unit="°" />
                <YAxis type="number" width={48} />
                <Tooltip formatter={(v) => (typeof v === 'number' ? v.toFixed(unit === 'mm' ? 1 : 2) : String(v))} labelFormatter={(x) => `${Number(x).toFixed(1)}°`} />
                <Legend />
                {line.length > 0 && <Line data={line} dataKey="fit" name="fitted line" stroke="#10333d" dot={false} isAnimationActive={false} />}
                {line.length > 0 && <Line data={line} dataKey="bound" name={`upper ${Math.round(p.confidence * 100)} % bound`} stroke="#b3261e" strokeDasharray="6 4" dot={false} isAnimationActive={false} />}
                <Scatter data={points} dataKey="y" name="poses" fill="#8a4b00" isAnimationActive={false} />
                <ReferenceLine x={p.designTwistDeg} stroke="#1e6b3a" label={{ value: 'design', position: 'insideTopRight' }} />
                {a.upperBoundMm !== null && <ReferenceLine y={toDisplay(a.upperBoundMm, unit)} stroke="#b3261e" strokeOpacity={0.4} />}
              </ComposedChart>
            </ResponsiveContainer>
          </figure>
        );
      })}
    </div>
  );
}

const COLOURS = ['#10333d', '#8a4b00', '#1e6b3a', '#b3261e', '#1f5566', '#f2a13a'];

/** Slope (displacement per degree of twist) per axis, one bar per session. */
export function CompareChart({ rows, unit }: { rows: ComparedSession[]; unit: UnitSystem }) {
  const data = AXES.map((axis) => ({
    axis: AXIS_NAMES[axis],
    ...Object.fromEntries(rows.map((r) => [r.sessionId, r.slopeMmPerDeg[axis] === null ? 0 : toDisplay(r.slopeMmPerDeg[axis]!, unit)])),
  }));
  return (
    <figure className="card" aria-label="Slope per axis">
      <figcaption className="font-bold">Slope per axis ({unit} per degree of twist)</figcaption>
      <ResponsiveContainer width="100%" height={280}>
        <BarChart data={data}>
          <CartesianGrid stroke="#c9c3b3" />
          <XAxis dataKey="axis" />
          <YAxis width={48} />
          <Tooltip formatter={(v) => (typeof v === 'number' ? formatSlopeValue(fromDisplay(v, unit), unit) : String(v))} />
          <Legend />
          {rows.map((r, i) => (
            <Bar key={r.sessionId} dataKey={r.sessionId} name={`${r.vehicleName} · ${r.testedOn}`} fill={COLOURS[i % COLOURS.length]} isAnimationActive={false} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
