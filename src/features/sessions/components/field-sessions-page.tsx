import { plural } from '@shared/plural';
import { useSyncExternalStore } from 'react';
import { Link } from 'react-router-dom';
import { onlineManager } from '@tanstack/react-query';
import { useLocalSessions } from '@/lib/db/live';
import { useSessions } from '@/lib/api/get-sessions';
import { pathTo } from '@/paths';

const time = (ms: number) => new Date(ms).toLocaleString([], { dateStyle: 'short', timeStyle: 'short' });

/**
 * Field home: the sessions on this phone (recorded here or pulled from the server), newest first,
 * each with its state: how many poses, how many records and photos still wait to be sent and how
 * many re-test requests wait for an answer (from the phone's own store), and whether an engineer has signed off its envelope. The signed-off
 * state comes from the server's session list, kept in the app's cache: offline it shows what was
 * last heard, and says since when.
 */
export function FieldSessionsPage() {
  const data = useLocalSessions();
  const server = useSessions();
  const signedOf = new Map(server.data?.map((s) => [s.id, s.signed]));
  const online = useSyncExternalStore(onlineManager.subscribe.bind(onlineManager), () => onlineManager.isOnline());
  const heard = server.data !== undefined;
  const current = heard && online && !server.isError;
  return (
    <section className="space-y-3">
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">Sessions</h1>
        <Link to={pathTo('vehicles')} className="btn">
          Vehicles
        </Link>
        <Link to={pathTo('newSession')} className="btn-primary">
          Start a session
        </Link>
      </div>
      {!data && <p role="status">Loading…</p>}
      {data?.corrupt.length ? (
        <p role="alert" className="text-alert">
          {plural(data.corrupt.length, 'stored session')} could not be read: {data.corrupt[0].message}
        </p>
      ) : null}
      {data?.sessions.length === 0 && <p>No sessions on this phone yet.</p>}
      {data && data.sessions.length > 0 && !current && (
        <p className="text-sm" data-testid="signed-state-note">
          {heard ? `Sign-off as last heard from the server, ${time(server.dataUpdatedAt)}.` : 'Sign-off is not known on this phone until it has been online.'}
        </p>
      )}
      <ul className="space-y-2">
        {data?.sessions.map((s) => {
          const signed = signedOf.get(s.id);
          return (
            <li key={s.id}>
              <Link to={pathTo('fieldSession', { id: s.id })} className="card flex min-h-touch flex-col hover:border-slate" aria-describedby={`state-${s.id}`}>
                <span className="text-lg font-bold">{s.vehicleName}</span>
                <span>
                  {s.testedOn} · {s.title || 'Flex test'}
                </span>
                <span id={`state-${s.id}`} className="mt-1 flex flex-wrap gap-2 text-sm" data-testid="session-state">
                  <span>
                    {s.poseCount} pose{s.poseCount === 1 ? '' : 's'}
                  </span>
                  {s.unsent > 0 ? <span className="rounded bg-signal/30 px-1 font-bold">{s.unsent} not yet sent</span> : <span>all sent</span>}
                  {s.openRetests > 0 && (
                    <span className="rounded border-2 border-signal-dark px-1 font-bold">{plural(s.openRetests, 're-test request')} to answer</span>
                  )}
                  {signed ? (
                    <span className="rounded bg-good-light px-1 font-bold text-good">signed off, revision {signed.revision}</span>
                  ) : heard ? (
                    <span>not signed off</span>
                  ) : (
                    <span>sign-off not known</span>
                  )}
                </span>
              </Link>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
