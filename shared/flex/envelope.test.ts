import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { designEnvelope, type EnvelopeInput } from './envelope';
import { buildSyntheticSession, type SyntheticSessionOptions } from './synthetic-session';
import { oneSidedToleranceFactor } from './tolerance-factor';
import { inToMm, mmToIn } from './units';
import { FlexInputError } from './errors';
import { AXES } from './types';

function sessionInput(options: SyntheticSessionOptions, parameters: EnvelopeInput['parameters']): EnvelopeInput {
  const session = buildSyntheticSession(options);
  return {
    tracks: session.tracks,
    gaugePoints: session.gaugePoints,
    outline: session.outline,
    readingMode: options.mode ?? 'displacement',
    baselinePoseId: session.baselinePoseId,
    poses: session.poses,
    parameters,
  };
}

function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(allFinite);
  if (value !== null && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
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
    const lateral = result.axes.lateral;
    const vertical = result.axes.vertical;
    expect(mmToIn(Math.abs(lateral.measuredWorstMm))).toBeGreaterThanOrEqual(5);
    expect(mmToIn(Math.abs(lateral.measuredWorstMm))).toBeLessThanOrEqual(5.5);
    expect(mmToIn(Math.abs(vertical.measuredWorstMm))).toBeGreaterThanOrEqual(1);
    expect(mmToIn(Math.abs(vertical.measuredWorstMm))).toBeLessThanOrEqual(2);
    expect(mmToIn(lateral.projectedMm ?? 0)).toBeGreaterThan(5.75);
    expect(mmToIn(lateral.projectedMm ?? 0)).toBeLessThan(6.25);
    expect(lateral.governing).toBe('upperBound');
    expect(mmToIn(lateral.envelopeMm)).toBeGreaterThanOrEqual(7.5);
    expect(mmToIn(lateral.envelopeMm)).toBeLessThanOrEqual(8.5);
    // rounded to whole quarter inches (6.35 mm = 1/4 in, NIST SP 811 App. B.8)
    expect((mmToIn(lateral.envelopeMm) * 4) % 1).toBeCloseTo(0, 9);
    expect(lateral.measuredWorstAt.side).toBe('bottom');
    expect(vertical.envelopeMm).toBeLessThan(lateral.envelopeMm);
    expect(lateral.fit?.throughOrigin).toBe(true);
    expect(lateral.fit?.rSquared).toBeGreaterThan(0.99);
    expect(result.poses[0].isBaseline).toBe(true);
    expect(result.poses).toHaveLength(9);
  });

  it('computes the envelope formula exactly from its terms', () => {
    const result = designEnvelope(sessionInput({ seed: 2 }, { designTwistDeg: 30, margin: 0.2, allowanceMm: 7, incrementMm: 5 }));
    for (const axis of AXES) {
      const a = result.axes[axis];
      const base = Math.max(Math.abs(a.measuredWorstMm), a.upperBoundMm ?? 0);
      expect(a.baseMm).toBeCloseTo(base, 12);
      expect(a.withAllowanceMm).toBeCloseTo(base * 1.2 + 7, 12);
      expect(a.envelopeMm % 5).toBeCloseTo(0, 9);
      expect(a.envelopeMm).toBeGreaterThanOrEqual(a.withAllowanceMm - 1e-9);
      expect(a.envelopeMm - a.withAllowanceMm).toBeLessThan(5);
      expect(a.reasons.length).toBeGreaterThanOrEqual(4);
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
    for (const axis of AXES) {
      expect(b.axes[axis].upperBoundMm).toBeCloseTo(a.axes[axis].upperBoundMm ?? NaN, 9);
      expect(b.axes[axis].envelopeMm).toBe(a.axes[axis].envelopeMm);
    }
  });

  it('tolerance method: mean + k1·s of the runs scaled to the design twist', () => {
    const session = buildSyntheticSession({ poses: 1, seed: 9, maxLiftMm: 300 });
    const run = session.poses[1];
    const normalRuns = Array.from({ length: 6 }, (_, i) => buildSyntheticSession({ poses: 1, seed: 100 + i, maxLiftMm: 300 }).poses[1]);
    const input: EnvelopeInput = {
      tracks: session.tracks,
      gaugePoints: session.gaugePoints,
      outline: session.outline,
      readingMode: 'displacement',
      baselinePoseId: 'level',
      poses: [session.poses[0], ...normalRuns.map((pose, i) => ({ ...pose, id: `run-${i + 1}`, lifts: run.lifts }))],
      parameters: { designTwistDeg: 20, method: 'tolerance', coverage: 0.9, confidence: 0.95 },
    };
    const result = designEnvelope(input);
    const lateral = result.axes.lateral;
    const twist = Math.abs(result.poses[1].twistDeg);
    const scaled = result.poses.slice(1).map((pose) => (Math.abs(pose.worst?.lateral.valueMm ?? 0) * 20) / twist);
    const mean = scaled.reduce((a, b) => a + b, 0) / 6;
    const sd = Math.sqrt(scaled.reduce((s, v) => s + (v - mean) ** 2, 0) / 5);
    // NIST/SEMATECH e-Handbook §7.2.6.3: one-sided bound mean + k1·s
    expect(lateral.tolerance?.k1).toBeCloseTo(oneSidedToleranceFactor(6, 0.9, 0.95), 12);
    expect(lateral.upperBoundMm).toBeCloseTo(mean + oneSidedToleranceFactor(6, 0.9, 0.95) * sd, 9);
    expect(lateral.projectedMm).toBeCloseTo(mean, 9);
    expect(lateral.fit).toBeNull();
  });

  it('states a fit limitation once for all poses', () => {
    const input = sessionInput({ seed: 6 }, { designTwistDeg: 20 });
    const lateralOnly = { ...input, poses: input.poses.map((pose) => ({ ...pose, readings: pose.readings.filter((r) => r.axis === 'lateral') })) };
    const result = designEnvelope(lateralOnly);
    expect(result.notes.filter((n) => /no vertical readings/.test(n))).toEqual(['no vertical readings: tz set to 0 (all poses)']);
    expect(result.notes.some((n) => /no fore-aft readings/.test(n))).toBe(true);
    expect(result.axes.foreAft.measuredWorstMm).toBe(0);
  });

  it('falls back to the measured worst when one pose gives no bound, and says why', () => {
    const input = sessionInput({ poses: 1, seed: 4 }, { designTwistDeg: 10 });
    const result = designEnvelope(input);
    expect(result.axes.lateral.upperBoundMm).toBeNull();
    expect(result.axes.lateral.governing).toBe('measured');
    expect(result.axes.lateral.reasons[0]).toMatch(/no prediction bound: needs at least 2 poses/);
  });

  it('notes a design twist below the twist reached and flags a bad reading', () => {
    const input = sessionInput({ seed: 8, noiseSdMm: 0.3 }, { designTwistDeg: 5 });
    const pose = input.poses[3];
    pose.readings[4] = { ...pose.readings[4], value: pose.readings[4].value + 25 };
    const result = designEnvelope(input);
    expect(result.notes.some((n) => /below the largest twist reached/.test(n))).toBe(true);
    expect(result.notes.some((n) => n.startsWith(`${pose.id}: reading at ${pose.readings[4].pointId}`))).toBe(true);
    expect(result.poses[3].fit?.outliers).toHaveLength(1);
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
        fc.constantFrom('prediction' as const, 'tolerance' as const),
        fc.boolean(),
        fc.double({ min: 0, max: 5, noNaN: true }),
        (seed, poses, designTwistDeg, margin, allowanceMm, incrementMm, method, throughOrigin, noiseSdMm) => {
          const input = sessionInput({ seed, poses, noiseSdMm }, { designTwistDeg, margin, allowanceMm, incrementMm, method, throughOrigin });
          const result = designEnvelope(input);
          for (const axis of AXES) {
            expect(result.axes[axis].envelopeMm).toBeGreaterThanOrEqual(Math.abs(result.axes[axis].measuredWorstMm));
          }
          expect(allFinite(result.axes)).toBe(true);
          expect(allFinite(result.poses.map((p) => [p.twistDeg, p.worst, p.fit?.motion, p.fit?.residualRms]))).toBe(true);
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
      axis: fc.constantFrom(...AXES),
      value: fc.oneof(fc.double({ min: -300, max: 300, noNaN: true }), fc.double()),
    });
    const pose = fc.record({
      lifts: fc.record({ fl: lift, fr: lift, rl: lift, rr: lift }),
      readings: fc.array(reading, { maxLength: 12 }),
    });
    fc.assert(
      fc.property(fc.array(pose, { minLength: 1, maxLength: 6 }), fc.boolean(), (poses, throughOrigin) => {
        const input: EnvelopeInput = {
          tracks: session.tracks,
          gaugePoints: session.gaugePoints,
          outline: session.outline,
          readingMode: 'displacement',
          poses: poses.map((p, i) => ({ ...p, id: `p${i}` })),
          parameters: { designTwistDeg: 15, throughOrigin },
        };
        try {
          const result = designEnvelope(input);
          expect(allFinite(result.axes)).toBe(true);
        } catch (error) {
          expect(error).toBeInstanceOf(FlexInputError);
        }
      }),
      { numRuns: 60 },
    );
  });

  it('throws FlexInputError naming the field for bad input', () => {
    const good = sessionInput({ seed: 1, mode: 'gap' }, { designTwistDeg: 12 });
    expect(() => designEnvelope({ ...good, parameters: { designTwistDeg: 0 } })).toThrowError(/designEnvelope: parameters.designTwistDeg/);
    expect(() => designEnvelope({ ...good, parameters: { designTwistDeg: -3 } })).toThrowError(FlexInputError);
    expect(() => designEnvelope({ ...good, parameters: { designTwistDeg: 12, confidence: 1 } })).toThrowError(/parameters.confidence/);
    expect(() => designEnvelope({ ...good, parameters: { designTwistDeg: 12, incrementMm: 0 } })).toThrowError(/parameters.incrementMm/);
    expect(() => designEnvelope({ ...good, tracks: { frontMm: 0, rearMm: 1800 } })).toThrowError(/tracks.frontMm/);
    expect(() => designEnvelope({ ...good, baselinePoseId: undefined })).toThrowError(/baselinePoseId is required/);
    expect(() => designEnvelope({ ...good, baselinePoseId: 'nope' })).toThrowError(/baselinePoseId names no pose/);
    expect(() => designEnvelope({ ...good, poses: [good.poses[0]] })).toThrowError(/poses need at least one pose/);
    const badPoses = good.poses.map((pose, i) => (i === 2 ? { ...pose, readings: [{ ...pose.readings[0], value: NaN }] } : pose));
    expect(() => designEnvelope({ ...good, poses: badPoses })).toThrowError(/designEnvelope: poses\[2\]/);
    const badLift = good.poses.map((pose, i) => (i === 1 ? { ...pose, lifts: { ...pose.lifts, fr: Infinity } } : pose));
    expect(() => designEnvelope({ ...good, poses: badLift })).toThrowError(/poses\[1\] \(crossAxleTwistDeg lifts.fr\)/);
  });
});
