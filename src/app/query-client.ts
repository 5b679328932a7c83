import { QueryClient } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-client';

// Reads come from the server through TanStack Query; the cache is persisted (see providers.tsx)
// so the app opens with data when offline. gcTime ≥ the persister's maxAge (24 h), or restored
// entries would be thrown away at once.
export const PERSIST_MAX_AGE = 1000 * 60 * 60 * 24;

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      gcTime: PERSIST_MAX_AGE,
      staleTime: 30_000,
      networkMode: 'offlineFirst',
      retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
    },
    mutations: { networkMode: 'always' },
  },
});
