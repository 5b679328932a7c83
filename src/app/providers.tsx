import type { ReactNode } from 'react';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { createSyncStoragePersister } from '@tanstack/query-sync-storage-persister';
import { queryClient, PERSIST_MAX_AGE } from './query-client';

const persister = createSyncStoragePersister({ storage: window.localStorage, key: 'twistlog-query-cache' });

// A read whose last refresh failed (offline, every reload) keeps its data, and so must the stored
// cache: the default stores only successful reads, and a phone that reloaded twice without signal
// would forget who is signed in and send the tester to sign in, away from the field pages.
const keepWhatWasRead = (query: { state: { status: string; data: unknown } }) => query.state.status === 'success' || query.state.data !== undefined;

export function AppProviders({ children }: { children: ReactNode }) {
  return (
    <PersistQueryClientProvider
      client={queryClient}
      persistOptions={{ persister, maxAge: PERSIST_MAX_AGE, buster: __APP_VERSION__, dehydrateOptions: { shouldDehydrateQuery: keepWhatWasRead } }}
      // The restored cache opens the app at once (offline too), but a reload means "show me what
      // is true now": every restored read is marked stale and the ones on screen fetch again, so
      // the role in the header and the Team page's pending invitations are fresh after a reload.
      onSuccess={() => void queryClient.invalidateQueries()}
    >
      {children}
    </PersistQueryClientProvider>
  );
}
