// A re-test request in words, the same on the phone, at the desk and in the history: what it asks
// about ("point A lateral in Pose 2") and where it stands.
import { AXIS_NAMES } from './format';
import type { RetestRequest, RetestState } from './records/retest-request';

/** How a pose is named when it has no label of its own. */
export const poseWords = (pose: { label: string; seq: number } | undefined) => (pose ? pose.label || `Pose ${pose.seq}` : 'a pose not on this device');

/**
 * What a request is about, as a crew says it.
 * @example retestTargetWords({ poseId: 'p', gaugePointId: 'g', axis: 'lateral' }, lookup) // => 'point A lateral in Pose 2'
 */
export function retestTargetWords(
  r: Pick<RetestRequest, 'poseId' | 'gaugePointId' | 'axis'>,
  look: { pose: (id: string) => { label: string; seq: number } | undefined; point: (id: string) => { label: string } | undefined },
): string {
  if (!r.poseId) return 'the whole session';
  const pose = poseWords(look.pose(r.poseId));
  if (!r.gaugePointId || !r.axis) return pose;
  return `point ${look.point(r.gaugePointId)?.label ?? '?'} ${AXIS_NAMES[r.axis]} in ${pose}`;
}

/** Where a request stands, in words. */
export const RETEST_STATE_WORDS: Record<RetestState, string> = {
  open: 'waiting for the crew',
  answered: 'answered',
  closed: 'closed',
};
