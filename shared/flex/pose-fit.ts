/**
 * The least-squares core of the relative-motion fit of one pose, on flat arrays (no objects per
 * reading), shared by fitRelativeMotion (one pose, as typed in the field) and designEnvelope (every
 * pose of a session). Callers validate; this module only computes. See docs/method.md §2–§3.
 *
 * Model (d = t + omega × r, r = (0, y, z)): dx = tx + wy·z − wz·y ; dy = ty − wx·z ; dz = tz + wx·y.
 * Two independent parts, each an ordinary least-squares problem on centred coordinates, whose
 * normal equations are (block-)diagonal and so solved in closed form:
 * - out-of-plane (tx, wy, wz) from fore-aft readings: dx = c + wy·(z − z̄) − wz·(y − ȳ);
 * - in-plane (ty, tz, wx) from lateral and vertical readings together:
 *   dy = ty₀ − wx·(z − z̄_lateral), dz = tz₀ + wx·(y − ȳ_vertical); the three columns are orthogonal.
 * Identifiability is judged against the opening, not in absolute millimetres: a model is used only
 * if the 1-SD error of its prediction at every corner of the opening's bounding rectangle is at
 * most MAX_EDGE_ERROR_RATIO reading SDs, i.e. the edge leverage h(q) = g(q)ᵀ(XᵀX)⁻¹g(q) ≤ 100 (the
 * largest of a convex quadratic over the rounded outline is at most its largest over those corners).
 * Otherwise the part falls back: out-of-plane from 3 parameters to the tilt along the points'
 * principal line (2), then to the translation (1); in-plane from the roll wx to translations only.
 * Per reading: residual eᵢ, leverage hᵢ, the standardized residual eᵢ/√(1 − hᵢ) (the deleted
 * residual eᵢ/(1 − hᵢ) divided by its unit standard error) and the deleted residual SD
 * s₍ᵢ₎² = (SSR − eᵢ²/(1 − hᵢ)) / (n − p − 1).
 * Per part: the unscaled covariance (XᵀX)⁻¹ of the motion parameters, so the fit's uncertainty can
 * be carried to any point of the outline: SD of the prediction = σ·√(gᵀ(XᵀX)⁻¹g).
 * All of that but the motion and the residuals depends only on where the readings were taken, so it
 * is worked out once per layout (poseLayout) and reused for every pose read at the same points; the
 * sums are taken in the same order either way, so a pose fits to the same bits with or without it.
 * Source: docs/method.md §2; Montgomery, Peck & Vining, Introduction to Linear Regression Analysis
 * (5th ed.), ch. 3 (least squares, the hat matrix, prediction variance) and §4.2.1 (scaled residuals,
 * PRESS and R-student, s₍ᵢ₎). Complexity O(readings).
 */
import type { FitPartStatus } from './types';

/**
 * Readings as parallel arrays (a whole session's, one pose at [start, start + count)); axis 0
 * fore-aft, 1 lateral, 2 vertical. The per-reading results are written into the same positions.
 */
export interface PoseBuffer {
  start: number;
  count: number;
  axis: Uint8Array;
  y: Float64Array;
  z: Float64Array;
  value: Float64Array;
  residual: Float64Array;
  leverage: Float64Array;
  /** eᵢ / √(1 − hᵢ); NaN where hᵢ ≈ 1. */
  standardized: Float64Array;
  /** s₍ᵢ₎; NaN where it has no degrees of freedom. */
  deletedSd: Float64Array;
  /** The outlier rule's score (judgeOutliers); NaN where not judged on its own. */
  score: Float64Array;
}

/**
 * A buffer for one pose of `count` readings, starting at 0.
 * @param count the number of readings. @returns empty parallel arrays of that length.
 * @example poseBuffer(18).value.length // => 18
 */
export function poseBuffer(count: number): PoseBuffer {
  return {
    start: 0,
    count,
    axis: new Uint8Array(count),
    y: new Float64Array(count),
    z: new Float64Array(count),
    value: new Float64Array(count),
    residual: new Float64Array(count),
    leverage: new Float64Array(count),
    standardized: new Float64Array(count),
    deletedSd: new Float64Array(count),
    score: new Float64Array(count),
  };
}

/** The corners of the opening's bounding rectangle: [y0, z0, y1, z1, y2, z2, y3, z3]. */
export type EdgeCorners = readonly number[];

/**
 * The most a fit may magnify a reading's SD at the opening's edge (edge leverage ≤ 100). Lenient on
 * purpose: a rotation the layout determines poorly only adds scatter, which the bound allows for,
 * while setting it to 0 would bias the envelope low; so only a magnification no reading could
 * support (a 30 mm patch of points spread over a 900 mm opening: about 50 times) is refused.
 */
export const MAX_EDGE_ERROR_RATIO = 10;
/** Leverage this close to 1: the reading alone fixes its fitted value, so it has no residual to judge. */
const FULL_LEVERAGE = 1 - 1e-9;

export interface PartCore {
  status: FitPartStatus;
  /** Why the part is not fully identifiable (or what it could not use); null when 'full'. */
  limitation: 'none' | 'onePoint' | 'line' | 'spread' | 'noRotation' | 'missingAxis' | null;
  readingCount: number;
  parameterCount: number;
  ssr: number;
  /** √(largest edge leverage) of the model used: the edge error per unit reading SD. */
  edgeErrorRatio: number;
  /** √(largest edge leverage) of the richer model that was refused; null when none was refused. */
  refusedEdgeErrorRatio: number | null;
  /** Unscaled covariance (XᵀX)⁻¹ of (tx, wy, wz) or (ty, tz, wx), row-major 3×3. */
  covariance: number[];
}

export interface PoseFitCore {
  tx: number;
  ty: number;
  tz: number;
  wx: number;
  wy: number;
  wz: number;
  outOfPlane: PartCore;
  inPlane: PartCore;
}

function emptyCovariance(): number[] {
  return [0, 0, 0, 0, 0, 0, 0, 0, 0];
}

/**
 * Covariance of (θ₀, θ₁, θ₂) = (c + a1·θ₁ + a2·θ₂, θ₁, θ₂) when c has variance v0 and is
 * uncorrelated with (θ₁, θ₂), whose covariance is [[m11, m12], [m12, m22]] (row-major 3×3).
 */
function shiftedCovariance(v0: number, a1: number, a2: number, m11: number, m12: number, m22: number): number[] {
  const c01 = a1 * m11 + a2 * m12;
  const c02 = a1 * m12 + a2 * m22;
  const c00 = v0 + a1 * c01 + a2 * c02;
  return [c00, c01, c02, c01, m11, m12, c02, m12, m22];
}

/** What a part's fit takes from the layout alone (its PartCore before the readings' values: ssr 0). */
type PartShape = Omit<PartCore, 'ssr'>;

interface OutOfPlaneLayout {
  shape: PartShape;
  /** Pose positions of the fore-aft readings, in order. */
  at: Int32Array;
  model: 'none' | 'full' | 'line' | 'translation';
  n: number;
  yMean: number;
  zMean: number;
  syy: number;
  szz: number;
  syz: number;
  det: number;
  /** The principal line's direction (model 'line'). */
  uy: number;
  uz: number;
  spp: number;
  /** Per fore-aft reading: y − ȳ and z − z̄ (model 'full'), or the position p along the line (model 'line'). */
  dy: Float64Array;
  dz: Float64Array;
}

interface InPlaneLayout {
  shape: PartShape;
  /** Pose positions of the lateral and vertical readings, in order. */
  at: Int32Array;
  nL: number;
  nV: number;
  zRef: number;
  yRef: number;
  s3: number;
  rotation: boolean;
  /** Per reading: its lever arm for the roll wx (−(z − z̄_lateral) or y − ȳ_vertical). */
  lever: Float64Array;
}

/**
 * Everything of a pose's fit that depends only on where its readings were taken (the axis and the
 * point of each, in order) and on the opening, not on the values read: the models chosen, the
 * leverages and the covariances. A session's poses are usually read at the same points, so
 * designEnvelope works this out once and fits each pose with it (only sums of values remain).
 */
export interface PoseLayout {
  count: number;
  outOfPlane: OutOfPlaneLayout;
  inPlane: InPlaneLayout;
  /** Per reading of the pose: hᵢ, √(1 − hᵢ) and 1 − hᵢ (NaN where hᵢ ≈ 1). */
  leverage: Float64Array;
  rootRest: Float64Array;
  rest: Float64Array;
}

function outOfPlaneLayout(b: PoseBuffer, corners: EdgeCorners, leverage: Float64Array): OutOfPlaneLayout {
  const end = b.start + b.count;
  let n = 0;
  let sy = 0;
  let sz = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    n++;
    sy += b.y[i];
    sz += b.z[i];
  }
  const at = new Int32Array(n);
  const layout: OutOfPlaneLayout = {
    shape: {
      status: 'none',
      limitation: 'none',
      readingCount: n,
      parameterCount: 0,
      edgeErrorRatio: 0,
      refusedEdgeErrorRatio: null,
      covariance: emptyCovariance(),
    },
    at,
    model: 'none',
    n,
    yMean: 0,
    zMean: 0,
    syy: 0,
    szz: 0,
    syz: 0,
    det: 0,
    uy: 0,
    uz: 0,
    spp: 0,
    dy: new Float64Array(n),
    dz: new Float64Array(n),
  };
  if (n === 0) return layout;
  const yMean = sy / n;
  const zMean = sz / n;
  let syy = 0;
  let szz = 0;
  let syz = 0;
  for (let i = b.start, k = 0; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    const dy = b.y[i] - yMean;
    const dz = b.z[i] - zMean;
    at[k] = i - b.start;
    layout.dy[k] = dy;
    layout.dz[k++] = dz;
    syy += dy * dy;
    szz += dz * dz;
    syz += dy * dz;
  }
  layout.yMean = yMean;
  layout.zMean = zMean;
  layout.syy = syy;
  layout.szz = szz;
  layout.syz = syz;
  const shape = layout.shape;
  // Full model in (c, wy, wz) with columns a = z − z̄ and b = −(y − ȳ): [[szz, −syz], [−syz, syy]].
  const det = szz * syy - syz * syz;
  layout.det = det;
  let fullRatio = Infinity;
  if (n >= 3 && det > 1e-12 * Math.max(szz * syy, 1e-300)) {
    let worst = 0;
    for (let k = 0; k < 8; k += 2) {
      const a = corners[k + 1] - zMean;
      const c = -(corners[k] - yMean);
      worst = Math.max(worst, 1 / n + (a * a * syy + 2 * a * c * syz + c * c * szz) / det);
    }
    fullRatio = Math.sqrt(worst);
  }
  if (fullRatio <= MAX_EDGE_ERROR_RATIO) {
    layout.model = 'full';
    for (let k = 0; k < n; k++) {
      const a = layout.dz[k];
      const c = -layout.dy[k];
      leverage[at[k]] = 1 / n + (a * a * syy + 2 * a * c * syz + c * c * szz) / det;
    }
    shape.status = 'full';
    shape.limitation = null;
    shape.parameterCount = 3;
    shape.edgeErrorRatio = fullRatio;
    // tx = c − wy·z̄ + wz·ȳ; (wy, wz) has covariance [[syy, syz], [syz, szz]] / det.
    shape.covariance = shiftedCovariance(1 / n, -zMean, yMean, syy / det, syz / det, szz / det);
    return layout;
  }
  // The points' principal line: the larger eigenvector of the scatter matrix [[syy, syz], [syz, szz]].
  const half = Math.sqrt(((syy - szz) / 2) ** 2 + syz * syz);
  const lambda = (syy + szz) / 2 + half;
  const raw = syz !== 0 ? [lambda - szz, syz] : syy >= szz ? [1, 0] : [0, 1];
  const length = Math.hypot(raw[0], raw[1]);
  const uy = raw[0] / length;
  const uz = raw[1] / length;
  let spp = 0;
  for (let k = 0; k < n; k++) {
    const i = b.start + at[k];
    const p = (b.y[i] - yMean) * uy + (b.z[i] - zMean) * uz;
    layout.dy[k] = p;
    spp += p * p;
  }
  let lineRatio = Infinity;
  if (n >= 2 && spp > 1e-12 * Math.max(lambda, 1e-300) * n) {
    let worst = 0;
    for (let k = 0; k < 8; k += 2) {
      const p = (corners[k] - yMean) * uy + (corners[k + 1] - zMean) * uz;
      worst = Math.max(worst, 1 / n + (p * p) / spp);
    }
    lineRatio = Math.sqrt(worst);
  }
  shape.refusedEdgeErrorRatio = Number.isFinite(fullRatio) ? fullRatio : null;
  if (lineRatio <= MAX_EDGE_ERROR_RATIO) {
    layout.model = 'line';
    layout.uy = uy;
    layout.uz = uz;
    layout.spp = spp;
    for (let k = 0; k < n; k++) leverage[at[k]] = 1 / n + (layout.dy[k] * layout.dy[k]) / spp;
    shape.status = 'partial';
    shape.limitation = 'line';
    shape.parameterCount = 2;
    shape.edgeErrorRatio = lineRatio;
    // (wy, wz) = slope·(uz, −uy), Var(slope) = 1/spp.
    shape.covariance = shiftedCovariance(1 / n, -zMean, yMean, (uz * uz) / spp, (-uz * uy) / spp, (uy * uy) / spp);
    return layout;
  }
  layout.model = 'translation';
  for (let k = 0; k < n; k++) leverage[at[k]] = 1 / n;
  shape.status = 'translationOnly';
  shape.limitation = lambda === 0 ? 'onePoint' : 'spread';
  shape.parameterCount = 1;
  shape.edgeErrorRatio = Math.sqrt(1 / n);
  if (shape.refusedEdgeErrorRatio === null && Number.isFinite(lineRatio)) shape.refusedEdgeErrorRatio = lineRatio;
  shape.covariance[0] = 1 / n;
  return layout;
}

function inPlaneLayout(b: PoseBuffer, corners: EdgeCorners, leverage: Float64Array): InPlaneLayout {
  const end = b.start + b.count;
  let nL = 0;
  let nV = 0;
  let szL = 0;
  let syV = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] === 1) {
      nL++;
      szL += b.z[i];
    } else if (b.axis[i] === 2) {
      nV++;
      syV += b.y[i];
    }
  }
  const count = nL + nV;
  const layout: InPlaneLayout = {
    shape: {
      status: 'none',
      limitation: 'none',
      readingCount: count,
      parameterCount: 0,
      edgeErrorRatio: 0,
      refusedEdgeErrorRatio: null,
      covariance: emptyCovariance(),
    },
    at: new Int32Array(count),
    nL,
    nV,
    zRef: 0,
    yRef: 0,
    s3: 0,
    rotation: false,
    lever: new Float64Array(count),
  };
  if (count === 0) return layout;
  const zRef = nL > 0 ? szL / nL : 0;
  const yRef = nV > 0 ? syV / nV : 0;
  let s3 = 0;
  for (let i = b.start, k = 0; i < end; i++) {
    if (b.axis[i] !== 1 && b.axis[i] !== 2) continue;
    const lever = b.axis[i] === 1 ? -(b.z[i] - zRef) : b.y[i] - yRef;
    layout.at[k] = i - b.start;
    layout.lever[k++] = lever;
    s3 += lever * lever;
  }
  const translations = (nL > 0 ? 1 : 0) + (nV > 0 ? 1 : 0);
  let rotationRatio = Infinity;
  if (count > translations && s3 > 1e-12 * count) {
    let worst = 0;
    for (let k = 0; k < 8; k += 2) {
      if (nL > 0) worst = Math.max(worst, 1 / nL + (corners[k + 1] - zRef) ** 2 / s3);
      if (nV > 0) worst = Math.max(worst, 1 / nV + (corners[k] - yRef) ** 2 / s3);
    }
    rotationRatio = Math.sqrt(worst);
  }
  const rotation = rotationRatio <= MAX_EDGE_ERROR_RATIO;
  layout.zRef = zRef;
  layout.yRef = yRef;
  layout.s3 = s3;
  layout.rotation = rotation;
  for (let k = 0; k < count; k++) {
    const lever = layout.lever[k];
    leverage[layout.at[k]] = (b.axis[b.start + layout.at[k]] === 1 ? 1 / nL : 1 / nV) + (rotation ? (lever * lever) / s3 : 0);
  }
  const shape = layout.shape;
  shape.parameterCount = translations + (rotation ? 1 : 0);
  shape.refusedEdgeErrorRatio = rotation || !Number.isFinite(rotationRatio) ? null : rotationRatio;
  if (rotation) {
    shape.status = translations === 2 ? 'full' : 'partial';
    shape.limitation = translations === 2 ? null : 'missingAxis';
    shape.edgeErrorRatio = rotationRatio;
  } else {
    shape.status = 'translationOnly';
    shape.limitation = 'noRotation';
    shape.edgeErrorRatio = Math.sqrt(Math.max(nL > 0 ? 1 / nL : 0, nV > 0 ? 1 / nV : 0));
  }
  // ty = ty₀ + wx·z̄_lateral, tz = tz₀ − wx·ȳ_vertical; ty₀, tz₀ and wx are uncorrelated.
  const vL = nL > 0 ? 1 / nL : 0;
  const vV = nV > 0 ? 1 / nV : 0;
  const vW = rotation ? 1 / s3 : 0;
  shape.covariance = [vL + zRef * zRef * vW, -zRef * yRef * vW, zRef * vW, -zRef * yRef * vW, vV + yRef * yRef * vW, -yRef * vW, zRef * vW, -yRef * vW, vW];
  return layout;
}

/**
 * The layout of one pose's readings (see PoseLayout): the same for every pose read at the same
 * points on the same axes in the same order.
 * @param buffer the pose's readings (axis, y and z are used; values are not).
 * @param corners the opening's bounding-rectangle corners (outlineCorners), for identifiability.
 * @returns the models, leverages and covariances of both parts.
 * @example fitPoseParts(buffer, corners, poseLayout(buffer, corners)).inPlane.status // => 'full'
 */
export function poseLayout(buffer: PoseBuffer, corners: EdgeCorners): PoseLayout {
  const leverage = new Float64Array(buffer.count);
  const outOfPlane = outOfPlaneLayout(buffer, corners, leverage);
  const inPlane = inPlaneLayout(buffer, corners, leverage);
  const rootRest = new Float64Array(buffer.count);
  const rest = new Float64Array(buffer.count);
  for (let k = 0; k < buffer.count; k++) {
    const h = leverage[k];
    rest[k] = h < FULL_LEVERAGE ? 1 - h : Number.NaN;
    rootRest[k] = Math.sqrt(rest[k]);
  }
  return { count: buffer.count, outOfPlane, inPlane, leverage, rootRest, rest };
}

function partCore(shape: PartShape, ssr: number): PartCore {
  return {
    status: shape.status,
    limitation: shape.limitation,
    readingCount: shape.readingCount,
    parameterCount: shape.parameterCount,
    ssr,
    edgeErrorRatio: shape.edgeErrorRatio,
    refusedEdgeErrorRatio: shape.refusedEdgeErrorRatio,
    covariance: shape.covariance.slice(),
  };
}

/** The out-of-plane motion and residuals from the layout; returns the part's SSR. */
function fitOutOfPlane(b: PoseBuffer, o: OutOfPlaneLayout, fit: PoseFitCore): number {
  const { n, at } = o;
  if (n === 0) return 0;
  const from = b.start;
  let sv = 0;
  for (let k = 0; k < n; k++) sv += b.value[from + at[k]];
  const vMean = sv / n;
  let ssr = 0;
  if (o.model === 'full') {
    let syv = 0;
    let szv = 0;
    for (let k = 0; k < n; k++) {
      const dv = b.value[from + at[k]] - vMean;
      syv += o.dy[k] * dv;
      szv += o.dz[k] * dv;
    }
    const wy = (o.syy * szv - o.syz * syv) / o.det;
    const wz = (o.syz * szv - o.szz * syv) / o.det;
    fit.wy = wy;
    fit.wz = wz;
    fit.tx = vMean - wy * o.zMean + wz * o.yMean;
    for (let k = 0; k < n; k++) {
      const i = from + at[k];
      const e = b.value[i] - (vMean + wy * o.dz[k] + wz * -o.dy[k]);
      b.residual[i] = e;
      ssr += e * e;
    }
    return ssr;
  }
  if (o.model === 'line') {
    let spv = 0;
    for (let k = 0; k < n; k++) spv += o.dy[k] * (b.value[from + at[k]] - vMean);
    const slope = spv / o.spp;
    // dx varies along the line with gradient slope·u = (−wz, wy); across the line it is taken as flat.
    fit.wz = -slope * o.uy;
    fit.wy = slope * o.uz;
    fit.tx = vMean - fit.wy * o.zMean + fit.wz * o.yMean;
    for (let k = 0; k < n; k++) {
      const i = from + at[k];
      const e = b.value[i] - (vMean + slope * o.dy[k]);
      b.residual[i] = e;
      ssr += e * e;
    }
    return ssr;
  }
  fit.tx = vMean;
  for (let k = 0; k < n; k++) {
    const i = from + at[k];
    const e = b.value[i] - vMean;
    b.residual[i] = e;
    ssr += e * e;
  }
  return ssr;
}

/** The in-plane motion and residuals from the layout; returns the part's SSR. */
function fitInPlane(b: PoseBuffer, l: InPlaneLayout, fit: PoseFitCore): number {
  const { nL, nV, at, lever } = l;
  const count = nL + nV;
  if (count === 0) return 0;
  const from = b.start;
  let svL = 0;
  let svV = 0;
  for (let k = 0; k < count; k++) {
    const i = from + at[k];
    if (b.axis[i] === 1) svL += b.value[i];
    else svV += b.value[i];
  }
  const tyRef = nL > 0 ? svL / nL : 0;
  const tzRef = nV > 0 ? svV / nV : 0;
  let wx = 0;
  if (l.rotation) {
    let s3v = 0;
    for (let k = 0; k < count; k++) {
      const i = from + at[k];
      s3v += lever[k] * (b.value[i] - (b.axis[i] === 1 ? tyRef : tzRef));
    }
    wx = s3v / l.s3;
  }
  fit.wx = wx;
  fit.ty = nL > 0 ? tyRef + wx * l.zRef : 0;
  fit.tz = nV > 0 ? tzRef - wx * l.yRef : 0;
  let ssr = 0;
  for (let k = 0; k < count; k++) {
    const i = from + at[k];
    const e = b.value[i] - ((b.axis[i] === 1 ? tyRef : tzRef) + wx * lever[k]);
    b.residual[i] = e;
    ssr += e * e;
  }
  return ssr;
}

/**
 * Fits one pose's readings (see the module comment).
 * @param buffer the pose's readings as parallel arrays; residual statistics are written back into it.
 * @param corners the opening's bounding-rectangle corners (outlineCorners), for identifiability.
 * @param layout the pose's layout when the caller already has it (poseLayout of a pose read at the same points).
 * @returns the motion and both parts.
 * @example fitPoseParts(buffer, corners).inPlane.status // => 'full'
 */
export function fitPoseParts(buffer: PoseBuffer, corners: EdgeCorners, layout: PoseLayout = poseLayout(buffer, corners)): PoseFitCore {
  const fit: PoseFitCore = {
    tx: 0,
    ty: 0,
    tz: 0,
    wx: 0,
    wy: 0,
    wz: 0,
    outOfPlane: partCore(layout.outOfPlane.shape, 0),
    inPlane: partCore(layout.inPlane.shape, 0),
  };
  fitPoseValues(buffer, layout, fit);
  return fit;
}

/**
 * The part of fitPoseParts that reads the values: the motion into `fit` (its six numbers and each
 * part's ssr; the rest of `fit` is the caller's), and per reading its residual, leverage,
 * standardized residual and deleted SD into the buffer. designEnvelope fits a session's poses into
 * one `fit` this way and keeps only the numbers, so a pose costs no objects until its result is built.
 * @param buffer the pose's readings. @param layout their layout (poseLayout). @param fit where the motion and ssr go.
 * @returns nothing; writes into `fit` and the buffer.
 * @example fitPoseValues(buffer, layout, fit); fit.outOfPlane.ssr // => the fore-aft residuals' sum of squares
 */
export function fitPoseValues(buffer: PoseBuffer, layout: PoseLayout, fit: PoseFitCore): void {
  fit.tx = 0;
  fit.ty = 0;
  fit.tz = 0;
  fit.wx = 0;
  fit.wy = 0;
  fit.wz = 0;
  const ssrOut = fitOutOfPlane(buffer, layout.outOfPlane, fit);
  const ssrIn = fitInPlane(buffer, layout.inPlane, fit);
  fit.outOfPlane.ssr = ssrOut;
  fit.inPlane.ssr = ssrIn;
  const { leverage, rootRest, rest } = layout;
  const { axis, residual } = buffer;
  const spareOut = layout.outOfPlane.shape.readingCount - layout.outOfPlane.shape.parameterCount - 1;
  const spareIn = layout.inPlane.shape.readingCount - layout.inPlane.shape.parameterCount - 1;
  for (let k = 0; k < buffer.count; k++) {
    const i = buffer.start + k;
    const out = axis[i] === 0;
    const e = residual[i];
    const spare = out ? spareOut : spareIn;
    buffer.leverage[i] = leverage[k];
    // NaN where the reading alone fixes its fitted value (hᵢ ≈ 1): it has no residual to judge.
    buffer.standardized[i] = e / rootRest[k];
    buffer.deletedSd[i] = spare >= 1 ? Math.sqrt(Math.max(0, ((out ? ssrOut : ssrIn) - (e * e) / rest[k]) / spare)) : Number.NaN;
  }
}

/**
 * Loads one part of a reused PoseFitCore with what its layout says and the fit's sum of squared
 * residuals, as fitPoseParts would give it.
 * @param into the part core to overwrite. @param layout a pose layout. @param part which part. @param ssr its residuals' sum of squares.
 * @param covariance the part's covariance as the result keeps it: the layout's values (a caller may
 *   hand every pose of one layout the same read-only copy); by default a fresh copy.
 * @returns nothing; writes into `into`.
 * @example loadPartCore(core.inPlane, layout, 'inPlane', 0.8); core.inPlane.parameterCount // => 3
 */
export function loadPartCore(into: PartCore, layout: PoseLayout, part: 'outOfPlane' | 'inPlane', ssr: number, covariance?: number[]): void {
  const shape = layout[part].shape;
  into.status = shape.status;
  into.limitation = shape.limitation;
  into.readingCount = shape.readingCount;
  into.parameterCount = shape.parameterCount;
  into.ssr = ssr;
  into.edgeErrorRatio = shape.edgeErrorRatio;
  into.refusedEdgeErrorRatio = shape.refusedEdgeErrorRatio;
  into.covariance = covariance ?? shape.covariance.slice();
}

/**
 * A PoseFitCore to fit poses into again and again (fitPoseValues, loadPartCore).
 * @param layout any pose layout, for the parts' starting values. @returns a fresh core.
 * @example scratchPoseFitCore(layout).tx // => 0
 */
export function scratchPoseFitCore(layout: PoseLayout): PoseFitCore {
  return { tx: 0, ty: 0, tz: 0, wx: 0, wy: 0, wz: 0, outOfPlane: partCore(layout.outOfPlane.shape, 0), inPlane: partCore(layout.inPlane.shape, 0) };
}
