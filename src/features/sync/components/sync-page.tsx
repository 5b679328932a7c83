import { Link } from 'react-router-dom';
import type { SyncEntity } from '@shared/schemas/sync';
import { useOpenConflicts, useRefusedPhotos } from '@/lib/db/live';
import { useUnsentRecords, type FieldLookups, type UnsentRecord } from '@/lib/db/unsent';
import { useFieldUnit } from '@/lib/field/use-field-unit';
import { syncNow } from '../engine/sync-engine';
import { useResolveConflict } from '../api/resolve-conflict';
import { differences, differenceSentence, recordTitle, valuesLine } from '../describe';
import { exportFileName, unsentAsCsv, unsentAsJson } from '../unsent-export';
import { pathTo } from '@/paths';

/** Where the tester fixes a record: its own page in the field. */
function pageOf(entity: SyncEntity, r: Record<string, unknown>, look: FieldLookups): string | null {
  const poseUrl = (poseId: string) => {
    const pose = look.poses.get(poseId);
    return pose ? pathTo('fieldPose', { id: pose.sessionId, poseId: pose.id }) : null;
  };
  switch (entity) {
    case 'reading':
      return poseUrl(String(r.poseId));
    case 'pose':
      return poseUrl(String(r.id));
    case 'testSession':
      return pathTo('fieldSession', { id: String(r.id) });
    case 'gaugePoint':
      return pathTo('vehicle', { id: String(r.vehicleId) });
    case 'vehicle':
      return pathTo('vehicle', { id: String(r.id) });
    case 'retestRequest':
      return r.poseId ? poseUrl(String(r.poseId)) : pathTo('fieldSession', { id: String(r.sessionId) });
  }
}

function download(text: string, type: string, name: string) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** Records held back, conflicts kept by the server (both versions in the trade's words), and photos it refused. */
export function SyncPage() {
  const conflicts = useOpenConflicts();
  const refused = useRefusedPhotos();
  const unsentData = useUnsentRecords();
  const [unit] = useFieldUnit();
  const resolve = useResolveConflict();
  const unsent = unsentData?.unsent ?? [];
  const look = unsentData?.lookups;
  const held = unsent.filter((u) => u.state === 'held');
  const describe = (u: UnsentRecord) => (look ? recordTitle(u.entity, u.record, look) : u.entity);
  return (
    <section className="space-y-4">
      <h1 className="text-2xl font-bold">Sync</h1>

      <h2 className="text-xl font-bold">Held back</h2>
      {held.length === 0 ? (
        <p>Nothing is held back.</p>
      ) : (
        <>
          <p>
            The server refused these records, so they stay on this phone. Change what it names on the record's page and they go with the next sync, or try again
            now.
          </p>
          <ul className="space-y-2">
            {held.map((u) => {
              const href = look && pageOf(u.entity, u.record, look);
              return (
                <li key={`${u.entity}:${u.record.id}`} className="card space-y-1">
                  <p className="font-bold">
                    {href ? (
                      <Link to={href} className="underline">
                        {describe(u)}
                      </Link>
                    ) : (
                      describe(u)
                    )}
                  </p>
                  {look && <p>{valuesLine(u.entity, u.record, look, unit)}</p>}
                  <p className="text-alert">Refused: {u.problem}</p>
                </li>
              );
            })}
          </ul>
          <button type="button" className="btn-primary" onClick={() => void syncNow({ force: true })}>
            Try again now
          </button>
        </>
      )}
      {unsent.length > 0 && look && (
        <div className="card space-y-2">
          <p>
            {unsent.length} record{unsent.length > 1 ? 's are' : ' is'} not on the server yet. Keep a copy as a file, so nothing is lost whatever happens to
            this phone:
          </p>
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn" onClick={() => download(unsentAsJson(unsent, look), 'application/json', exportFileName('json'))}>
              Save as JSON
            </button>
            <button type="button" className="btn" onClick={() => download(unsentAsCsv(unsent, look, unit), 'text/csv', exportFileName('csv'))}>
              Save as CSV
            </button>
          </div>
        </div>
      )}

      <h2 className="text-xl font-bold">Conflicts</h2>
      {conflicts?.length === 0 && <p>No conflicts.</p>}
      {resolve.isError && (
        <p role="alert" className="font-bold text-alert">
          Could not resolve: {resolve.error.message}
        </p>
      )}
      {look &&
        conflicts?.map((c) => (
          <article key={c.id} className="card space-y-2">
            <p className="font-bold">
              {recordTitle(c.entity, c.clientRecord, look)} was changed on another device or at the desk after this phone's edit. Which one is right?
            </p>
            <ul className="list-disc pl-5">
              {differences(c.entity, c.clientRecord, c.serverRecord, look, unit).map((d) => (
                <li key={d.key}>{differenceSentence(d)}</li>
              ))}
            </ul>
            <div className="flex flex-wrap gap-2">
              <button type="button" className="btn-primary" disabled={resolve.isPending} onClick={() => resolve.mutate({ id: c.id, keep: 'client' })}>
                Keep this phone's
              </button>
              <button type="button" className="btn" disabled={resolve.isPending} onClick={() => resolve.mutate({ id: c.id, keep: 'server' })}>
                Keep the server's
              </button>
            </div>
          </article>
        ))}

      <h2 className="text-xl font-bold">Photos the server refused</h2>
      {refused?.length === 0 && <p>None.</p>}
      <ul className="space-y-1">
        {refused?.map((p) => (
          <li key={p.id} className="card">
            Photo taken {new Date(p.takenAt).toLocaleString()}: {p.error}
          </li>
        ))}
      </ul>
    </section>
  );
}
