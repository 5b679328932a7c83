// designEnvelope against its own earlier results: four seeded sessions that reach every branch of
// the computation (misreads, readings without a baseline, shuffled reading order, a pose without
// fore-aft readings, a twisted baseline, an asymmetric truck, a line with an intercept, the
// tolerance method, gauge points too close together or on one line, too few readings for an
// outlier check). testdata/envelope-golden.json holds the results designEnvelope gave at commit
// 5ce4422, before its hot path moved to flat arrays with a per-layout index; every number must
// agree to 1e-12 (relative; absolute below 1) and every word exactly. Regenerate the file
// (GOLDEN_ENVELOPE_WRITE=1) only when the method itself changes, and say so in the commit.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { designEnvelope, type EnvelopeInput, type EnvelopePose } from './envelope';
import { predictDisplacement } from './predict-displacement';
import { buildSyntheticSession, seededNormal, seededRandom, syntheticEnvelopeInput } from './synthetic-session';
import type { GaugeLocation, GaugeValue, RigidMotion } from './types';

const goldenPath = path.join(path.dirname(fileURLToPath(import.meta.url)), 'testdata', 'envelope-golden.json');
const REL = 1e-12;

/** A seeded shuffle (Fisher–Yates) of a pose's readings: the computation must not rely on their order. */
function shuffled<T>(items: T[], seed: number): T[] {
  const random = seededRandom(seed);
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

function gapSession(): EnvelopeInput {
  const session = buildSyntheticSession({ poses: 10, gaugePoints: 12, seed: 11, mode: 'gap', proportionalScatter: 0.05 });
  const poses = session.poses.map((pose) => ({ ...pose, readings: [...pose.readings] }));
  poses[0].readings.splice(7, 1); // the baseline lacks one reading: that point and axis is unused elsewhere
  poses[3].readings[5] = { ...poses[3].readings[5], value: poses[3].readings[5].value + 25 }; // a misread tape
  poses[4].readings = shuffled(poses[4].readings, 4);
  poses[6].readings = poses[6].readings.filter((r) => r.axis !== 'foreAft');
  poses[8].readings = poses[8].readings.filter((r) => r.axis === 'foreAft');
  return syntheticEnvelopeInput({ ...session, poses }, { designTwistDeg: 30 }, 'gap');
}

function asymmetricSession(): EnvelopeInput {
  const session = buildSyntheticSession({
    twistsDeg: [-20, -12, -6, -3, 0.5, 4, 9, 15, 22],
    gaugePoints: 6,
    seed: 12,
    baselineLifts: { fl: 40, fr: 0, rl: 0, rr: 10 },
    motionPerDegNegative: { t: { x: -0.4, y: -7, z: 0.9 }, omega: { x: -0.001, y: 0.0003, z: 0.0002 } },
    constantScatterMm: 0.4,
  });
  return syntheticEnvelopeInput(
    session,
    { designTwistDeg: 40, throughOrigin: false, confidence: 0.99, margin: 0.2, allowanceMm: 5, incrementMm: 6.35 },
    'displacement',
  );
}

function toleranceSession(): EnvelopeInput {
  const jitter = seededNormal(13);
  const twistsDeg = [...Array.from({ length: 8 }, () => 16 + 0.2 * jitter()), ...Array.from({ length: 6 }, () => -15.5 + 0.2 * jitter())];
  const session = buildSyntheticSession({ twistsDeg, gaugePoints: 9, seed: 14, mode: 'gap', proportionalScatter: 0.04 });
  return syntheticEnvelopeInput(session, { designTwistDeg: 18, method: 'tolerance', coverage: 0.95, confidence: 0.9 }, 'gap');
}

/** Points a tape reaches in a hurry: a tight patch, a line of fore-aft points, and a pose with four readings. */
function sparseSession(): EnvelopeInput {
  const points: GaugeLocation[] = [
    { id: 'a', y: 300, z: 1450 },
    { id: 'b', y: 270, z: 1450 },
    { id: 'c', y: 285, z: 1424 },
    { id: 'd', y: -300, z: 1450 },
    { id: 'e', y: 0, z: 1450 },
  ];
  const noise = seededNormal(15);
  const perDeg: RigidMotion = { t: { x: 0.5, y: 8, z: 1 }, omega: { x: 0.001, y: 0.0002, z: -0.0003 } };
  const readingsFor = (twist: number, ids: string[], axes: GaugeValue['axis'][]): GaugeValue[] => {
    const motion: RigidMotion = {
      t: { x: perDeg.t.x * twist, y: perDeg.t.y * twist, z: perDeg.t.z * twist },
      omega: { x: perDeg.omega.x * twist, y: perDeg.omega.y * twist, z: perDeg.omega.z * twist },
    };
    const out: GaugeValue[] = [];
    for (const id of ids) {
      const p = points.find((q) => q.id === id) as GaugeLocation;
      const d = predictDisplacement(motion, p.y, p.z);
      const value = { foreAft: d.dx, lateral: d.dy, vertical: d.dz };
      for (const axis of axes) out.push({ pointId: id, axis, value: value[axis] + 0.5 * noise() });
    }
    return out;
  };
  const lifts = (twist: number) => {
    const lift = 1900 * Math.tan((Math.abs(twist) * Math.PI) / 180);
    return twist >= 0 ? { fl: lift, fr: 0, rl: 0, rr: 0 } : { fl: 0, fr: lift, rl: 0, rr: 0 };
  };
  const all: GaugeValue['axis'][] = ['foreAft', 'lateral', 'vertical'];
  const poses: EnvelopePose[] = [
    { id: 'level', lifts: lifts(0), readings: readingsFor(0, ['a', 'b', 'c', 'd', 'e'], all) },
    { id: 'patch', lifts: lifts(8), readings: readingsFor(8, ['a', 'b', 'c'], all) },
    { id: 'line', lifts: lifts(-9), readings: readingsFor(-9, ['a', 'd', 'e'], all) },
    { id: 'four', lifts: lifts(12), readings: readingsFor(12, ['a', 'd'], ['foreAft', 'lateral']) },
    { id: 'five', lifts: lifts(-14), readings: readingsFor(-14, ['a', 'b', 'd', 'e'], ['foreAft', 'vertical']).slice(0, 5) },
    { id: 'full', lifts: lifts(16), readings: readingsFor(16, ['a', 'b', 'c', 'd', 'e'], all) },
    { id: 'flat', lifts: lifts(0.4), readings: readingsFor(0.4, ['a', 'b', 'c', 'd', 'e'], all) },
  ];
  return {
    tracks: { frontMm: 1900, rearMm: 1900 },
    gaugePoints: points,
    outline: { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 },
    readingMode: 'displacement',
    baselinePoseId: 'level',
    poses,
    parameters: { designTwistDeg: 25 },
  };
}

const SESSIONS: Record<string, () => EnvelopeInput> = {
  gap: gapSession,
  asymmetric: asymmetricSession,
  tolerance: toleranceSession,
  sparse: sparseSession,
};

/** The result as stored: plain JSON (so NaN, Infinity and undefined read as they were written). */
function asJson(value: unknown): unknown {
  return JSON.parse(JSON.stringify(value));
}

/** Every difference between two JSON values, by path; numbers to REL. */
function differences(actual: unknown, expected: unknown, at: string, out: string[]): void {
  if (out.length > 20) return;
  if (typeof expected === 'number' && typeof actual === 'number') {
    const scale = Math.max(1, Math.abs(actual), Math.abs(expected));
    if (!(Math.abs(actual - expected) <= REL * scale)) out.push(`${at}: ${actual} ≠ ${expected}`);
    return;
  }
  if (Array.isArray(expected) && Array.isArray(actual)) {
    if (actual.length !== expected.length) out.push(`${at}: length ${actual.length} ≠ ${expected.length}`);
    else expected.forEach((e, i) => differences(actual[i], e, `${at}[${i}]`, out));
    return;
  }
  if (expected !== null && typeof expected === 'object' && actual !== null && typeof actual === 'object' && !Array.isArray(actual)) {
    const a = actual as Record<string, unknown>;
    const e = expected as Record<string, unknown>;
    const keys = new Set([...Object.keys(a), ...Object.keys(e)]);
    for (const key of keys) {
      if (!(key in a) || !(key in e)) out.push(`${at}.${key}: present in only one`);
      else differences(a[key], e[key], `${at}.${key}`, out);
    }
    return;
  }
  if (actual !== expected) out.push(`${at}: ${JSON.stringify(actual)} ≠ ${JSON.stringify(expected)}`);
}

describe('designEnvelope gives the results it gave before its hot path moved to flat arrays', () => {
  if (process.env.GOLDEN_ENVELOPE_WRITE === '1') {
    it('writes testdata/envelope-golden.json', () => {
      const results = Object.fromEntries(Object.entries(SESSIONS).map(([name, make]) => [name, asJson(designEnvelope(make()))]));
      fs.writeFileSync(goldenPath, JSON.stringify(results) + '\n');
    });
    return;
  }
  const golden = JSON.parse(fs.readFileSync(goldenPath, 'utf8')) as Record<string, unknown>;
  for (const [name, make] of Object.entries(SESSIONS)) {
    it(`the ${name} session`, () => {
      const found: string[] = [];
      differences(asJson(designEnvelope(make())), golden[name], name, found);
      expect(found).toEqual([]);
    });
  }
  it('covers the branches it claims to', () => {
    const gap = designEnvelope(gapSession());
    expect(gap.flags.some((f) => f.kind === 'outlier')).toBe(true);
    expect(gap.poses.some((p) => p.missingBaselineCount > 0)).toBe(true);
    expect(gap.poses.some((p) => p.fit?.outOfPlane.status === 'none')).toBe(true);
    expect(gap.poses.some((p) => p.fit?.inPlane.status === 'none')).toBe(true);
    const asymmetric = designEnvelope(asymmetricSession());
    expect(Math.abs(asymmetric.baselineTwistDeg)).toBeGreaterThan(0.5);
    expect(asymmetric.measures.lateral.directions.negative.fit?.throughOrigin).toBe(false);
    expect(designEnvelope(toleranceSession()).measures.lateral.directions.positive.tolerance?.n).toBe(8);
    const sparse = designEnvelope(sparseSession());
    const statuses = sparse.poses.flatMap((p) => (p.fit === null ? [] : [p.fit.outOfPlane.status, p.fit.inPlane.status]));
    expect(new Set(statuses)).toEqual(new Set(['full', 'partial', 'translationOnly']));
    const checks = sparse.poses.flatMap((p) => (p.fit === null ? [] : [p.fit.outOfPlane.outlierCheck, p.fit.inPlane.outlierCheck]));
    expect(new Set(checks)).toEqual(new Set(['checked', 'misfitOnly', 'skipped']));
  });
});
