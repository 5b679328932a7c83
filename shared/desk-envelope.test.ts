import { describe, expect, it } from 'vitest';
import { buildSyntheticSession } from './flex';
import { buildSnapshot, computeDeskEnvelope, deskFlags, poseKeys, toEnvelopeInput, type DeskSessionData } from './desk-envelope';
import { DEFAULT_DRAFT_PARAMS } from './schemas/envelope';

function session(): DeskSessionData {
  const s = buildSyntheticSession({ poses: 4, gaugePoints: 6, mode: 'gap', nominalGapMm: 90, seed: 3 });
  return {
    session: { id: 's', title: 'Yard', testedOn: '2026-11-18', readingMode: 'gap' },
    vehicle: {
      id: 'v',
      name: 'Truck',
      wheelbaseMm: 3800,
      trackFrontMm: 1900,
      trackRearMm: 1850,
      nominalGapMm: 90,
      opening: { widthMm: 700, heightMm: 900, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 600 },
    },
    gaugePoints: s.gaugePoints.map((g) => ({ id: `gp-${g.id}`, label: g.id, yMm: g.y, zMm: g.z })),
    poses: s.poses.map((p, i) => ({
      id: `pose-id-${i}`,
      seq: i,
      label: i === 0 ? 'Level' : 'Diagonal',
      kind: i === 0 ? 'level' : 'wheels',
      liftFlMm: p.lifts.fl,
      liftFrMm: p.lifts.fr,
      liftRlMm: p.lifts.rl,
      liftRrMm: p.lifts.rr,
    })),
    readings: s.poses.flatMap((p, i) =>
      p.readings.map((r, k) => ({
        id: `r-${i}-${k}`,
        poseId: `pose-id-${i}`,
        gaugePointId: `gp-${r.pointId}`,
        axis: r.axis,
        valueMm: r.value,
        excluded: false,
        excludeReason: null,
        version: 1,
        deletedAt: null,
      })),
    ),
  };
}

describe('desk envelope input', () => {
  it('names poses by label and sequence, unique even when labels repeat', () => {
    const keys = poseKeys(session().poses);
    expect(keys.get('pose-id-0')).toBe('Level (#0)');
    expect(new Set(keys.values()).size).toBe(5);
  });

  it('leaves excluded and deleted readings out and takes the level pose as the baseline', () => {
    const data = session();
    data.readings[20] = { ...data.readings[20], excluded: true, excludeReason: 'knocked' };
    data.readings[21] = { ...data.readings[21], deletedAt: '2026-11-19T10:00:00Z' };
    const input = toEnvelopeInput(data, DEFAULT_DRAFT_PARAMS);
    expect(input.baselinePoseId).toBe('Level (#0)');
    expect(input.poses.reduce((n, p) => n + p.readings.length, 0)).toBe(data.readings.length - 2);
  });

  it('skips the boot check without a nominal gap, and says why', () => {
    const data = session();
    data.vehicle = { ...data.vehicle, nominalGapMm: 0 };
    const { boot, bootNote, result } = computeDeskEnvelope(data, DEFAULT_DRAFT_PARAMS);
    expect(boot).toBeNull();
    expect(bootNote).toMatch(/nominal fore-aft gap/);
    expect(result.measures.lateral.envelopeMm).toBeGreaterThan(0);
  });

  it('names each flagged reading by its id, pose label and gauge point label', () => {
    const data = session();
    const bad = data.readings.findIndex((r) => r.poseId === 'pose-id-2' && r.gaugePointId === 'gp-P03' && r.axis === 'lateral');
    data.readings[bad] = { ...data.readings[bad], valueMm: data.readings[bad].valueMm + 20 };
    const flags = deskFlags(data, computeDeskEnvelope(data, DEFAULT_DRAFT_PARAMS).result);
    expect(flags.map((f) => [f.readingId, f.poseLabel, f.pointLabel, f.flag.axis, f.flag.kind])).toEqual([
      [data.readings[bad].id, 'Diagonal', 'P03', 'lateral', 'outlier'],
    ]);
    expect(f0(flags).enteredMm).toBe(data.readings[bad].valueMm);
    // excluded, it is no longer in the computation, so no longer flagged
    data.readings[bad] = { ...data.readings[bad], excluded: true, excludeReason: 'misread' };
    expect(deskFlags(data, computeDeskEnvelope(data, DEFAULT_DRAFT_PARAMS).result)).toEqual([]);
  });

  it('freezes each flagged reading kept, with its acknowledgement, and refuses to freeze one without', () => {
    const data = session();
    const bad = data.readings.findIndex((r) => r.poseId === 'pose-id-3' && r.gaugePointId === 'gp-P05' && r.axis === 'vertical');
    data.readings[bad] = { ...data.readings[bad], valueMm: data.readings[bad].valueMm - 18 };
    const envelope = computeDeskEnvelope(data, DEFAULT_DRAFT_PARAMS);
    const signature = { signedBy: { id: 'u', name: 'Engineer' }, signedAt: '2026-11-20T15:30:00.000Z', revision: 1 };
    expect(() => buildSnapshot(data, DEFAULT_DRAFT_PARAMS, signature, envelope, new Map())).toThrowError(/has no acknowledgement/);
    const snapshot = buildSnapshot(data, DEFAULT_DRAFT_PARAMS, signature, envelope, new Map([[data.readings[bad].id, 'checked twice']]));
    expect(snapshot.format).toBe(2);
    expect(snapshot.acknowledgedFlags).toEqual([
      expect.objectContaining({
        readingId: data.readings[bad].id,
        poseLabel: 'Diagonal',
        pointLabel: 'P05',
        axis: 'vertical',
        kind: 'outlier',
        note: 'checked twice',
      }),
    ]);
  });
});

function f0<T>(list: T[]): T {
  expect(list.length).toBeGreaterThan(0);
  return list[0];
}
