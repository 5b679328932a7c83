import type { ReactNode } from 'react';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { createSyncStoragePersister } from '@tanstack/query-sync-storage-persister';
import { queryClient, PERSIST_MAX_AGE } from './query-client';

const persister = createSyncStoragePersister({ storage: window.localStorage, key: 'twistlog-query-cache' });

export function AppProviders({ children }: { children: ReactNode }) {
  return (
    <PersistQueryClientProvider
      client={queryClient}
      persistOptions={{ persister, maxAge: PERSIST_MAX_AGE, buster: __APP_VERSION__ }}
      // The restored cache opens the app at once (offline too), but a reload means "show me what
      // is true now": every restored read is marked stale and the ones on screen fetch again, so
      // the role in the header and the Team page's pending invitations are fresh after a reload.
      onSuccess={() => void queryClient.invalidateQueries()}
    >
      {children}
    </PersistQueryClientProvider>
  );
}
