import { useMutation, useQueryClient } from '@tanstack/react-query';
import { saveDraftInput, type EnvelopeParams, type EnvelopeRecord } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeQueries } from './get-envelopes';

export const saveDraft = (id: string, version: number, params: EnvelopeParams) =>
  api<EnvelopeRecord>(`/api/envelopes/${id}/params`, { method: 'PUT', body: saveDraftInput.parse({ version, params }) });

export function useSaveDraft(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, version, params }: { id: string; version: number; params: EnvelopeParams }) => saveDraft(id, version, params),
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeQueries.ofSession(sessionId).queryKey }),
  });
}
