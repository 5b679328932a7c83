// The team's sessions as the server lists them: read by the field's and the desk's session lists
// and by Compare, so it sits here rather than in one feature.
import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionSummary } from '@shared/desk-responses';
import { api } from '@/lib/api-client';

export const getSessions = () => api<SessionSummary[]>('/api/sessions');

export const sessionQueries = {
  all: () => ['sessions'] as const,
  list: () => queryOptions({ queryKey: [...sessionQueries.all(), 'list'], queryFn: getSessions }),
};

export const useSessions = () => useQuery(sessionQueries.list());
