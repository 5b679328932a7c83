import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { ENVELOPE_MEASURES, designEnvelope, type EnvelopeInput, type EnvelopePose } from './envelope';
import { linearFit } from './linear-fit';
import { perimeterWorst } from './perimeter';
import { readingRemarks } from './reading-remarks';
import { scaleMotion } from './predict-displacement';
import { buildSyntheticSession, seededNormal, seededRandom, syntheticEnvelopeInput, type SyntheticSessionOptions } from './synthetic-session';
import { SIX_POINTS, readingsAt } from './test-fixtures';
import { oneSidedToleranceFactor } from './tolerance-factor';
import { studentTQuantile } from './student-t';
import { crossAxleTwistDeg } from './twist';
import { inToMm, mmToIn } from './units';
import { FlexInputError } from './errors';
import type { GaugeLocation, GaugeValue, RigidMotion, WheelLifts } from './types';

function sessionInput(options: SyntheticSessionOptions, parameters: EnvelopeInput['parameters']): EnvelopeInput {
  return syntheticEnvelopeInput(buildSyntheticSession(options), parameters, options.mode);
}

function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allFinite);
  if (value !== null && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
}

const six = SIX_POINTS;
const outline = { width: 700, height: 900, cornerRadius: 80, centreY: 0, bottomZ: 600 };
const tracks = { frontMm: 1900, rearMm: 1900 };
const still: RigidMotion = { t: { x: 0, y: 0, z: 0 }, omega: { x: 0, y: 0, z: 0 } };

/** Lifts that twist the truck by `twistDeg`: the front axle rolled that much, the rear level. */
function liftsFor(twistDeg: number): WheelLifts {
  const lift = tracks.frontMm * Math.tan((Math.abs(twistDeg) * Math.PI) / 180);
  return twistDeg >= 0 ? { fl: lift, fr: 0, rl: 0, rr: 0 } : { fl: 0, fr: lift, rl: 0, rr: 0 };
}

function readingsOf(m: RigidMotion, pts: GaugeLocation[] = six): GaugeValue[] {
  return readingsAt(m, pts);
}

function shear(mm: number): RigidMotion {
  return { t: { x: 0, y: mm, z: 0 }, omega: { x: 0, y: 0, z: 0 } };
}

function poseAt(id: string, twistDeg: number, motion: RigidMotion, pts: GaugeLocation[] = six): EnvelopePose {
  return { id, lifts: liftsFor(twistDeg), readings: readingsOf(motion, pts) };
}

function inputOf(poses: EnvelopePose[], parameters: EnvelopeInput['parameters'], pts: GaugeLocation[] = six): EnvelopeInput {
  return {
    tracks,
    gaugePoints: pts,
    outline,
    readingMode: 'displacement',
    baselinePoseId: 'level',
    poses: [poseAt('level', 0, still, pts), ...poses],
    parameters,
  };
}

describe('designEnvelope', () => {
  it('scenario: a medium truck, common practice figures (no published source)', () => {
    // Common practice, no published source: a medium truck measures about 5–5.5 in of lateral shear
    // and 1–2 in vertical, projects to about 6 in at the design twist, and gets about 8 in of cover.
    const input = sessionInput(
      {
        poses: 8,
        seed: 11,
        mode: 'gap',
        maxLiftMm: 300,
        noiseSdMm: 0.5,
        motionPerDeg: { t: { x: 0.6, y: 9, z: 1.8 }, omega: { x: 0.0012, y: 0.0002, z: -0.0004 } },
      },
      { designTwistDeg: 18, margin: 0.25, allowanceMm: inToMm(0.5), incrementMm: inToMm(0.25) },
    );
    const result = designEnvelope(input);
    const lateral = result.measures.lateral;
    const vertical = result.measures.vertical;
    expect(mmToIn(lateral.measuredWorstMm)).toBeGreaterThanOrEqual(5);
    expect(mmToIn(lateral.measuredWorstMm)).toBeLessThanOrEqual(5.5);
    expect(mmToIn(vertical.measuredWorstMm)).toBeGreaterThanOrEqual(1);
    expect(mmToIn(vertical.measuredWorstMm)).toBeLessThanOrEqual(2);
    expect(mmToIn(lateral.projectedMm ?? 0)).toBeGreaterThan(5.75);
    expect(mmToIn(lateral.projectedMm ?? 0)).toBeLessThan(6.25);
    expect(lateral.governing).toBe('upperBound');
    expect(mmToIn(lateral.envelopeMm)).toBeGreaterThanOrEqual(7.5);
    expect(mmToIn(lateral.envelopeMm)).toBeLessThanOrEqual(8.5);
    // rounded to whole quarter inches (6.35 mm = 1/4 in, NIST SP 811 App. B.8)
    expect((mmToIn(lateral.envelopeMm) * 4) % 1).toBeCloseTo(0, 9);
    expect(lateral.measuredWorstAt.side).toBe('bottom');
    expect(vertical.envelopeMm).toBeLessThan(lateral.envelopeMm);
    expect(lateral.directions.positive.fit?.throughOrigin).toBe(true);
    expect(lateral.directions.positive.fit?.scatter).toBe('proportional');
    expect(lateral.directions.positive.poseCount + lateral.directions.negative.poseCount).toBe(8);
    expect(result.poses[0].isBaseline).toBe(true);
    expect(result.poses).toHaveLength(9);
    expect(result.flags).toEqual([]);
  });

  it('computes the envelope formula exactly from its terms', () => {
    const result = designEnvelope(sessionInput({ seed: 2 }, { designTwistDeg: 30, margin: 0.2, allowanceMm: 7, incrementMm: 5 }));
    for (const measure of ENVELOPE_MEASURES) {
      const m = result.measures[measure];
      const base = Math.max(m.measuredWorstMm, m.upperBoundMm ?? 0);
      expect(m.baseMm).toBeCloseTo(base, 12);
      expect(m.withAllowanceMm).toBeCloseTo(base * 1.2 + 7, 12);
      expect(m.envelopeMm % 5).toBeCloseTo(0, 9);
      expect(m.envelopeMm).toBeGreaterThanOrEqual(m.withAllowanceMm - 1e-9);
      expect(m.envelopeMm - m.withAllowanceMm).toBeLessThan(5);
      expect(m.reasons.length).toBeGreaterThanOrEqual(4);
    }
  });

  it('bounds each direction by weighted least squares with scatter growing with twist: the ratio form, by hand', () => {
    const result = designEnvelope(sessionInput({ seed: 4, proportionalScatter: 0.05 }, { designTwistDeg: 25 }));
    const lateral = result.measures.lateral;
    for (const direction of ['positive', 'negative'] as const) {
      const poses = result.poses.filter((p) => p.measures !== null && (direction === 'positive' ? p.twistDeg >= 1 : p.twistDeg <= -1));
      const ratios = poses.map((p) => p.measures!.lateral.valueMm / Math.abs(p.twistDeg));
      const n = ratios.length;
      const mean = ratios.reduce((a, b) => a + b, 0) / n;
      const sd = Math.sqrt(ratios.reduce((a, r) => a + (r - mean) ** 2, 0) / (n - 1));
      // Montgomery, Peck & Vining (5th ed.), ch. 5, weighted least squares with weights 1/x²: the one-sample prediction bound of the ratios, × D
      expect(lateral.directions[direction].upperBoundMm).toBeCloseTo(25 * (mean + studentTQuantile(0.95, n - 1) * sd * Math.sqrt(1 + 1 / n)), 9);
      expect(lateral.directions[direction].projectedMm).toBeCloseTo(25 * mean, 9);
    }
  });

  it('gives the same envelope from raw gaps as from displacements', () => {
    const parameters = { designTwistDeg: 20 };
    const asDisplacements = sessionInput({ seed: 5 }, parameters);
    const asGaps: EnvelopeInput = {
      ...asDisplacements,
      readingMode: 'gap',
      poses: asDisplacements.poses.map((pose) => ({ ...pose, readings: pose.readings.map((r) => ({ ...r, value: r.value + 60 })) })),
    };
    const a = designEnvelope(asDisplacements);
    const b = designEnvelope(asGaps);
    for (const measure of ENVELOPE_MEASURES) {
      expect(b.measures[measure].upperBoundMm).toBeCloseTo(a.measures[measure].upperBoundMm ?? NaN, 9);
      expect(b.measures[measure].envelopeMm).toBe(a.measures[measure].envelopeMm);
    }
  });

  it('bounds the stronger twist direction and says it governs (9 mm/° one way, 7 mm/° the other)', () => {
    // Noise-free: the pooled |worst|-on-|twist| line fell below the stronger direction at 30°.
    const poses: EnvelopePose[] = [];
    for (let i = 1; i <= 20; i++) {
      const twist = (i % 2 ? 1 : -1) * (2 + i);
      poses.push(poseAt(`p${i}`, twist, shear(twist > 0 ? 9 * twist : 7 * twist)));
    }
    const lateral = designEnvelope(inputOf(poses, { designTwistDeg: 30 })).measures.lateral;
    expect(lateral.upperBoundMm).toBeCloseTo(270, 6);
    expect(lateral.governingDirection).toBe('positive');
    expect(lateral.directions.negative.upperBoundMm).toBeCloseTo(210, 6);
    expect(lateral.reasons[0]).toMatch(/FL–RR twist \(\+\)/);
    expect(lateral.reasons).toContain('FR–RL twist (−): bound 210.0 mm, lower.');
  });

  it('says when only one diagonal was tested, and bounds that one', () => {
    const poses = [5, 10, 15, 20].map((t) => poseAt(`p${t}`, t, shear(8 * t)));
    const result = designEnvelope(inputOf(poses, { designTwistDeg: 20 }));
    expect(result.notes).toContain('no pose twisted FR–RL twist (−) by 1° or more: the bound covers FL–RR twist (+) only; test the other diagonal too');
    expect(result.measures.lateral.directions.negative.unavailable).toMatch(/needs at least 2 poses twisted this way/);
    expect(result.measures.lateral.governingDirection).toBe('positive');
  });

  it('takes twist relative to a baseline that is not level (6.71°), and says so', () => {
    const base = 6.71;
    const poses = [10, 14, 18, 22].map((t) => ({ id: `p${t}`, lifts: liftsFor(t), readings: readingsOf(shear(9 * (t - base))) }));
    const input: EnvelopeInput = {
      tracks,
      gaugePoints: six,
      outline,
      readingMode: 'displacement',
      baselinePoseId: 'level',
      poses: [{ id: 'level', lifts: liftsFor(base), readings: readingsOf(still) }, ...poses],
      parameters: { designTwistDeg: 30 },
    };
    const result = designEnvelope(input);
    // 9 mm/° relative to the baseline, projected to 30°: 270 mm (the absolute twist gave 165 mm)
    expect(result.measures.lateral.projectedMm).toBeCloseTo(270, 6);
    expect(result.baselineTwistDeg).toBeCloseTo(base, 9);
    expect(result.poses[1].twistDeg).toBeCloseTo(10 - base, 9);
    expect(result.readingNotes.some((n) => /the baseline pose \(level\) is twisted 6\.7° by its lifts: every twist is taken relative to it/.test(n))).toBe(
      true,
    );
  });

  it('reports the fore-aft opening and closing apart, each with its own envelope', () => {
    // dx = |twist|·(−2 + 0.002·z): the gap closes at the bottom of the opening (z = 600) and opens at the top (z = 1500)
    const poses = [5, -10, 15, -20].map((t) => poseAt(`p${t}`, t, scaleMotion({ t: { x: -2, y: 0, z: 0 }, omega: { x: 0, y: 0.002, z: 0 } }, Math.abs(t))));
    const result = designEnvelope(inputOf(poses, { designTwistDeg: 20, margin: 0, allowanceMm: 0, incrementMm: 1 }));
    const opening = result.measures.foreAftOpening;
    const closing = result.measures.foreAftClosing;
    // hand-checked at 20°: opening 20·(−2 + 3) = 20 mm at the top edge, closing 20·(2 − 1.2) = 16 mm at the bottom
    expect(opening.measuredWorstMm).toBeCloseTo(20, 9);
    expect(opening.measuredWorstAt.side).toMatch(/^top/);
    expect(closing.measuredWorstMm).toBeCloseTo(16, 9);
    expect(closing.measuredWorstAt.side).toMatch(/^bottom/);
    expect(opening.envelopeMm).toBe(20);
    expect(closing.envelopeMm).toBe(16);
  });

  it('says at envelope level when the outlier check is limited (4 points) or skipped (3 points)', () => {
    const four = six.slice(0, 4);
    const poses = [4, -8, 12, -16].map((t) => poseAt(`p${t}`, t, scaleMotion({ t: { x: 0.6, y: 9, z: 1.2 }, omega: { x: 0.001, y: 0.0002, z: 0 } }, t), four));
    poses[1].readings[0] = { ...poses[1].readings[0], value: poses[1].readings[0].value + 25 };
    const result = designEnvelope(inputOf(poses, { designTwistDeg: 20 }, four));
    expect(result.readingNotes).toContain(
      'fore-aft readings judged together only (4 readings for 3 unknowns; 5 are needed to single out a misread); the fore-aft reading at a alone fixes part of the fit, so nothing checks it (all poses)',
    );
    const three = six.slice(0, 3);
    const few = [4, -8, 12].map((t) => poseAt(`p${t}`, t, shear(9 * t), three));
    expect(designEnvelope(inputOf(few, { designTwistDeg: 20 }, three)).readingNotes).toContain(
      'outlier check skipped for fore-aft readings (3 readings for 3 unknowns; 5 are needed to single out a misread) (all poses)',
    );
  });

  it('lists a set of readings that do not fit, when there are too few to single the misread out', () => {
    const five = [...six.slice(0, 4), { id: 'g', y: 0, z: 630 }];
    const poses = [4, -8, 12, -16].map((t) => poseAt(`p${t}`, t, scaleMotion({ t: { x: 0.6, y: 9, z: 1.2 }, omega: { x: 0.001, y: 0.0002, z: 0 } }, t), five));
    const d = poses[2].readings.findIndex((r) => r.pointId === 'd' && r.axis === 'foreAft');
    poses[2].readings[d] = { ...poses[2].readings[d], value: poses[2].readings[d].value + 15 };
    // fore-aft: the 5 points of this layout fit the full model with 2 readings to spare, so the 15 mm is singled out
    const result = designEnvelope(inputOf(poses, { designTwistDeg: 20 }, five));
    expect(result.flags.map((f) => [f.poseId, f.pointId, f.axis, f.kind])).toEqual([['p12', 'd', 'foreAft', 'outlier']]);
    // with g taken away (4 points, 1 to spare) the same misread is only a misfit of the whole set
    const four = five.slice(0, 4);
    const fewer = poses.map((p) => ({ ...p, readings: p.readings.filter((r) => r.pointId !== 'g') }));
    const misfit = designEnvelope(inputOf(fewer, { designTwistDeg: 20 }, four));
    expect(misfit.flags.filter((f) => f.kind === 'misfit').map((f) => f.pointId)).toEqual(['a', 'b', 'c', 'd']);
    expect(misfit.readingNotes).toContain(
      'p12: the fore-aft readings do not fit one rigid motion, but with 4 readings for 3 unknowns the misread cannot be singled out; review them',
    );
  });

  it('simulation: in sessions of 6 poses at six points, catches a 10 mm misread in ≥ 95 % and flags ≤ 1 % of noise-only poses', () => {
    const uniform = seededRandom(7001);
    const normal = seededNormal(7002);
    const sessions = 300;
    let caught = 0;
    let noisePoses = 0;
    let falseFlags = 0;
    for (let s = 0; s < sessions; s++) {
      const poses = [4, -8, 12, -16, 20, -24].map((t) => {
        const pose = poseAt(`p${t}`, t, scaleMotion({ t: { x: 0.6, y: 9, z: 1.2 }, omega: { x: 0.0012, y: 0.0002, z: -0.0004 } }, t));
        pose.readings = pose.readings.map((r) => ({ ...r, value: r.value + 0.5 * normal() }));
        return pose;
      });
      const misread = Math.floor(uniform() * poses.length);
      const k = Math.floor(uniform() * poses[misread].readings.length);
      poses[misread].readings[k] = { ...poses[misread].readings[k], value: poses[misread].readings[k].value + (uniform() < 0.5 ? -10 : 10) };
      const result = designEnvelope(inputOf(poses, { designTwistDeg: 24 }));
      const bad = poses[misread].readings[k];
      if (result.flags.some((f) => f.poseId === poses[misread].id && f.pointId === bad.pointId && f.axis === bad.axis)) caught++;
      for (const pose of poses) {
        if (pose === poses[misread]) continue;
        noisePoses++;
        if (result.flags.some((f) => f.poseId === pose.id)) falseFlags++;
      }
    }
    console.log(
      `designEnvelope, 6 poses × 6 points: 10 mm misread caught in ${((100 * caught) / sessions).toFixed(1)} % of ${sessions} sessions; ${((100 * falseFlags) / noisePoses).toFixed(2)} % of ${noisePoses} noise-only poses flagged`,
    );
    expect(caught / sessions).toBeGreaterThanOrEqual(0.95);
    expect(falseFlags / noisePoses).toBeLessThanOrEqual(0.01);
  }, 60_000);

  it('judges outliers against the session scatter when the readings scatter more than a tape is read to', () => {
    const input = sessionInput({ seed: 12, poses: 12, noiseSdMm: 2 }, { designTwistDeg: 20 });
    const result = designEnvelope(input);
    expect(result.scatterMm.inPlane).toBeGreaterThan(1.5);
    expect(result.scatterMm.inPlane).toBeLessThan(2.5);
    expect(
      result.readingNotes.some((n) =>
        /the lateral and vertical readings scatter about their fits by \d\.\d\d mm \(robust SD\), more than the 0\.50 mm a gauge is read to/.test(n),
      ),
    ).toBe(true);
    expect(result.flags).toEqual([]);
  });

  it('tolerance method: mean + k1·s of repeated runs scaled to the design twist', () => {
    const session = buildSyntheticSession({ poses: 1, seed: 9, maxLiftMm: 300 });
    const run = session.poses[1];
    const runs = Array.from({ length: 6 }, (_, i) => buildSyntheticSession({ poses: 1, seed: 100 + i, maxLiftMm: 300 }).poses[1]);
    const input: EnvelopeInput = {
      tracks: session.tracks,
      gaugePoints: session.gaugePoints,
      outline: session.outline,
      readingMode: 'displacement',
      baselinePoseId: 'level',
      poses: [session.poses[0], ...runs.map((pose, i) => ({ ...pose, id: `run-${i + 1}`, lifts: run.lifts }))],
      parameters: { designTwistDeg: 20, method: 'tolerance', coverage: 0.9, confidence: 0.95 },
    };
    const result = designEnvelope(input);
    const lateral = result.measures.lateral;
    const twist = Math.abs(result.poses[1].twistDeg);
    const scaled = result.poses.slice(1).map((pose) => ((pose.measures?.lateral.valueMm ?? 0) * 20) / twist);
    const mean = scaled.reduce((a, b) => a + b, 0) / 6;
    const sd = Math.sqrt(scaled.reduce((s, v) => s + (v - mean) ** 2, 0) / 5);
    const direction = lateral.governingDirection!;
    // NIST/SEMATECH e-Handbook §7.2.6.3: one-sided bound mean + k1·s
    expect(lateral.directions[direction].tolerance?.k1).toBeCloseTo(oneSidedToleranceFactor(6, 0.9, 0.95), 12);
    expect(lateral.upperBoundMm).toBeCloseTo(mean + oneSidedToleranceFactor(6, 0.9, 0.95) * sd, 9);
    expect(lateral.projectedMm).toBeCloseTo(mean, 9);
    expect(lateral.directions[direction].fit).toBeNull();
    expect(lateral.directions[direction].tolerance?.bandDeg).toBe(1);
  });

  it('tolerance method: refuses runs that are not repeats of one pose, naming the pose outside the band', () => {
    const poses = [5, 10, 15].map((t) => poseAt(`p${t}`, t, shear(9 * t)));
    expect(() => designEnvelope(inputOf(poses, { designTwistDeg: 20, method: 'tolerance' }))).toThrowError(
      /designEnvelope: poses\[1\] \('p5'\) is twisted 5\.0° \(FL–RR twist \(\+\)\), outside ±1° of the runs' median 10\.0°: the tolerance method takes repeated runs of one pose/,
    );
    // within a band the engineer widens on purpose, the same runs are accepted
    expect(() => designEnvelope(inputOf(poses, { designTwistDeg: 20, method: 'tolerance', repeatBandDeg: 5 }))).not.toThrow();
  });

  it('states a fit limitation once for all poses', () => {
    const input = sessionInput({ seed: 6 }, { designTwistDeg: 20 });
    const lateralOnly = { ...input, poses: input.poses.map((pose) => ({ ...pose, readings: pose.readings.filter((r) => r.axis === 'lateral') })) };
    const result = designEnvelope(lateralOnly);
    expect(result.readingNotes.filter((n) => /no vertical readings/.test(n))).toEqual(['no vertical readings: tz set to 0 (all poses)']);
    expect(result.readingNotes.some((n) => /no fore-aft readings/.test(n))).toBe(true);
    expect(result.measures.foreAftOpening.measuredWorstMm).toBe(0);
  });

  it('falls back to the measured worst when too few poses give no bound, and says why', () => {
    const input = sessionInput({ poses: 1, seed: 4 }, { designTwistDeg: 10 });
    const result = designEnvelope(input);
    expect(result.measures.lateral.upperBoundMm).toBeNull();
    expect(result.measures.lateral.governing).toBe('measured');
    expect(result.measures.lateral.reasons[0]).toMatch(/measured worst .* governs; no bound in either twist direction/);
    expect(result.measures.lateral.reasons.some((r) => /: no bound, needs at least 2 poses twisted this way by 1° or more, has 1\.$/.test(r))).toBe(true);
  });

  it('notes a design twist below the twist reached and flags a bad reading', () => {
    const input = sessionInput({ seed: 8, noiseSdMm: 0.3 }, { designTwistDeg: 5 });
    const pose = input.poses[3];
    pose.readings[4] = { ...pose.readings[4], value: pose.readings[4].value + 25 };
    const result = designEnvelope(input);
    expect(result.notes.some((n) => /below the largest twist reached/.test(n))).toBe(true);
    expect(result.readingNotes.some((n) => n.startsWith(`${pose.id}: reading at ${pose.readings[4].pointId}`))).toBe(true);
    expect(result.poses[3].fit?.outliers).toHaveLength(1);
    expect(result.flags).toEqual([
      expect.objectContaining({ poseId: pose.id, pointId: pose.readings[4].pointId, axis: pose.readings[4].axis, kind: 'outlier' }),
    ]);
  });

  it('carries each fit part uncertainty to the measure at the outline', () => {
    const result = designEnvelope(sessionInput({ seed: 3, gaugePoints: 6 }, { designTwistDeg: 20 }));
    for (const pose of result.poses.slice(1)) {
      const m = pose.measures!;
      for (const measure of ENVELOPE_MEASURES) {
        // at least the reading SD over n readings (the translation alone), at most 10 × the reading SD
        expect(m[measure].uncertaintyMm).toBeGreaterThan(0.5 / Math.sqrt(12) - 1e-9);
        expect(m[measure].uncertaintyMm).toBeLessThanOrEqual(
          10 * Math.max(0.5, pose.fit!.inPlane.residualSdMm ?? 0, pose.fit!.outOfPlane.residualSdMm ?? 0) + 1e-9,
        );
      }
    }
    expect(result.measures.lateral.fitUncertaintyMm).toBeGreaterThan(0);
  });

  it('property: the envelope is never below the measured worst and has no NaN', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1000 }),
        fc.integer({ min: 1, max: 10 }),
        fc.double({ min: 0.1, max: 45, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        fc.constantFrom(1, 5, 6.35),
        fc.boolean(),
        fc.double({ min: 0, max: 5, noNaN: true }),
        (seed, poses, designTwistDeg, margin, allowanceMm, incrementMm, throughOrigin, noiseSdMm) => {
          const input = sessionInput({ seed, poses, noiseSdMm }, { designTwistDeg, margin, allowanceMm, incrementMm, throughOrigin });
          const result = designEnvelope(input);
          for (const measure of ENVELOPE_MEASURES) {
            expect(result.measures[measure].envelopeMm).toBeGreaterThanOrEqual(result.measures[measure].measuredWorstMm);
          }
          expect(allFinite(result.measures)).toBe(true);
          expect(allFinite(result.poses.map((p) => [p.twistDeg, p.worst, p.measures, p.fit?.motion, p.fit?.residualRms]))).toBe(true);
        },
      ),
      { numRuns: 40 },
    );
  });

  it('property: arbitrary poses and readings give finite results or a FlexInputError', () => {
    const session = buildSyntheticSession({ seed: 1 });
    const lift = fc.oneof(fc.constant(0), fc.double({ min: -600, max: 600, noNaN: true }), fc.double());
    const reading = fc.record({
      pointId: fc.constantFrom(...session.gaugePoints.map((p) => p.id)),
      axis: fc.constantFrom('foreAft' as const, 'lateral' as const, 'vertical' as const),
      value: fc.oneof(fc.double({ min: -300, max: 300, noNaN: true }), fc.double()),
    });
    const pose = fc.record({
      lifts: fc.record({ fl: lift, fr: lift, rl: lift, rr: lift }),
      readings: fc.uniqueArray(reading, { maxLength: 12, selector: (r) => `${r.pointId}|${r.axis}` }),
    });
    fc.assert(
      fc.property(
        fc.array(pose, { minLength: 1, maxLength: 6 }),
        fc.boolean(),
        fc.constantFrom('prediction' as const, 'tolerance' as const),
        (poses, throughOrigin, method) => {
          const input: EnvelopeInput = {
            tracks: session.tracks,
            gaugePoints: session.gaugePoints,
            outline: session.outline,
            readingMode: 'displacement',
            poses: poses.map((p, i) => ({ ...p, id: `p${i}` })),
            parameters: { designTwistDeg: 15, throughOrigin, method },
          };
          try {
            const result = designEnvelope(input);
            expect(allFinite(result.measures)).toBe(true);
          } catch (error) {
            expect(error).toBeInstanceOf(FlexInputError);
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  describe('refuses loose input with an error that names the function and the field', () => {
    const good = (): EnvelopeInput => {
      const poses = [5, -10, 15].map((t) => poseAt(`p${t}`, t, shear(9 * t)));
      const input = inputOf(poses, { designTwistDeg: 20 });
      return { ...input, readingMode: 'gap', poses: input.poses.map((p) => ({ ...p, readings: p.readings.map((r) => ({ ...r, value: r.value + 50 })) })) };
    };

    it('parameters: out of range, and an explicit undefined takes the default', () => {
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 0 } })).toThrowError(/designEnvelope: parameters.designTwistDeg/);
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: -3 } })).toThrowError(FlexInputError);
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 12, confidence: 1 } })).toThrowError(/parameters.confidence/);
      // below 0.5 a "bound" lies under the mean (k1 = −0.0044 at coverage 0.49 was accepted)
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 12, confidence: 0.3 } })).toThrowError(
        /parameters.confidence must be at least 0.5/,
      );
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 12, coverage: 0.49 } })).toThrowError(/parameters.coverage must be at least 0.5/);
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 12, incrementMm: 0 } })).toThrowError(/parameters.incrementMm/);
      expect(() => designEnvelope({ ...good(), parameters: { designTwistDeg: 12, repeatBandDeg: 0 } })).toThrowError(/parameters.repeatBandDeg/);
      const defaults = designEnvelope({ ...good(), parameters: { designTwistDeg: 20, margin: undefined, method: undefined } }).parameters;
      expect(defaults.margin).toBe(0.15);
      expect(defaults.method).toBe('prediction');
    });

    it('tracks: a vehicle track, not 1e-9 mm', () => {
      expect(() => designEnvelope({ ...good(), tracks: { frontMm: 0, rearMm: 1800 } })).toThrowError(/tracks.frontMm/);
      expect(() => designEnvelope({ ...good(), tracks: { frontMm: 1e-9, rearMm: 1800 } })).toThrowError(
        /designEnvelope: tracks.frontMm must be a vehicle's track, 500–4000 mm, got 1e-9/,
      );
      expect(() => designEnvelope({ ...good(), tracks: { frontMm: 1800, rearMm: 90_000 } })).toThrowError(/tracks.rearMm/);
    });

    it('poses: a twist beyond ±90° (about 139° was accepted), bad lifts, the baseline', () => {
      const input = good();
      input.poses[1] = { ...input.poses[1], lifts: { fl: 2500, fr: -2500, rl: -2500, rr: 2500 } };
      expect(crossAxleTwistDeg(input.poses[1].lifts, 1900, 1900)).toBeGreaterThan(90);
      expect(() => designEnvelope(input)).toThrowError(/designEnvelope: poses\[1\]\.lifts give a cross-axle twist of 138\.4°, beyond the ±90°/);
      const badLift = good().poses.map((pose, i) => (i === 1 ? { ...pose, lifts: { ...pose.lifts, fr: Infinity } } : pose));
      expect(() => designEnvelope({ ...good(), poses: badLift })).toThrowError(/designEnvelope: poses\[1\]\.lifts.fr must be a finite number/);
      expect(() => designEnvelope({ ...good(), baselinePoseId: undefined })).toThrowError(/baselinePoseId is required/);
      expect(() => designEnvelope({ ...good(), baselinePoseId: 'nope' })).toThrowError(/baselinePoseId names no pose/);
      expect(() => designEnvelope({ ...good(), poses: [good().poses[0]] })).toThrowError(/poses need at least one pose/);
    });

    it('readings: named by the pose and the index the caller gave, also in gap mode', () => {
      const bad = good().poses.map((pose, i) => (i === 2 ? { ...pose, readings: [pose.readings[0], { ...pose.readings[1], value: NaN }] } : pose));
      expect(() => designEnvelope({ ...good(), poses: bad })).toThrowError(/designEnvelope: poses\[2\]\.readings\[1\]\.value must be a finite number/);
      // a gauge point's position is the gauge point's field, not a pose's
      expect(() => designEnvelope({ ...good(), gaugePoints: six.map((p, i) => (i === 2 ? { ...p, y: NaN } : p)) })).toThrowError(
        /designEnvelope: gaugePoints\[2\]\.y/,
      );
      // gap mode: a reading without a baseline reading before it must not shift the index of the next
      const poses = good().poses.map((p) => ({ ...p, readings: [...p.readings] }));
      poses[0].readings = poses[0].readings.filter((r) => !(r.pointId === 'b' && r.axis === 'foreAft'));
      poses[1].readings.push({ pointId: 'zz', axis: 'lateral', value: 2 });
      expect(() => designEnvelope({ ...good(), poses })).toThrowError(/designEnvelope: poses\[1\]\.readings\[18\]\.pointId names no gauge point/);
      poses[1].readings.pop();
      poses[0].readings.push({ pointId: 'zz', axis: 'lateral', value: 1 });
      expect(() => designEnvelope({ ...good(), poses })).toThrowError(/designEnvelope: poses\[0\]\.readings\[17\]\.pointId/);
    });

    it('readings: one per point and axis in a pose (a duplicate was counted twice)', () => {
      const input = good();
      input.poses[2] = { ...input.poses[2], readings: [...input.poses[2].readings, input.poses[2].readings[4]] };
      expect(() => designEnvelope(input)).toThrowError(/designEnvelope: poses\[2\]\.readings\[18\] repeats the reading of point 'b' on axis lateral/);
    });
  });

  it('the bound a linearFit of the same ratios gives, for the record', () => {
    // linearFit with proportional scatter through the origin is the same weighted fit designEnvelope uses
    const fit = linearFit([5, 10, 15], [45, 92, 133], { scatter: 'proportional' });
    expect(fit.slope).toBeCloseTo((9 + 9.2 + 133 / 15) / 3, 12);
  });
});

describe('designEnvelope result', () => {
  it('shares one covariance among poses read at the same points, and gives a pose read elsewhere its own', () => {
    const input = sessionInput({ poses: 5, gaugePoints: 6, seed: 21, mode: 'gap' }, { designTwistDeg: 20 });
    input.poses[3] = { ...input.poses[3], readings: input.poses[3].readings.filter((r) => r.axis !== 'vertical') };
    const [, a, b, c, d] = designEnvelope(input).poses.map((pose) => pose.fit!);
    expect(b.outOfPlane.covariance).toBe(a.outOfPlane.covariance);
    expect(b.inPlane.covariance).toBe(a.inPlane.covariance);
    // Without vertical readings the in-plane layout differs: so does its covariance (no tz variance).
    expect(c.inPlane.covariance).not.toBe(a.inPlane.covariance);
    expect(c.inPlane.covariance[4]).toBe(0);
    expect(a.inPlane.covariance[4]).toBeGreaterThan(0);
    expect(d.inPlane.covariance).toEqual(a.inPlane.covariance);
  });

  it('writes each pose to JSON with the fields of a plain result, in their order, worst and measures included', () => {
    const result = designEnvelope(sessionInput({ poses: 4, gaugePoints: 6, seed: 22, mode: 'gap' }, { designTwistDeg: 20 }));
    for (const pose of result.poses) {
      const plain = {
        poseId: pose.poseId,
        isBaseline: pose.isBaseline,
        liftTwistDeg: pose.liftTwistDeg,
        twistDeg: pose.twistDeg,
        missingBaselineCount: pose.missingBaselineCount,
        fit: pose.fit,
        worst: pose.worst,
        measures: pose.measures,
        note: pose.note,
      };
      expect(JSON.stringify(pose)).toBe(JSON.stringify(plain));
    }
    const fitted = JSON.parse(JSON.stringify(result.poses[1])) as Record<string, unknown>;
    expect(Object.keys(fitted)).toEqual(['poseId', 'isBaseline', 'liftTwistDeg', 'twistDeg', 'missingBaselineCount', 'fit', 'worst', 'measures', 'note']);
    expect(Object.keys(fitted.worst as object)).toEqual(['foreAft', 'lateral', 'vertical']);
    expect(Object.keys(fitted.measures as object)).toEqual(['foreAftOpening', 'foreAftClosing', 'lateral', 'vertical']);
    expect(JSON.parse(JSON.stringify(result.poses[0]))).toMatchObject({ isBaseline: true, fit: null, worst: null, measures: null });
  });

  it('keeps a result right when designEnvelope runs again before its poses are read', () => {
    const first = sessionInput({ poses: 5, gaugePoints: 6, seed: 24, mode: 'gap' }, { designTwistDeg: 20 });
    const atOnce = JSON.stringify(designEnvelope(first));
    const kept = designEnvelope(first);
    // Another session no larger (so it reuses the computation's scratch arrays, writing over them).
    designEnvelope(sessionInput({ poses: 5, gaugePoints: 6, seed: 25, mode: 'gap', proportionalScatter: 0.05 }, { designTwistDeg: 30 }));
    expect(JSON.stringify(kept)).toBe(atOnce);
    expect(kept.poses[2].fit!.residuals).toHaveLength(18);
  });

  it("remarks on the readings from the facts it keeps as it would from the poses' fits (flags, misfits, points nothing checks, mixed layouts)", () => {
    const motion = { t: { x: 0.6, y: 9, z: 1.2 }, omega: { x: 0.001, y: 0.0002, z: 0 } };
    const five = [...six.slice(0, 4), { id: 'g', y: 0, z: 630 }];
    const poses = [4, -8, 12, -16, 6].map((t) => poseAt(`p${t}`, t, scaleMotion(motion, t), five));
    const d = poses[2].readings.findIndex((r) => r.pointId === 'd' && r.axis === 'foreAft');
    poses[2].readings[d] = { ...poses[2].readings[d], value: poses[2].readings[d].value + 15 };
    poses[3].readings = poses[3].readings.filter((r) => r.pointId !== 'g');
    poses[4].readings = poses[4].readings.filter((r) => r.axis !== 'vertical');
    const four = six.slice(0, 4);
    const misfits = [4, -8, 12, -16].map((t) => poseAt(`p${t}`, t, scaleMotion(motion, t), four));
    const e = misfits[2].readings.findIndex((r) => r.pointId === 'd' && r.axis === 'foreAft');
    misfits[2].readings[e] = { ...misfits[2].readings[e], value: misfits[2].readings[e].value + 15 };
    const sessions = [inputOf(poses, { designTwistDeg: 20 }, five), inputOf(misfits, { designTwistDeg: 20 }, four)];
    for (const input of sessions) {
      const result = designEnvelope(input);
      expect(result.readingNotes.length).toBeGreaterThan(1);
      // readingRemarks(result) reads every pose's fit, built in full.
      expect(readingRemarks(result)).toEqual(result.readingNotes);
    }
    expect(designEnvelope(sessions[0]).flags.map((f) => f.kind)).toEqual(['outlier']);
    expect(designEnvelope(sessions[1]).flags.map((f) => f.kind)).toContain('misfit');
  });

  it("builds a pose's extremes and measures when read, once, matching the outline and the measures the bounds used", () => {
    const input = sessionInput({ poses: 6, gaugePoints: 6, seed: 23, mode: 'gap' }, { designTwistDeg: 20 });
    const result = designEnvelope(input);
    for (const pose of result.poses.slice(1)) {
      expect(pose.worst).toBe(pose.worst);
      expect(pose.measures).toBe(pose.measures);
      expect(pose.worst).toEqual(perimeterWorst(pose.fit!.motion, input.outline));
      expect(pose.measures!.foreAftOpening.valueMm).toBe(Math.max(0, pose.worst!.foreAft.highest.valueMm));
      expect(pose.measures!.foreAftClosing.valueMm).toBe(Math.max(0, -pose.worst!.foreAft.lowest.valueMm));
      expect(pose.measures!.lateral.valueMm).toBe(Math.abs(pose.worst!.lateral.valueMm));
      expect(pose.measures!.vertical).toMatchObject({ valueMm: Math.abs(pose.worst!.vertical.valueMm), y: pose.worst!.vertical.y });
    }
    for (const measure of ENVELOPE_MEASURES) {
      const m = result.measures[measure];
      const values = result.poses.slice(1).map((pose) => pose.measures![measure].valueMm);
      expect(m.measuredWorstMm).toBe(Math.max(...values));
      const worstPose = result.poses.find((pose) => pose.poseId === m.measuredWorstPoseId)!;
      expect(m.measuredWorstAt).toEqual({ y: worstPose.measures![measure].y, z: worstPose.measures![measure].z, side: worstPose.measures![measure].side });
      const uncertainties = result.poses.slice(1).map((pose) => pose.measures![measure].uncertaintyMm!);
      expect(m.fitUncertaintyMm).toBe(Math.max(...uncertainties));
    }
  });
});
