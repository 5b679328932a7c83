import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EnvelopeRecord, SignOffInput } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeQueries } from './get-envelopes';

/**
 * The server computes and freezes the snapshot from its own copy of the readings; every reading it
 * flags that stays in the computation must be in `acknowledgements`.
 */
export const signOff = (id: string, input: SignOffInput) => api<EnvelopeRecord>(`/api/envelopes/${id}/sign`, { method: 'POST', body: input });

export function useSignOff() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: SignOffInput & { id: string }) => signOff(id, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeQueries.all() }),
  });
}
