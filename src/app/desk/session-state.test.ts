import { describe, expect, it } from 'vitest';
import type { EnvelopeStatus } from '@shared/schemas/envelope';
import { sessionState } from './session-state';

const rev = (revision: number, status: EnvelopeStatus) => ({ revision, status });

describe('a session’s state in words', () => {
  it('follows the poses and the envelope revisions (newest first)', () => {
    const cases: [poseCount: number, envelopes: ReturnType<typeof rev>[], words: string][] = [
      [0, [], 'No poses recorded yet'],
      [5, [], 'Recorded, no envelope yet'],
      [5, [rev(1, 'draft')], 'Envelope in draft (revision 1)'],
      [5, [rev(2, 'signed'), rev(1, 'superseded')], 'Signed off: revision 2 is current'],
      [5, [rev(3, 'draft'), rev(2, 'signed'), rev(1, 'superseded')], 'Signed off: revision 2 is current, revision 3 in draft'],
    ];
    for (const [poseCount, envelopes, words] of cases) expect(sessionState({ poseCount, envelopes }), words).toBe(words);
  });
});
