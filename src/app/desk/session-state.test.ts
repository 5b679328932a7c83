import { describe, expect, it } from 'vitest';
import { sessionState } from './session-state';

describe('a session’s state in words', () => {
  it('follows the poses and the envelope revisions', () => {
    expect(sessionState({ poseCount: 0, envelopes: [] })).toBe('No poses recorded yet');
    expect(sessionState({ poseCount: 5, envelopes: [] })).toBe('Recorded, no envelope yet');
    expect(sessionState({ poseCount: 5, envelopes: [{ revision: 1, status: 'draft' }] })).toBe('Envelope in draft (revision 1)');
    expect(
      sessionState({
        poseCount: 5,
        envelopes: [
          { revision: 2, status: 'signed' },
          { revision: 1, status: 'superseded' },
        ],
      }),
    ).toBe('Signed off: revision 2 is current');
    expect(
      sessionState({
        poseCount: 5,
        envelopes: [
          { revision: 3, status: 'draft' },
          { revision: 2, status: 'signed' },
          { revision: 1, status: 'superseded' },
        ],
      }),
    ).toBe('Signed off: revision 2 is current, revision 3 in draft');
  });
});
