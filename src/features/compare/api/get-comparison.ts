import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ComparedSession } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';

export const getComparison = (sessionIds: string[]) => api<ComparedSession[]>(`/api/compare?sessionIds=${sessionIds.map(encodeURIComponent).join(',')}`);

export const comparisonQueries = {
  all: () => ['comparison'] as const,
  /** One comparison per set of sessions, whatever order they were picked in. */
  of: (sessionIds: string[]) =>
    queryOptions({
      queryKey: [...comparisonQueries.all(), [...sessionIds].sort().join(',')],
      queryFn: () => getComparison(sessionIds),
      enabled: sessionIds.length > 0,
    }),
};

export const useComparison = (sessionIds: string[]) => useQuery(comparisonQueries.of(sessionIds));
