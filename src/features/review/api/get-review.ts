import { useQuery } from '@tanstack/react-query';
import type { GaugePoint, Photo, Pose, Reading, TestSession, Vehicle } from '@shared/schemas';
import type { HistoryEventRecord } from '@shared/schemas/envelope';
import { api } from '@/lib/api-client';

export const reviewKeys = {
  all: ['review'] as const,
  detail: (sessionId: string) => [...reviewKeys.all, 'detail', sessionId] as const,
};

export interface SessionReview {
  session: TestSession;
  vehicle: Vehicle;
  gaugePoints: GaugePoint[];
  poses: Pose[];
  readings: (Reading & { enteredBy: string })[];
  /** The session's photos, each with the pose it belongs to (or none). */
  photos: Photo[];
  /** Names of the people who entered readings, by user id. */
  people: Record<string, string>;
  history: HistoryEventRecord[];
}

export const getReview = (sessionId: string) => api<SessionReview>(`/api/sessions/${sessionId}/review`);

export function useReview(sessionId: string) {
  return useQuery({ queryKey: reviewKeys.detail(sessionId), queryFn: () => getReview(sessionId) });
}
