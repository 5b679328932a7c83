import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SendSheetInput } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { envelopeQueries } from './get-envelopes';

export const sendSheet = (id: string, input: SendSheetInput) =>
  api<{ id: string; toEmail: string }>(`/api/envelopes/${id}/send`, { method: 'POST', body: input });

export function useSendSheet(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SendSheetInput) => sendSheet(id, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: envelopeQueries.detail(id).queryKey }),
  });
}
