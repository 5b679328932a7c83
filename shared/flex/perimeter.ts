/**
 * The pass-through opening's outline and the worst displacement anywhere on it.
 *
 * Shape: a rectangle with rounded corners in the front wall of the body (plane x = 0), width along y,
 * height along z; y from the vehicle centreline (+ left, ISO 8855), z from the top of the frame rail.
 * The opening spans y in [centreY − width/2, centreY + width/2] and z in [bottomZ, bottomZ + height].
 * Side names follow the vehicle: 'left' is the +y edge (the vehicle's left), 'right' the −y edge;
 * corners are 'topLeft', 'topRight', 'bottomLeft', 'bottomRight'.
 *
 * perimeterWorst: each displacement component is affine in (y, z) under a rigid motion, so its
 * extremes on the outline lie at a straight edge's ends or at an arc's stationary point, where the
 * arc's normal is parallel to the gradient. Evaluating those few candidates gives the exact worst
 * (largest absolute value, sign kept) — the limit of sampling ever more finely — in O(1) per pose.
 * Ties go to the midpoint of a straight side, then to an arc point.
 * sampleOutline: points every `stepMm` (or closer) along the outline, arcs included, for drawing.
 * Source: support function of a convex set (Rockafellar, Convex Analysis, §13).
 *
 * Example: perimeterWorst({ t: { x: 0, y: 5, z: 0 }, omega: { x: 0, y: 0, z: 0 } },
 *   { width: 700, height: 900, cornerRadius: 80 }).lateral.valueMm // => 5
 */
import { FlexInputError, requireLength, requireNonNegative, requirePositiveLength } from './errors';
import type { Axis, RigidMotion } from './types';

export interface OpeningOutline {
  width: number;
  height: number;
  cornerRadius: number;
  /** y of the opening's centre, default 0 (on the centreline). */
  centreY?: number;
  /** z of the opening's bottom edge above the top of the frame rail, default 0. */
  bottomZ?: number;
}

export type StraightSide = 'top' | 'bottom' | 'left' | 'right';
export type OutlineSide = StraightSide | 'topLeft' | 'topRight' | 'bottomLeft' | 'bottomRight';

export interface OutlinePoint {
  y: number;
  z: number;
  side: OutlineSide;
}

export interface AxisWorst {
  /** Largest absolute displacement on the outline, sign kept (mm). */
  valueMm: number;
  y: number;
  z: number;
  side: OutlineSide;
}

export type PerimeterWorst = Record<Axis, AxisWorst>;

interface Arc {
  side: OutlineSide;
  cy: number;
  cz: number;
  from: number;
  to: number;
}

interface Geometry {
  left: number;
  right: number;
  top: number;
  bottom: number;
  r: number;
  arcs: Arc[];
}

export function validateOutline(fn: string, outline: OpeningOutline): void {
  if (outline === null || typeof outline !== 'object') throw new FlexInputError(fn, 'outline', 'must be an object');
  requirePositiveLength(fn, 'outline.width', outline.width);
  requirePositiveLength(fn, 'outline.height', outline.height);
  requireLength(fn, 'outline.cornerRadius', outline.cornerRadius);
  requireNonNegative(fn, 'outline.cornerRadius', outline.cornerRadius);
  if (outline.cornerRadius > Math.min(outline.width, outline.height) / 2) {
    throw new FlexInputError(fn, 'outline.cornerRadius', `must be at most half the smaller of width and height, got ${outline.cornerRadius}`);
  }
  if (outline.centreY !== undefined) requireLength(fn, 'outline.centreY', outline.centreY);
  if (outline.bottomZ !== undefined) requireLength(fn, 'outline.bottomZ', outline.bottomZ);
}

function geometry(outline: OpeningOutline): Geometry {
  const centreY = outline.centreY ?? 0;
  const bottom = outline.bottomZ ?? 0;
  const left = centreY + outline.width / 2;
  const right = centreY - outline.width / 2;
  const top = bottom + outline.height;
  const r = outline.cornerRadius;
  // Arc angles measured in the (y, z) plane from +y towards +z.
  const arcs: Arc[] = [
    { side: 'topLeft', cy: left - r, cz: top - r, from: 0, to: Math.PI / 2 },
    { side: 'topRight', cy: right + r, cz: top - r, from: Math.PI / 2, to: Math.PI },
    { side: 'bottomRight', cy: right + r, cz: bottom + r, from: Math.PI, to: (3 * Math.PI) / 2 },
    { side: 'bottomLeft', cy: left - r, cz: bottom + r, from: (3 * Math.PI) / 2, to: 2 * Math.PI },
  ];
  return { left, right, top, bottom, r, arcs };
}

/** Coefficients of one displacement component, value = c0 + cy·y + cz·z (see predictDisplacement). */
function affine(motion: RigidMotion, axis: Axis): [number, number, number] {
  const { t, omega } = motion;
  if (axis === 'foreAft') return [t.x, -omega.z, omega.y];
  if (axis === 'lateral') return [t.y, 0, -omega.x];
  return [t.z, omega.x, 0];
}

function candidates(g: Geometry, cy: number, cz: number): OutlinePoint[] {
  const midY = (g.left + g.right) / 2;
  const midZ = (g.top + g.bottom) / 2;
  const points: OutlinePoint[] = [
    { y: midY, z: g.top, side: 'top' },
    { y: midY, z: g.bottom, side: 'bottom' },
    { y: g.left, z: midZ, side: 'left' },
    { y: g.right, z: midZ, side: 'right' },
  ];
  const gradient = Math.hypot(cy, cz);
  for (const arc of g.arcs) {
    if (g.r > 0 && gradient > 0) {
      for (const direction of [1, -1]) {
        let angle = Math.atan2(direction * cz, direction * cy);
        if (angle < 0) angle += 2 * Math.PI;
        if (angle >= arc.from && angle <= arc.to) {
          points.push({ y: arc.cy + g.r * Math.cos(angle), z: arc.cz + g.r * Math.sin(angle), side: arc.side });
        }
      }
    }
    points.push({ y: arc.cy + g.r * Math.cos(arc.from), z: arc.cz + g.r * Math.sin(arc.from), side: arc.side });
    points.push({ y: arc.cy + g.r * Math.cos(arc.to), z: arc.cz + g.r * Math.sin(arc.to), side: arc.side });
  }
  return points;
}

/** Worst point of the outline for one affine component: the candidate with the largest |value|. */
function worstOf(g: Geometry, c0: number, cy: number, cz: number): AxisWorst {
  let best: AxisWorst | null = null;
  for (const p of candidates(g, cy, cz)) {
    const value = c0 + cy * p.y + cz * p.z;
    if (best === null || Math.abs(value) > Math.abs(best.valueMm) + 1e-9 * (1 + Math.abs(best.valueMm))) {
      best = { valueMm: value, y: p.y, z: p.z, side: p.side };
    }
  }
  return best as AxisWorst;
}

export function perimeterWorst(motion: RigidMotion, outline: OpeningOutline): PerimeterWorst {
  validateOutline('perimeterWorst', outline);
  const g = geometry(outline);
  const result = {} as PerimeterWorst;
  for (const axis of ['foreAft', 'lateral', 'vertical'] as const) {
    const [c0, cy, cz] = affine(motion, axis);
    result[axis] = worstOf(g, c0, cy, cz);
  }
  return result;
}

/** Most points sampleOutline will return; keeps a tiny step from exhausting memory. */
const MAX_SAMPLES = 1_000_000;

export function sampleOutline(outline: OpeningOutline, stepMm = 5): OutlinePoint[] {
  const fn = 'sampleOutline';
  validateOutline(fn, outline);
  requirePositiveLength(fn, 'stepMm', stepMm);
  const g = geometry(outline);
  const perimeter = 2 * (outline.width + outline.height - 4 * g.r) + 2 * Math.PI * g.r;
  if (perimeter / stepMm > MAX_SAMPLES) {
    throw new FlexInputError(fn, 'stepMm', `gives more than ${MAX_SAMPLES} points for this outline; use a larger step`);
  }
  const points: OutlinePoint[] = [];
  const line = (side: OutlineSide, y0: number, z0: number, y1: number, z1: number): void => {
    const length = Math.hypot(y1 - y0, z1 - z0);
    if (length === 0) return;
    const pieces = Math.max(1, Math.ceil(length / stepMm));
    for (let i = 0; i < pieces; i++) {
      const f = i / pieces;
      points.push({ y: y0 + f * (y1 - y0), z: z0 + f * (z1 - z0), side });
    }
  };
  const arc = (a: Arc): void => {
    if (g.r === 0) return;
    const pieces = Math.max(1, Math.ceil((g.r * (a.to - a.from)) / stepMm));
    for (let i = 0; i < pieces; i++) {
      const angle = a.from + ((a.to - a.from) * i) / pieces;
      points.push({ y: a.cy + g.r * Math.cos(angle), z: a.cz + g.r * Math.sin(angle), side: a.side });
    }
  };
  const [topLeft, topRight, bottomRight, bottomLeft] = g.arcs;
  // Anticlockwise in the (y, z) plane, starting at the lower end of the left side.
  line('left', g.left, g.bottom + g.r, g.left, g.top - g.r);
  arc(topLeft);
  line('top', g.left - g.r, g.top, g.right + g.r, g.top);
  arc(topRight);
  line('right', g.right, g.top - g.r, g.right, g.bottom + g.r);
  arc(bottomRight);
  line('bottom', g.right + g.r, g.bottom, g.left - g.r, g.bottom);
  arc(bottomLeft);
  return points;
}
