import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EnvelopeRecord, SignedEnvelopeSummary } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';

export const getSessionEnvelopes = (sessionId: string) => api<EnvelopeRecord[]>(`/api/sessions/${sessionId}/envelopes`);
export const getEnvelope = (id: string) => api<EnvelopeRecord>(`/api/envelopes/${id}`);
export const getSignedEnvelopes = () => api<SignedEnvelopeSummary[]>('/api/envelopes/signed');

/** The envelope queries; mutations invalidate `all()` or one query's `.queryKey`. */
export const envelopeQueries = {
  all: () => ['envelopes'] as const,
  /** Every revision of a session's envelope, newest first. */
  ofSession: (sessionId: string) => queryOptions({ queryKey: [...envelopeQueries.all(), 'session', sessionId], queryFn: () => getSessionEnvelopes(sessionId) }),
  detail: (id: string) => queryOptions({ queryKey: [...envelopeQueries.all(), 'detail', id], queryFn: () => getEnvelope(id) }),
  signed: () => queryOptions({ queryKey: [...envelopeQueries.all(), 'signed'], queryFn: getSignedEnvelopes }),
};

export const useSessionEnvelopes = (sessionId: string) => useQuery(envelopeQueries.ofSession(sessionId));
export const useEnvelope = (id: string) => useQuery(envelopeQueries.detail(id));
export const useSignedEnvelopes = () => useQuery(envelopeQueries.signed());
