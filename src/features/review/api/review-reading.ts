import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Reading } from '@shared/schemas';
import { readingReviewInput, type ReadingReviewInput } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';
import { reviewQueries } from './get-review';

export const reviewReading = (readingId: string, input: ReadingReviewInput) =>
  api<Reading>(`/api/readings/${readingId}/review`, { method: 'PATCH', body: readingReviewInput.parse(input) });

/** Exclude, flag or correct one reading; the session's review (readings and history) reloads after. */
export function useReviewReading(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ readingId, input }: { readingId: string; input: ReadingReviewInput }) => reviewReading(readingId, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: reviewQueries.detail(sessionId).queryKey }),
  });
}
