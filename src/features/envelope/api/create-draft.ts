import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EnvelopeParams, EnvelopeRecord } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeQueries } from './get-envelopes';

export const createDraft = (sessionId: string, params?: EnvelopeParams) =>
  api<EnvelopeRecord>(`/api/sessions/${sessionId}/envelopes`, { method: 'POST', body: { params } });

export function useCreateDraft(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (params?: EnvelopeParams) => createDraft(sessionId, params),
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeQueries.ofSession(sessionId).queryKey }),
  });
}
