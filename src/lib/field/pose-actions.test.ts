import { describe, expect, it } from 'vitest';
import type { Pose } from '@shared/schemas';
import { pose as poseSchema } from '@shared/schemas';
import { nextPose, repeatOf } from './pose-actions';

const session = crypto.randomUUID();
const at = new Date('2026-03-14T09:00:00Z');

describe('nextPose', () => {
  it('starts with the level baseline, then poses with wheels, numbered after the highest', () => {
    const level = nextPose(session, [], at);
    expect(level).toMatchObject({ seq: 0, kind: 'level', label: 'Level', rampWheel: null });
    expect(poseSchema.safeParse(level).success).toBe(true);
    const second = nextPose(session, [level, { ...level, id: crypto.randomUUID(), seq: 4, kind: 'wheels' }], at);
    expect(second).toMatchObject({ seq: 5, kind: 'wheels', label: 'Pose 5' });
  });
});

describe('repeatOf', () => {
  const ramp: Pose = {
    ...nextPose(session, [], at),
    seq: 3,
    kind: 'ramp',
    label: 'Ramp 20°, FL up',
    liftFlMm: 513.0302149885031,
    rampAngleDeg: 20,
    rampDistanceMm: 1500,
    rampWheel: 'fl',
    notes: 'spotter at rear',
    version: 4,
  };

  it('copies the wheels and the ramp, not the notes, as a new record after the last pose', () => {
    const again = repeatOf(ramp, [ramp], at);
    expect(again).toMatchObject({
      seq: 4,
      version: 1,
      kind: 'ramp',
      liftFlMm: ramp.liftFlMm,
      rampAngleDeg: 20,
      rampDistanceMm: 1500,
      rampWheel: 'fl',
      notes: '',
      label: 'Ramp 20°, FL up · run 2',
    });
    expect(again.id).not.toBe(ramp.id);
    expect(poseSchema.safeParse(again).success).toBe(true);
  });

  it('counts runs of the same pose, whichever run is repeated', () => {
    const run2 = repeatOf(ramp, [ramp], at);
    const run3 = repeatOf(run2, [ramp, run2], at);
    expect(run3.label).toBe('Ramp 20°, FL up · run 3');
    expect(run3.seq).toBe(5);
  });

  it('keeps the label within the 80 characters a pose name may have', () => {
    const long = { ...ramp, label: 'x'.repeat(80) };
    const again = repeatOf(long, [long], at);
    expect(again.label).toHaveLength(80);
    expect(again.label.endsWith(' · run 2')).toBe(true);
  });
});
