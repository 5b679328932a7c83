// The desk's charts, in one module loaded on demand (React.lazy), so recharts forms a single lazy
// chunk: out of the initial JavaScript and out of the service worker's precache (vite.config.ts).
import { Bar, BarChart, CartesianGrid, ComposedChart, Legend, Line, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import { ENVELOPE_MEASURES, TWIST_DIRECTION_NAMES, studentTQuantile, upperPredictionBoundAt, type EnvelopeResult } from '@shared/flex';
import type { UnitSystem } from '@shared/schemas/common';
import type { ComparedSession } from '@shared/schemas/envelope';
import { fromDisplay, toDisplay } from '@shared/units';
import { AXIS_NAMES, MEASURE_NAMES, formatSlopeValue } from '@shared/format';

const AXES = ['foreAft', 'lateral', 'vertical'] as const;
const STEPS = 24;
const LINE_COLOURS = { positive: '#10333d', negative: '#1f5566' } as const;

/**
 * Each envelope measure against the twist relative to the baseline (FL–RR + to the right, FR–RL −
 * to the left), with each direction's fitted line and upper bound, so the engineer sees which way
 * the truck moves more.
 */
export function TwistChart({ result, unit }: { result: EnvelopeResult; unit: UnitSystem }) {
  const p = result.parameters;
  const measured = result.poses.filter((pose) => pose.measures !== null);
  const xMax = Math.max(p.designTwistDeg, ...measured.map((pose) => Math.abs(pose.twistDeg))) * 1.05;
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {ENVELOPE_MEASURES.map((measure) => {
        const m = result.measures[measure];
        const points = measured.map((pose) => ({ x: pose.twistDeg, y: toDisplay(pose.measures![measure].valueMm, unit), pose: pose.poseId }));
        const lines = (['positive', 'negative'] as const).flatMap((direction) => {
          const fit = m.directions[direction].fit;
          if (p.method !== 'prediction' || fit === null) return [];
          const t = studentTQuantile(p.confidence, fit.df);
          const sign = direction === 'positive' ? 1 : -1;
          const data = Array.from({ length: STEPS }, (_, i) => {
            const x = (xMax * (i + 1)) / STEPS;
            return {
              x: sign * x,
              fit: toDisplay(fit.intercept + fit.slope * x, unit),
              bound: toDisplay(upperPredictionBoundAt(fit, x, p.confidence, t), unit),
            };
          });
          return [{ direction, data }];
        });
        return (
          <figure key={measure} className="card" aria-label={`${MEASURE_NAMES[measure]} against twist`}>
            <figcaption className="font-bold">
              {MEASURE_NAMES[measure]} ({unit}) against twist (°, relative to the baseline)
            </figcaption>
            <ResponsiveContainer width="100%" height={240}>
              <ComposedChart margin={{ top: 8, right: 8, bottom: 8, left: 0 }}>
                <CartesianGrid stroke="#c9c3b3" />
                <XAxis type="number" dataKey="x" domain={[-Math.ceil(xMax), Math.ceil(xMax)]} unit="°" />
                <YAxis type="number" width={48} />
                <Tooltip
                  formatter={(v) => (typeof v === 'number' ? v.toFixed(unit === 'mm' ? 1 : 2) : String(v))}
                  labelFormatter={(x) => `${Number(x).toFixed(1)}°`}
                />
                <Legend />
                {lines.map(({ direction, data }) => (
                  <Line
                    key={`fit-${direction}`}
                    data={data}
                    dataKey="fit"
                    name={`fitted line, ${TWIST_DIRECTION_NAMES[direction]}`}
                    stroke={LINE_COLOURS[direction]}
                    dot={false}
                    isAnimationActive={false}
                  />
                ))}
                {lines.map(({ direction, data }) => (
                  <Line
                    key={`bound-${direction}`}
                    data={data}
                    dataKey="bound"
                    name={`upper ${Math.round(p.confidence * 100)} % bound, ${TWIST_DIRECTION_NAMES[direction]}`}
                    stroke="#b3261e"
                    strokeDasharray="6 4"
                    dot={false}
                    isAnimationActive={false}
                  />
                ))}
                <Scatter data={points} dataKey="y" name="poses" fill="#8a4b00" isAnimationActive={false} />
                <ReferenceLine x={p.designTwistDeg} stroke="#1e6b3a" label={{ value: 'design', position: 'insideTopRight' }} />
                <ReferenceLine x={-p.designTwistDeg} stroke="#1e6b3a" label={{ value: 'design', position: 'insideTopLeft' }} />
                {m.upperBoundMm !== null && <ReferenceLine y={toDisplay(m.upperBoundMm, unit)} stroke="#b3261e" strokeOpacity={0.4} />}
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
            <Bar
              key={r.sessionId}
              dataKey={r.sessionId}
              name={`${r.vehicleName} · ${r.testedOn}`}
              fill={COLOURS[i % COLOURS.length]}
              isAnimationActive={false}
            />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
