import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';

/** Loading and error states of a query, the same everywhere. */
export function QueryState<T>({ query, children }: { query: UseQueryResult<T>; children: (data: T) => ReactNode }) {
  if (query.isPending)
    return (
      <p className="py-6 text-slate" role="status">
        Loading…
      </p>
    );
  if (query.isError)
    return (
      <p className="rounded-lg bg-alert-light p-3 text-alert" role="alert">
        Could not load: {query.error.message}
      </p>
    );
  return <>{children(query.data)}</>;
}
