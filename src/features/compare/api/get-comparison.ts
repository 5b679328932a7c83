import { useQuery } from '@tanstack/react-query';
import type { ComparedSession } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';

export const comparisonKeys = {
  all: ['comparison'] as const,
  of: (sessionIds: string[]) => [...comparisonKeys.all, [...sessionIds].sort().join(',')] as const,
};

export const getComparison = (sessionIds: string[]) => api<ComparedSession[]>(`/api/compare?sessionIds=${sessionIds.map(encodeURIComponent).join(',')}`);

export function useComparison(sessionIds: string[]) {
  return useQuery({ queryKey: comparisonKeys.of(sessionIds), queryFn: () => getComparison(sessionIds), enabled: sessionIds.length > 0 });
}
