import { useQuery } from '@tanstack/react-query';
import type { EnvelopeRecord, SignedEnvelopeSummary } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';

export const envelopeKeys = {
  all: ['envelopes'] as const,
  ofSession: (sessionId: string) => [...envelopeKeys.all, 'session', sessionId] as const,
  detail: (id: string) => [...envelopeKeys.all, 'detail', id] as const,
  signed: () => [...envelopeKeys.all, 'signed'] as const,
};

export const getSessionEnvelopes = (sessionId: string) => api<EnvelopeRecord[]>(`/api/sessions/${sessionId}/envelopes`);
export const getEnvelope = (id: string) => api<EnvelopeRecord>(`/api/envelopes/${id}`);
export const getSignedEnvelopes = () => api<SignedEnvelopeSummary[]>('/api/envelopes/signed');

/** Every revision of a session's envelope, newest first. */
export function useSessionEnvelopes(sessionId: string) {
  return useQuery({ queryKey: envelopeKeys.ofSession(sessionId), queryFn: () => getSessionEnvelopes(sessionId) });
}

export function useEnvelope(id: string) {
  return useQuery({ queryKey: envelopeKeys.detail(id), queryFn: () => getEnvelope(id) });
}

export function useSignedEnvelopes() {
  return useQuery({ queryKey: envelopeKeys.signed(), queryFn: getSignedEnvelopes });
}
