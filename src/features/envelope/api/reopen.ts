import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EnvelopeRecord } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeQueries } from './get-envelopes';

/** A new draft revision with a signed revision's parameters; the signed one stays signed. */
export const reopenEnvelope = (id: string) => api<EnvelopeRecord>(`/api/envelopes/${id}/reopen`, { method: 'POST' });

export function useReopenEnvelope() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: reopenEnvelope,
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeQueries.all() }),
  });
}
