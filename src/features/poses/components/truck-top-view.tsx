import type { UnitSystem } from '@shared/schemas';
import { toDisplay } from '@shared/units';

export type Wheel = 'fl' | 'fr' | 'rl' | 'rr';
export const WHEEL_NAMES: Record<Wheel, string> = { fl: 'front left', fr: 'front right', rl: 'rear left', rr: 'rear right' };

/**
 * The truck from above, front at the top (so its left is on the screen's left). Tap a wheel to
 * choose it; a raised wheel is drawn filled, a dipped one hatched, with its lift beside it.
 */
export function TruckTopView(props: { lifts: Record<Wheel, number>; selected: Wheel | null; onSelect: (w: Wheel) => void; unit: UnitSystem }) {
  const wheels: { w: Wheel; x: number; y: number }[] = [
    { w: 'fl', x: 20, y: 40 },
    { w: 'fr', x: 160, y: 40 },
    { w: 'rl', x: 20, y: 230 },
    { w: 'rr', x: 160, y: 230 },
  ];
  return (
    <svg viewBox="0 0 200 320" className="mx-auto h-72 w-auto select-none" role="group" aria-label="Truck seen from above, front at the top">
      <defs>
        <pattern id="dip" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <line x1="0" y1="0" x2="0" y2="6" stroke="#0d1b1e" strokeWidth="3" />
        </pattern>
      </defs>
      <rect x="50" y="20" width="100" height="70" rx="10" fill="#1f5566" />
      <text x="100" y="60" textAnchor="middle" fill="#f4f1e8" fontSize="14">
        cab
      </text>
      <rect x="45" y="100" width="110" height="200" rx="6" fill="#c9c3b3" stroke="#0d1b1e" strokeWidth="2" />
      <text x="100" y="205" textAnchor="middle" fontSize="14">
        body
      </text>
      {wheels.map(({ w, x, y }) => {
        const lift = props.lifts[w];
        const fill = lift > 0 ? '#f2a13a' : lift < 0 ? 'url(#dip)' : '#ffffff';
        const shown = lift === 0 ? '0' : toDisplay(lift, props.unit).toFixed(props.unit === 'in' ? 1 : 0);
        return (
          // The name starts with the number drawn beside the wheel, so speech input can say it too.
          <g
            key={w}
            role="button"
            tabIndex={0}
            aria-label={`${shown} ${props.unit} lift, wheel ${WHEEL_NAMES[w]}`}
            aria-pressed={props.selected === w}
            onClick={() => props.onSelect(w)}
            onKeyDown={(e) => (e.key === 'Enter' || e.key === ' ') && props.onSelect(w)}
            className="cursor-pointer"
          >
            <rect
              x={x}
              y={y}
              width="22"
              height="50"
              rx="5"
              fill={fill}
              stroke={props.selected === w ? '#b3261e' : '#0d1b1e'}
              strokeWidth={props.selected === w ? 5 : 2}
            />
            {/* A generous invisible target for gloved thumbs. */}
            <rect x={x - 15} y={y - 15} width="52" height="80" fill="transparent" />
            <text x={x + 11} y={y + 68} textAnchor="middle" fontSize="12" fontWeight="bold">
              {shown}
            </text>
          </g>
        );
      })}
    </svg>
  );
}
