import { useLiveQuery } from 'dexie-react-hooks';
import { fieldDb } from '@/lib/db/field-db';
import { useOpenConflicts } from '@/lib/db/live';
import { useResolveConflict } from '../api/resolve-conflict';

const hidden = new Set(['id', 'version', 'changeSeq', 'deletedAt']);

/** Conflicts kept by the server (both versions side by side) and photos it refused. */
export function SyncPage() {
  const conflicts = useOpenConflicts();
  const failed = useLiveQuery(() => fieldDb.photos.where('status').equals('failed').toArray());
  const resolve = useResolveConflict();
  return (
    <section className="space-y-4">
      <h1 className="text-2xl font-bold">Sync</h1>
      <h2 className="text-xl font-bold">Conflicts</h2>
      {conflicts?.length === 0 && <p>No conflicts.</p>}
      {resolve.isError && <p role="alert" className="font-bold text-alert">Could not resolve: {resolve.error.message}</p>}
      {conflicts?.map((c) => {
        const keys = Object.keys({ ...c.serverRecord, ...c.clientRecord }).filter((k) => !hidden.has(k));
        const differs = keys.filter((k) => JSON.stringify(c.clientRecord[k]) !== JSON.stringify(c.serverRecord[k]));
        return (
          <article key={c.id} className="card space-y-2">
            <p className="font-bold">
              A {c.entity} changed on the server (version {c.serverVersion}) after this phone's edit (based on version {c.baseVersion}).
            </p>
            <table className="w-full text-left">
              <thead>
                <tr>
                  <th scope="col">Field</th>
                  <th scope="col">This phone</th>
                  <th scope="col">Server</th>
                </tr>
              </thead>
              <tbody>
                {differs.map((k) => (
                  <tr key={k}>
                    <th scope="row">{k}</th>
                    <td>{JSON.stringify(c.clientRecord[k])}</td>
                    <td>{JSON.stringify(c.serverRecord[k])}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <div className="flex gap-2">
              <button type="button" className="btn-primary" disabled={resolve.isPending} onClick={() => resolve.mutate({ id: c.id, keep: 'client' })}>
                Keep this phone's
              </button>
              <button type="button" className="btn" disabled={resolve.isPending} onClick={() => resolve.mutate({ id: c.id, keep: 'server' })}>
                Keep the server's
              </button>
            </div>
          </article>
        );
      })}
      <h2 className="text-xl font-bold">Photos the server refused</h2>
      {failed?.length === 0 && <p>None.</p>}
      <ul className="space-y-1">
        {failed?.map((p) => (
          <li key={p.id} className="card">
            Photo taken {new Date(p.takenAt).toLocaleString()}: {p.error}
          </li>
        ))}
      </ul>
    </section>
  );
}
