import { useState, useSyncExternalStore } from 'react';
import { Link } from 'react-router-dom';
import { usePendingCounts, useMetaValue } from '@/lib/db/live';
import { useLocalWrites } from '@/lib/db/writes-in-flight';
import { barSummary } from '../bar-summary';
import { syncNow, syncState } from '../engine/sync-engine';
import { usePersistentStorage } from '../hooks/use-persistent-storage';
import { pathTo } from '@/paths';

const ago = (iso: string | null | undefined) => {
  if (!iso) return 'never';
  const s = Math.round((Date.now() - new Date(iso).getTime()) / 1000);
  if (s < 60) return 'just now';
  if (s < 3600) return `${Math.round(s / 60)} min ago`;
  return new Date(iso).toLocaleString();
};

/**
 * Always on screen, in one line on a phone: connection, what waits to be sent, a sync under way
 * with its photo upload progress, conflicts and refused photos, and the last error. The line opens
 * the details: last sync, storage, each field of the error, and Sync now.
 */
export function SyncStatusBar() {
  const engine = useSyncExternalStore(syncState.subscribe, syncState.get);
  const counts = usePendingCounts();
  const writes = useLocalWrites();
  const summary = barSummary(counts, writes);
  const lastSyncAt = useMetaValue('lastSyncAt');
  const lastError = useMetaValue('lastError');
  const persisted = usePersistentStorage();
  const [open, setOpen] = useState(false);
  const pct = engine.progress && engine.progress.total ? Math.round((100 * engine.progress.loaded) / engine.progress.total) : null;
  return (
    <section aria-label="Sync state" className="border-b-2 border-rule bg-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-3 px-3 text-sm">
        <button
          type="button"
          className="flex min-h-touch min-w-0 flex-1 items-center gap-2 text-left"
          aria-expanded={open}
          aria-controls="sync-details"
          onClick={() => setOpen(!open)}
        >
          <span className="sr-only">Sync details:</span>
          <span className={`shrink-0 font-bold ${engine.online ? 'text-good' : 'text-alert'}`}>{engine.online ? 'Online' : 'Offline'}</span>
          <span data-testid="sync-pending" className={`min-w-0 truncate font-bold ${summary.allSaved ? 'text-good' : ''}`}>
            {summary.text}
          </span>
          {engine.running && (
            <span role="status" className="shrink-0">
              Syncing…{pct != null && ` photo ${pct}%`}
            </span>
          )}
          <span aria-hidden className="ml-auto shrink-0 text-lg">
            {open ? '▴' : '▾'}
          </span>
        </button>
        {!!counts?.conflicts && (
          <Link to={pathTo('sync')} className="flex min-h-touch items-center font-bold text-alert underline">
            {counts.conflicts} conflict{counts.conflicts > 1 ? 's' : ''} to resolve
          </Link>
        )}
        {!!counts?.held && (
          <Link to={pathTo('sync')} className="flex min-h-touch items-center font-bold text-alert underline">
            See the held records
          </Link>
        )}
        {!!counts?.failedPhotos && (
          <Link to={pathTo('sync')} className="flex min-h-touch items-center font-bold text-alert underline">
            {counts.failedPhotos} photo{counts.failedPhotos > 1 ? 's' : ''} refused
          </Link>
        )}
      </div>
      {pct != null && <progress className="block h-1 w-full" max={100} value={pct} aria-label="Photo upload" />}
      {lastError && (
        <p role="alert" className="mx-auto max-w-6xl truncate px-3 pb-1 text-sm font-bold text-alert">
          Sync problem: {lastError.message}
        </p>
      )}
      {open && (
        <div id="sync-details" className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-1 px-3 pb-2 text-sm">
          <span>Last sync: {ago(lastSyncAt)}</span>
          <span>
            Storage: {persisted === true ? 'kept by the browser' : persisted === false ? 'may be cleared when space runs low — sync often' : 'checking…'}
          </span>
          {lastError && lastError.fields.length > 0 && (
            <ul className="w-full list-disc pl-5 text-alert">
              {lastError.fields.slice(0, 5).map((f) => (
                <li key={f.field}>
                  {f.field}: {f.message}
                </li>
              ))}
            </ul>
          )}
          <button type="button" className="btn ml-auto min-h-touch" disabled={engine.running || !engine.online} onClick={() => void syncNow({ force: true })}>
            Sync now
          </button>
        </div>
      )}
    </section>
  );
}
