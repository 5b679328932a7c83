// Loaded on demand (React.lazy): recharts stays out of the initial JavaScript.
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ComparedSession } from '@shared/schemas/envelope';
import type { UnitSystem } from '@shared/schemas/common';
import { AXIS_NAMES, formatSlopeValue } from '@shared/format';
import { fromDisplay, toDisplay } from '@shared/units';

const COLOURS = ['#10333d', '#8a4b00', '#1e6b3a', '#b3261e', '#1f5566', '#f2a13a'];

/** Slope (displacement per degree of twist) per axis, one bar per session. */
export default function CompareChart({ rows, unit }: { rows: ComparedSession[]; unit: UnitSystem }) {
  const data = (['foreAft', 'lateral', 'vertical'] as const).map((axis) => ({
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
