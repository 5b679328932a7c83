/**
 * The pass-through opening's outline and the extreme displacements anywhere on it.
 *
 * Shape: a rectangle with rounded corners in the front wall of the body (plane x = 0), width along y,
 * height along z; y from the vehicle centreline (+ left, ISO 8855), z from the top of the frame rail.
 * The opening spans y in [centreY − width/2, centreY + width/2] and z in [bottomZ, bottomZ + height].
 * Side names follow the vehicle: 'left' is the +y edge (the vehicle's left), 'right' the −y edge;
 * corners are 'topLeft', 'topRight', 'bottomLeft', 'bottomRight'.
 *
 * perimeterWorst: each displacement component is affine in (y, z) under a rigid motion,
 * value = c0 + cy·y + cz·z, so its largest value on the outline is the support function of the
 * rounded rectangle in the direction g = (cy, cz): the inner rectangle's corner (inset by the
 * radius r) that g points to, plus r·|g|, reached at that corner's arc point facing g. Where g is
 * parallel to a side, the whole side ties and its midpoint is reported; the smallest value is the
 * same in the direction −g. Exact (the limit of sampling ever more finely) and O(1) per component.
 * sampleOutline: points every `stepMm` (or closer) along the outline, arcs included, for drawing.
 * Source: support function of a convex set, Rockafellar, Convex Analysis (1970), §13; the support
 * function of a Minkowski sum is the sum of the support functions (same §13).
 */
import { FlexInputError, requireFinite, requireLength, requireMotion, requireNonNegative, requirePositiveLength } from './errors';
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

/** A displacement component's value at a point of the outline. */
export interface OutlineValue {
  valueMm: number;
  y: number;
  z: number;
  side: OutlineSide;
}

/** One component on the outline: `valueMm` and its place are the largest |value| (sign kept). */
export interface AxisWorst extends OutlineValue {
  /** The largest value (e.g. the widest opening of the gap for fore-aft). */
  highest: OutlineValue;
  /** The smallest value (e.g. the most closing of the gap for fore-aft). */
  lowest: OutlineValue;
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
}

/**
 * Checks an opening outline.
 * @param fn the calling function's name, for the error. @param outline the outline to check.
 * @returns nothing; throws FlexInputError naming the bad field.
 * @example validateOutline('designEnvelope', { width: 700, height: 900, cornerRadius: 80 }) // no error
 */
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
  return { left, right, top, bottom, r: outline.cornerRadius };
}

/** The corner arcs, anticlockwise from the top left; angles in the (y, z) plane from +y towards +z. */
function arcsOf(g: Geometry): Arc[] {
  const { left, right, top, bottom, r } = g;
  return [
    { side: 'topLeft', cy: left - r, cz: top - r, from: 0, to: Math.PI / 2 },
    { side: 'topRight', cy: right + r, cz: top - r, from: Math.PI / 2, to: Math.PI },
    { side: 'bottomRight', cy: right + r, cz: bottom + r, from: Math.PI, to: (3 * Math.PI) / 2 },
    { side: 'bottomLeft', cy: left - r, cz: bottom + r, from: (3 * Math.PI) / 2, to: 2 * Math.PI },
  ];
}

/**
 * The corners of an opening's bounding rectangle (the outline lies inside it).
 * @param outline the opening. @returns [y0, z0, …, y3, z3], anticlockwise from the bottom left.
 * @example outlineCorners({ width: 700, height: 900, cornerRadius: 80, bottomZ: 600 }) // => [350, 600, 350, 1500, -350, 1500, -350, 600]
 */
export function outlineCorners(outline: OpeningOutline): number[] {
  const g = geometry(outline);
  return [g.left, g.bottom, g.left, g.top, g.right, g.top, g.right, g.bottom];
}

/**
 * Where the outline is farthest in the direction (dy, dz): y and z written to out[at], out[at + 1],
 * the side returned. The one place this is worked out, for the objects of perimeterWorst and the
 * numbers of outlineExtremesOn alike, so both give the same bits.
 */
function supportAt(g: Geometry, dy: number, dz: number, out: Float64Array, at: number): OutlineSide {
  let y: number;
  let z: number;
  let side: OutlineSide;
  if (dy === 0 && dz === 0) {
    y = (g.left + g.right) / 2;
    z = g.top;
    side = 'top';
  } else if (dy === 0) {
    y = (g.left + g.right) / 2;
    z = dz > 0 ? g.top : g.bottom;
    side = dz > 0 ? 'top' : 'bottom';
  } else if (dz === 0) {
    y = dy > 0 ? g.left : g.right;
    z = (g.top + g.bottom) / 2;
    side = dy > 0 ? 'left' : 'right';
  } else {
    const length = Math.hypot(dy, dz);
    y = (dy > 0 ? g.left - g.r : g.right + g.r) + (g.r * dy) / length;
    z = (dz > 0 ? g.top - g.r : g.bottom + g.r) + (g.r * dz) / length;
    side = dz > 0 ? (dy > 0 ? 'topLeft' : 'topRight') : dy > 0 ? 'bottomLeft' : 'bottomRight';
  }
  out[at] = y;
  out[at + 1] = z;
  return side;
}

/**
 * Whether a component's lowest value, not its highest, is its largest |value| (a tie goes to the
 * highest). One rule for perimeterWorst and the envelope's measures.
 * @param highest the largest value. @param lowest the smallest value. @returns true when |lowest| wins.
 * @example lowestIsWorst(3, -5) // => true
 */
export function lowestIsWorst(highest: number, lowest: number): boolean {
  return Math.abs(lowest) > Math.abs(highest) * (1 + 1e-12);
}

/** Where support() works its point out: a value read straight back, so no object is kept. */
const place = new Float64Array(2);

/** The point of the outline that is farthest in the direction (dy, dz), with the value there. */
function support(g: Geometry, c0: number, cy: number, cz: number, dy: number, dz: number): OutlineValue {
  const side = supportAt(g, dy, dz, place, 0);
  const y = place[0];
  const z = place[1];
  return { valueMm: c0 + cy * y + cz * z, y, z, side };
}

function extremesOf(g: Geometry, c0: number, cy: number, cz: number): AxisWorst {
  const highest = support(g, c0, cy, cz, cy, cz);
  const lowest = support(g, c0, cy, cz, -cy, -cz);
  const worst = lowestIsWorst(highest.valueMm, lowest.valueMm) ? lowest : highest;
  return { valueMm: worst.valueMm, y: worst.y, z: worst.z, side: worst.side, highest, lowest };
}

/**
 * The extreme displacements on the opening's outline under a rigid motion, per axis.
 * @param motion the cab's small-angle motion relative to the body.
 * @param outline the opening.
 * @returns per axis the largest |value| (sign kept) with its place, and the highest and lowest values.
 * @example perimeterWorst({ t: { x: 0, y: 5, z: 0 }, omega: { x: 0, y: 0, z: 0 } },
 *   { width: 700, height: 900, cornerRadius: 80 }).lateral.valueMm // => 5
 */
export function perimeterWorst(motion: RigidMotion, outline: OpeningOutline): PerimeterWorst {
  validateOutline('perimeterWorst', outline);
  return worstOn(geometry(outline), requireMotion('perimeterWorst', 'motion', motion));
}

function worstOn(g: Geometry, motion: RigidMotion): PerimeterWorst {
  const { t, omega } = motion;
  // Each component is c0 + cy·y + cz·z (see predictDisplacement).
  return {
    foreAft: extremesOf(g, t.x, -omega.z, omega.y),
    lateral: extremesOf(g, t.y, 0, -omega.x),
    vertical: extremesOf(g, t.z, omega.x, 0),
  };
}

/**
 * perimeterWorst for many motions on one outline: the outline is checked once, and each motion by
 * the caller (designEnvelope checks its fitted rotations itself).
 * @param outline the opening. @returns a function from a motion to its extremes on the outline.
 * @example perimeterWorstOn(outline)(motion).lateral.valueMm // => the same as perimeterWorst(motion, outline)
 */
export function perimeterWorstOn(outline: OpeningOutline): (motion: RigidMotion) => PerimeterWorst {
  validateOutline('perimeterWorstOn', outline);
  const g = geometry(outline);
  return (motion) => worstOn(g, motion);
}

/** outlineExtremesOn's numbers per component: highest value, its y and z, lowest value, its y and z. */
export const EXTREME_STRIDE = 6;

/** One component's extremes into out[at … at + 5], as extremesOf finds them (same support point, same sum). */
function extremeNumbersInto(g: Geometry, c0: number, cy: number, cz: number, out: Float64Array, at: number): void {
  supportAt(g, cy, cz, out, at + 1);
  out[at] = c0 + cy * out[at + 1] + cz * out[at + 2];
  supportAt(g, -cy, -cz, out, at + 4);
  out[at + 3] = c0 + cy * out[at + 4] + cz * out[at + 5];
}

/**
 * perimeterWorstOn as numbers only, for designEnvelope's pose loop, which needs the extremes'
 * values and places but not the 10 objects and 27 boxed numbers of a PerimeterWorst per pose. The
 * values and places are the bits perimeterWorst gives (the same support function and sums).
 * @param outline the opening (checked here).
 * @returns a function writing, for the motion (tx, ty, tz, wx, wy, wz), per component c (0 fore-aft,
 *   1 lateral, 2 vertical) at out[EXTREME_STRIDE·c]: highest value, y, z, lowest value, y, z.
 * @example outlineExtremesOn(outline)(0, 5, 0, 0, 0, 0, out); out[6] // => 5 (lateral highest)
 */
export function outlineExtremesOn(
  outline: OpeningOutline,
): (tx: number, ty: number, tz: number, wx: number, wy: number, wz: number, out: Float64Array) => void {
  validateOutline('outlineExtremesOn', outline);
  const g = geometry(outline);
  // The components' coefficients as in worstOn.
  return (tx, ty, tz, wx, wy, wz, out) => {
    extremeNumbersInto(g, tx, -wz, wy, out, 0);
    extremeNumbersInto(g, ty, 0, -wx, out, EXTREME_STRIDE);
    extremeNumbersInto(g, tz, wx, 0, out, 2 * EXTREME_STRIDE);
  };
}

/** Most points sampleOutline will return; keeps a tiny step from exhausting memory. */
const MAX_SAMPLES = 1_000_000;

/**
 * Points along the opening's outline, for drawing.
 * @param outline the opening. @param stepMm the largest gap between neighbouring points (default 5).
 * @returns the points, anticlockwise in (y, z) from the lower end of the left side, arcs included.
 * @example sampleOutline({ width: 700, height: 900, cornerRadius: 80 }, 5).length // => 622
 */
export function sampleOutline(outline: OpeningOutline, stepMm = 5): OutlinePoint[] {
  const fn = 'sampleOutline';
  validateOutline(fn, outline);
  requireFinite(fn, 'stepMm', stepMm);
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
  const [topLeft, topRight, bottomRight, bottomLeft] = arcsOf(g);
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
