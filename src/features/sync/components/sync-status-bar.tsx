import { useSyncExternalStore } from 'react';
import { Link } from 'react-router-dom';
import { usePendingCounts, useMetaValue } from '@/lib/db/live';
import { useLocalWrites } from '@/lib/db/writes-in-flight';
import { barSummary } from '../bar-summary';
import { syncNow, syncState } from '@/sync/sync-engine';
import { usePersistentStorage } from '../hooks/use-persistent-storage';

const ago = (iso: string | null | undefined) => {
  if (!iso) return 'never';
  const s = Math.round((Date.now() - new Date(iso).getTime()) / 1000);
  if (s < 60) return 'just now';
  if (s < 3600) return `${Math.round(s / 60)} min ago`;
  return new Date(iso).toLocaleString();
};

/** Always on screen: connection, what waits to be sent, the last sync, any error, upload progress. */
export function SyncStatusBar() {
  const engine = useSyncExternalStore(syncState.subscribe, syncState.get);
  const counts = usePendingCounts();
  const writes = useLocalWrites();
  const summary = barSummary(counts, writes);
  const lastSyncAt = useMetaValue('lastSyncAt');
  const lastError = useMetaValue('lastError');
  const persisted = usePersistentStorage();
  const pct = engine.progress && engine.progress.total ? Math.round((100 * engine.progress.loaded) / engine.progress.total) : null;
  return (
    <section aria-label="Sync state" className="border-b-2 border-rule bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-1 px-3 py-2 text-sm">
        <span className={`font-bold ${engine.online ? 'text-good' : 'text-alert'}`}>{engine.online ? 'Online' : 'Offline'}</span>
        <span data-testid="sync-pending" className={`font-bold ${summary.allSaved ? 'text-good' : ''}`}>
          {summary.text}
        </span>
        <span>Last sync: {ago(lastSyncAt)}</span>
        {engine.running && <span role="status">Syncing…{pct != null && ` photo ${pct}%`}</span>}
        {pct != null && <progress className="h-3 w-24" max={100} value={pct} aria-label="Photo upload" />}
        {!!counts?.conflicts && (
          <Link to="/field/sync" className="font-bold text-alert underline">
            {counts.conflicts} conflict{counts.conflicts > 1 ? 's' : ''} to resolve
          </Link>
        )}
        {!!counts?.held && (
          <Link to="/field/sync" className="font-bold text-alert underline">
            See the held records
          </Link>
        )}
        {!!counts?.failedPhotos && (
          <Link to="/field/sync" className="font-bold text-alert underline">
            {counts.failedPhotos} photo{counts.failedPhotos > 1 ? 's' : ''} refused
          </Link>
        )}
        <span>Storage: {persisted === true ? 'kept by the browser' : persisted === false ? 'may be cleared when space runs low — sync often' : 'checking…'}</span>
        <button type="button" className="btn ml-auto min-h-touch" disabled={engine.running || !engine.online} onClick={() => void syncNow({ force: true })}>
          Sync now
        </button>
      </div>
      {lastError && (
        <div role="alert" className="mx-auto max-w-6xl px-3 pb-2 text-sm font-bold text-alert">
          Sync problem: {lastError.message}
          {lastError.fields.length > 0 && (
            <ul className="list-disc pl-5 font-normal">
              {lastError.fields.slice(0, 5).map((f) => (
                <li key={f.field}>
                  {f.field}: {f.message}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </section>
  );
}
