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

function fitOutOfPlane(b: PoseBuffer, corners: EdgeCorners, fit: PoseFitCore): void {
  const end = b.start + b.count;
  let n = 0;
  let sy = 0;
  let sz = 0;
  let sv = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    n++;
    sy += b.y[i];
    sz += b.z[i];
    sv += b.value[i];
  }
  const part = fit.outOfPlane;
  part.readingCount = n;
  if (n === 0) {
    part.status = 'none';
    part.limitation = 'none';
    return;
  }
  const yMean = sy / n;
  const zMean = sz / n;
  const vMean = sv / n;
  let syy = 0;
  let szz = 0;
  let syz = 0;
  let syv = 0;
  let szv = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    const dy = b.y[i] - yMean;
    const dz = b.z[i] - zMean;
    const dv = b.value[i] - vMean;
    syy += dy * dy;
    szz += dz * dz;
    syz += dy * dz;
    syv += dy * dv;
    szv += dz * dv;
  }
  // Full model in (c, wy, wz) with columns a = z − z̄ and b = −(y − ȳ): [[szz, −syz], [−syz, syy]].
  const det = szz * syy - syz * syz;
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
    const wy = (syy * szv - syz * syv) / det;
    const wz = (syz * szv - szz * syv) / det;
    fit.wy = wy;
    fit.wz = wz;
    fit.tx = vMean - wy * zMean + wz * yMean;
    let ssr = 0;
    for (let i = b.start; i < end; i++) {
      if (b.axis[i] !== 0) continue;
      const a = b.z[i] - zMean;
      const c = -(b.y[i] - yMean);
      const e = b.value[i] - (vMean + wy * a + wz * c);
      b.residual[i] = e;
      b.leverage[i] = 1 / n + (a * a * syy + 2 * a * c * syz + c * c * szz) / det;
      ssr += e * e;
    }
    part.status = 'full';
    part.limitation = null;
    part.parameterCount = 3;
    part.ssr = ssr;
    part.edgeErrorRatio = fullRatio;
    part.refusedEdgeErrorRatio = null;
    // tx = c − wy·z̄ + wz·ȳ; (wy, wz) has covariance [[syy, syz], [syz, szz]] / det.
    part.covariance = shiftedCovariance(1 / n, -zMean, yMean, syy / det, syz / det, szz / det);
    return;
  }
  // The points' principal line: the larger eigenvector of the scatter matrix [[syy, syz], [syz, szz]].
  const half = Math.sqrt(((syy - szz) / 2) ** 2 + syz * syz);
  const lambda = (syy + szz) / 2 + half;
  const raw = syz !== 0 ? [lambda - szz, syz] : syy >= szz ? [1, 0] : [0, 1];
  const length = Math.hypot(raw[0], raw[1]);
  const uy = raw[0] / length;
  const uz = raw[1] / length;
  let spp = 0;
  let spv = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    const p = (b.y[i] - yMean) * uy + (b.z[i] - zMean) * uz;
    spp += p * p;
    spv += p * (b.value[i] - vMean);
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
  part.refusedEdgeErrorRatio = Number.isFinite(fullRatio) ? fullRatio : null;
  if (lineRatio <= MAX_EDGE_ERROR_RATIO) {
    const slope = spv / spp;
    // dx varies along the line with gradient slope·u = (−wz, wy); across the line it is taken as flat.
    fit.wz = -slope * uy;
    fit.wy = slope * uz;
    fit.tx = vMean - fit.wy * zMean + fit.wz * yMean;
    let ssr = 0;
    for (let i = b.start; i < end; i++) {
      if (b.axis[i] !== 0) continue;
      const p = (b.y[i] - yMean) * uy + (b.z[i] - zMean) * uz;
      const e = b.value[i] - (vMean + slope * p);
      b.residual[i] = e;
      b.leverage[i] = 1 / n + (p * p) / spp;
      ssr += e * e;
    }
    part.status = 'partial';
    part.limitation = 'line';
    part.parameterCount = 2;
    part.ssr = ssr;
    part.edgeErrorRatio = lineRatio;
    // (wy, wz) = slope·(uz, −uy), Var(slope) = 1/spp.
    part.covariance = shiftedCovariance(1 / n, -zMean, yMean, (uz * uz) / spp, (-uz * uy) / spp, (uy * uy) / spp);
    return;
  }
  fit.tx = vMean;
  let ssr = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] !== 0) continue;
    const e = b.value[i] - vMean;
    b.residual[i] = e;
    b.leverage[i] = 1 / n;
    ssr += e * e;
  }
  part.status = 'translationOnly';
  part.limitation = lambda === 0 ? 'onePoint' : 'spread';
  part.parameterCount = 1;
  part.ssr = ssr;
  part.edgeErrorRatio = Math.sqrt(1 / n);
  if (part.refusedEdgeErrorRatio === null && Number.isFinite(lineRatio)) part.refusedEdgeErrorRatio = lineRatio;
  const covariance = emptyCovariance();
  covariance[0] = 1 / n;
  part.covariance = covariance;
}

function fitInPlane(b: PoseBuffer, corners: EdgeCorners, fit: PoseFitCore): void {
  const end = b.start + b.count;
  let nL = 0;
  let nV = 0;
  let szL = 0;
  let svL = 0;
  let syV = 0;
  let svV = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] === 1) {
      nL++;
      szL += b.z[i];
      svL += b.value[i];
    } else if (b.axis[i] === 2) {
      nV++;
      syV += b.y[i];
      svV += b.value[i];
    }
  }
  const part = fit.inPlane;
  part.readingCount = nL + nV;
  if (nL + nV === 0) {
    part.status = 'none';
    part.limitation = 'none';
    return;
  }
  const zRef = nL > 0 ? szL / nL : 0;
  const yRef = nV > 0 ? syV / nV : 0;
  const tyRef = nL > 0 ? svL / nL : 0;
  const tzRef = nV > 0 ? svV / nV : 0;
  let s3 = 0;
  let s3v = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] === 1) {
      const lever = -(b.z[i] - zRef);
      s3 += lever * lever;
      s3v += lever * (b.value[i] - tyRef);
    } else if (b.axis[i] === 2) {
      const lever = b.y[i] - yRef;
      s3 += lever * lever;
      s3v += lever * (b.value[i] - tzRef);
    }
  }
  const translations = (nL > 0 ? 1 : 0) + (nV > 0 ? 1 : 0);
  let rotationRatio = Infinity;
  if (nL + nV > translations && s3 > 1e-12 * (nL + nV)) {
    let worst = 0;
    for (let k = 0; k < 8; k += 2) {
      if (nL > 0) worst = Math.max(worst, 1 / nL + (corners[k + 1] - zRef) ** 2 / s3);
      if (nV > 0) worst = Math.max(worst, 1 / nV + (corners[k] - yRef) ** 2 / s3);
    }
    rotationRatio = Math.sqrt(worst);
  }
  const rotation = rotationRatio <= MAX_EDGE_ERROR_RATIO;
  const wx = rotation ? s3v / s3 : 0;
  fit.wx = wx;
  fit.ty = nL > 0 ? tyRef + wx * zRef : 0;
  fit.tz = nV > 0 ? tzRef - wx * yRef : 0;
  let ssr = 0;
  for (let i = b.start; i < end; i++) {
    if (b.axis[i] === 1) {
      const lever = -(b.z[i] - zRef);
      const e = b.value[i] - (tyRef + wx * lever);
      b.residual[i] = e;
      b.leverage[i] = 1 / nL + (rotation ? (lever * lever) / s3 : 0);
      ssr += e * e;
    } else if (b.axis[i] === 2) {
      const lever = b.y[i] - yRef;
      const e = b.value[i] - (tzRef + wx * lever);
      b.residual[i] = e;
      b.leverage[i] = 1 / nV + (rotation ? (lever * lever) / s3 : 0);
      ssr += e * e;
    }
  }
  part.parameterCount = translations + (rotation ? 1 : 0);
  part.ssr = ssr;
  part.refusedEdgeErrorRatio = rotation || !Number.isFinite(rotationRatio) ? null : rotationRatio;
  if (rotation) {
    part.status = translations === 2 ? 'full' : 'partial';
    part.limitation = translations === 2 ? null : 'missingAxis';
    part.edgeErrorRatio = rotationRatio;
  } else {
    part.status = 'translationOnly';
    part.limitation = 'noRotation';
    part.edgeErrorRatio = Math.sqrt(Math.max(nL > 0 ? 1 / nL : 0, nV > 0 ? 1 / nV : 0));
  }
  // ty = ty₀ + wx·z̄_lateral, tz = tz₀ − wx·ȳ_vertical; ty₀, tz₀ and wx are uncorrelated.
  const vL = nL > 0 ? 1 / nL : 0;
  const vV = nV > 0 ? 1 / nV : 0;
  const vW = rotation ? 1 / s3 : 0;
  part.covariance = [vL + zRef * zRef * vW, -zRef * yRef * vW, zRef * vW, -zRef * yRef * vW, vV + yRef * yRef * vW, -yRef * vW, zRef * vW, -yRef * vW, vW];
}

function emptyPart(): PartCore {
  return {
    status: 'none',
    limitation: 'none',
    readingCount: 0,
    parameterCount: 0,
    ssr: 0,
    edgeErrorRatio: 0,
    refusedEdgeErrorRatio: null,
    covariance: emptyCovariance(),
  };
}

/**
 * Fits one pose's readings (see the module comment).
 * @param buffer the pose's readings as parallel arrays; residual statistics are written back into it.
 * @param corners the opening's bounding-rectangle corners (outlineCorners), for identifiability.
 * @returns the motion and both parts.
 * @example fitPoseParts(buffer, corners).inPlane.status // => 'full'
 */
export function fitPoseParts(buffer: PoseBuffer, corners: EdgeCorners): PoseFitCore {
  const end = buffer.start + buffer.count;
  const fit: PoseFitCore = {
    tx: 0,
    ty: 0,
    tz: 0,
    wx: 0,
    wy: 0,
    wz: 0,
    outOfPlane: emptyPart(),
    inPlane: emptyPart(),
  };
  fitOutOfPlane(buffer, corners, fit);
  fitInPlane(buffer, corners, fit);
  for (let i = buffer.start; i < end; i++) {
    const part = buffer.axis[i] === 0 ? fit.outOfPlane : fit.inPlane;
    const h = buffer.leverage[i];
    const e = buffer.residual[i];
    const spare = part.readingCount - part.parameterCount - 1;
    if (h < FULL_LEVERAGE) {
      buffer.standardized[i] = e / Math.sqrt(1 - h);
      buffer.deletedSd[i] = spare >= 1 ? Math.sqrt(Math.max(0, (part.ssr - (e * e) / (1 - h)) / spare)) : Number.NaN;
    } else {
      buffer.standardized[i] = Number.NaN;
      buffer.deletedSd[i] = Number.NaN;
    }
  }
  return fit;
}
