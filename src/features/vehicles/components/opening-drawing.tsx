import type { GaugePoint, Opening } from '@shared/schemas';

/**
 * The pass-through opening as seen from the cab looking rearward (vehicle left on the screen's
 * right), in millimetres: y across, z up from the top of the frame rail. Tap to place a point.
 */
export function OpeningDrawing(props: { opening: Opening; points: GaugePoint[]; onPlace: (yMm: number, zMm: number) => void }) {
  const o = props.opening;
  const margin = 120;
  const left = o.centreYMm - o.widthMm / 2 - margin;
  const width = o.widthMm + 2 * margin;
  const top = o.bottomZMm + o.heightMm + margin;
  const height = o.heightMm + 2 * margin;
  // SVG y grows downward; z grows upward.
  const sx = (y: number) => y - left;
  const sy = (z: number) => top - z;
  return (
    <svg
      viewBox={`0 0 ${width} ${height}`}
      className="w-full touch-manipulation rounded-lg border-2 border-rule bg-white"
      role="img"
      aria-label="Opening drawing: tap to place a gauge point"
      onClick={(e) => {
        const svg = e.currentTarget;
        const pt = svg.createSVGPoint();
        pt.x = e.clientX;
        pt.y = e.clientY;
        const local = pt.matrixTransform(svg.getScreenCTM()!.inverse());
        props.onPlace(Math.round(local.x + left), Math.round(top - local.y));
      }}
    >
      <rect
        x={sx(o.centreYMm - o.widthMm / 2)}
        y={sy(o.bottomZMm + o.heightMm)}
        width={o.widthMm}
        height={o.heightMm}
        rx={o.cornerRadiusMm}
        fill="#f4f1e8"
        stroke="#10333d"
        strokeWidth="6"
      />
      <line x1={sx(0)} x2={sx(0)} y1="0" y2={height} stroke="#c9c3b3" strokeDasharray="12 8" strokeWidth="3" />
      <text x="12" y={height - 12} fontSize="36">
        R
      </text>
      <text x={width - 36} y={height - 12} fontSize="36">
        L
      </text>
      {props.points.map((p) => (
        <g key={p.id}>
          <circle cx={sx(p.yMm)} cy={sy(p.zMm)} r="16" fill="#b3261e" />
          <text x={sx(p.yMm) + 22} y={sy(p.zMm) - 12} fontSize="40" fontWeight="bold">
            {p.label}
          </text>
        </g>
      ))}
    </svg>
  );
}
