// Poses made and changed from the field screens: the next pose, a repeat run of one, deleting
// (soft, undoable) and restoring. New poses are whole records (saveRecord); every change to an
// existing pose is a patch merged into the stored record (patchRecord), never a screen's copy.
import type { Pose } from '@shared/schemas';
import { newPose } from '@shared/records';
import { patchRecord, saveRecord, type ItemResult } from '@/lib/db/records';

const nextSeq = (poses: Pick<Pose, 'seq'>[]) => (poses.length ? Math.max(...poses.map((p) => p.seq)) + 1 : 0);

/** The pose after `poses`: the level baseline first, then a pose with wheels to lift. */
export function nextPose(sessionId: string, poses: Pose[], now = new Date()): Pose {
  const seq = nextSeq(poses);
  const first = !poses.some((p) => p.kind === 'level');
  return newPose({ sessionId, seq, label: first ? 'Level' : `Pose ${seq}`, kind: first ? 'level' : 'wheels', recordedAt: now.toISOString() });
}

const RUN = / · run (\d+)$/;
const MAX_LABEL = 80;

/**
 * A repeat run of `pose`: the same wheels (lifts, ramp), a new sequence number, no readings and no
 * notes of its own. Repeats are named "<label> · run N" so the desk can tell them apart.
 */
export function repeatOf(pose: Pose, poses: Pose[], now = new Date()): Pose {
  const base = (pose.label || `Pose ${pose.seq}`).replace(RUN, '');
  const runs = poses.filter((p) => (p.label || `Pose ${p.seq}`).replace(RUN, '') === base).length;
  const suffix = ` · run ${runs + 1}`;
  return {
    ...pose,
    id: crypto.randomUUID(),
    version: 1,
    deletedAt: null,
    seq: nextSeq(poses),
    label: base.slice(0, MAX_LABEL - suffix.length) + suffix,
    notes: '',
    recordedAt: now.toISOString(),
  };
}

/** What the pose screen hands to the session page after a delete, for its Undo. */
export interface DeletedPose {
  id: string;
  label: string;
  /** The session's baseline (its first level pose) was deleted. */
  wasBaseline: boolean;
}

export const addPose = (pose: Pose): Promise<ItemResult> => saveRecord('pose', pose);
export const deletePose = (id: string): Promise<ItemResult> => patchRecord('pose', id, { deletedAt: new Date().toISOString() });
export const restorePose = (id: string): Promise<ItemResult> => patchRecord('pose', id, { deletedAt: null });
