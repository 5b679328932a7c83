import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Me } from '@shared/schemas';
import { api, ApiError } from '@/lib/api-client';

/** Who is signed in; null when nobody is. */
export async function getMe(): Promise<Me | null> {
  try {
    return await api<Me>('/api/me');
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

/** Who is signed in: one query, kept five minutes; sign-in and account changes refresh it through `meQuery().queryKey`. */
export const meQuery = () => queryOptions({ queryKey: ['me'] as const, queryFn: getMe, staleTime: 5 * 60_000 });

export const useMe = () => useQuery(meQuery());
