import { useQuery } from '@tanstack/react-query';
import type { GaugePoint, Pose, Reading, TestSession, Vehicle } from '@shared/schemas';
import { api } from '@/lib/api-client';

export const sessionKeys = {
  all: ['sessions'] as const,
  list: () => [...sessionKeys.all, 'list'] as const,
  detail: (id: string) => [...sessionKeys.all, 'detail', id] as const,
};

/** A session as the server lists it: with its vehicle's name and its latest signed-off envelope revision. */
export type SessionSummary = TestSession & { vehicleName: string; signed: { revision: number; signedAt: string } | null };
export interface SessionDetail {
  session: TestSession;
  vehicle: Vehicle;
  gaugePoints: GaugePoint[];
  poses: Pose[];
  readings: (Reading & { enteredBy: string })[];
}

export const getSessions = () => api<SessionSummary[]>('/api/sessions');
export const getSession = (id: string) => api<SessionDetail>(`/api/sessions/${id}`);

export function useSessions() {
  return useQuery({ queryKey: sessionKeys.list(), queryFn: getSessions });
}

export function useSession(id: string) {
  return useQuery({ queryKey: sessionKeys.detail(id), queryFn: () => getSession(id) });
}
