import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionReview } from '@shared/desk-responses';
import { api } from '@/lib/api-client';

export type { SessionReview };

export const getReview = (sessionId: string) => api<SessionReview>(`/api/sessions/${sessionId}/review`);

/** The review queries: `reviewQueries.detail(id)` is the query, `.queryKey` what a mutation invalidates. */
export const reviewQueries = {
  all: () => ['review'] as const,
  detail: (sessionId: string) => queryOptions({ queryKey: [...reviewQueries.all(), 'detail', sessionId], queryFn: () => getReview(sessionId) }),
};

export function useReview(sessionId: string) {
  return useQuery(reviewQueries.detail(sessionId));
}
