import { useQuery } from '@tanstack/react-query';
import type { Me } from '@shared/schemas';
import { api, ApiError } from '@/lib/api-client';

export const meKeys = { all: ['me'] as const };

/** Who is signed in; null when nobody is. */
export async function getMe(): Promise<Me | null> {
  try {
    return await api<Me>('/api/me');
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

export function useMe() {
  return useQuery({ queryKey: meKeys.all, queryFn: getMe, staleTime: 5 * 60_000 });
}
