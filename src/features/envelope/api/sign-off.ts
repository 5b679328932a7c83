import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EnvelopeRecord } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeKeys } from './get-envelopes';

/** The server computes and freezes the snapshot from its own copy of the readings. */
export const signOff = (id: string, version: number) => api<EnvelopeRecord>(`/api/envelopes/${id}/sign`, { method: 'POST', body: { version } });

export function useSignOff() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, version }: { id: string; version: number }) => signOff(id, version),
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeKeys.all }),
  });
}
