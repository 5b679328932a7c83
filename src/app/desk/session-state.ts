import type { EnvelopeRevisionSummary } from '@shared/desk-responses';

/**
 * Where a session stands, in words, from its poses and its envelope revisions (newest first):
 * `sessionState({ poseCount: 6, envelopes: [{ revision: 2, status: 'signed', … }] }) // => 'Signed off: revision 2 is current'`.
 */
export function sessionState(s: { poseCount: number; envelopes: Pick<EnvelopeRevisionSummary, 'revision' | 'status'>[] }): string {
  const current = s.envelopes.find((e) => e.status === 'signed');
  const draft = s.envelopes.find((e) => e.status === 'draft');
  if (current && draft) return `Signed off: revision ${current.revision} is current, revision ${draft.revision} in draft`;
  if (current) return `Signed off: revision ${current.revision} is current`;
  if (draft) return `Envelope in draft (revision ${draft.revision})`;
  return s.poseCount === 0 ? 'No poses recorded yet' : 'Recorded, no envelope yet';
}
