import { useQuery } from '@tanstack/react-query';
import type { TestSession } from '@shared/schemas';
import { api } from '@/lib/api-client';

export const sessionKeys = {
  all: ['sessions'] as const,
  list: () => [...sessionKeys.all, 'list'] as const,
  detail: (id: string) => [...sessionKeys.all, 'detail', id] as const,
};

/** A session as the server lists it: with its vehicle's name and its latest signed-off envelope revision. */
export type SessionSummary = TestSession & { vehicleName: string; signed: { revision: number; signedAt: string } | null };

export const getSessions = () => api<SessionSummary[]>('/api/sessions');

export function useSessions() {
  return useQuery({ queryKey: sessionKeys.list(), queryFn: getSessions });
}
