// Re-test requests from the desk and the field: asking is a new record (saveRecord); answering,
// closing and reopening are patches of the stored record (patchRecord), so they reach the server
// through sync push like every other synced record, with its field rules and history.
import type { RetestRequest } from '@shared/schemas';
import { newRetestRequest } from '@shared/records';
import { patchRecord, saveRecord, type ItemResult } from '@/lib/db/records';

/** What a request is about: the session alone, a pose, or one reading's slot in a pose. */
export type RetestTarget = Pick<RetestRequest, 'sessionId'> & Partial<Pick<RetestRequest, 'poseId' | 'gaugePointId' | 'axis'>>;

export const askRetest = (target: RetestTarget, comment: string): Promise<ItemResult> => saveRecord('retestRequest', newRetestRequest({ ...target, comment }));

/** The crew's answer; the re-measured values themselves are edited on the pose as usual. */
export const answerRetest = (id: string, answer: string, me: string): Promise<ItemResult> =>
  patchRecord('retestRequest', id, { answer, state: 'answered', answeredAt: new Date().toISOString(), answeredBy: me });

export const closeRetest = (id: string, me: string): Promise<ItemResult> =>
  patchRecord('retestRequest', id, { state: 'closed', closedAt: new Date().toISOString(), closedBy: me });

/** Asks again: the request waits for the crew once more, its last answer still shown. */
export const reopenRetest = (id: string): Promise<ItemResult> => patchRecord('retestRequest', id, { state: 'open', closedAt: null, closedBy: null });
