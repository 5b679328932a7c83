import { Link } from 'react-router-dom';
import { useLocalSessions } from '@/lib/db/live';

/** Field home: the sessions on this phone (recorded here or pulled from the server), newest first. */
export function FieldSessionsPage() {
  const data = useLocalSessions();
  return (
    <section className="space-y-3">
      <div className="flex flex-wrap items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">Sessions</h1>
        <Link to="/field/vehicles" className="btn">
          Vehicles
        </Link>
        <Link to="/field/sessions/new" className="btn-primary">
          Start a session
        </Link>
      </div>
      {!data && <p role="status">Loading…</p>}
      {data?.corrupt.length ? <p role="alert" className="text-alert">{data.corrupt.length} stored session(s) could not be read: {data.corrupt[0].message}</p> : null}
      {data?.sessions.length === 0 && <p>No sessions on this phone yet.</p>}
      <ul className="space-y-2">
        {data?.sessions.map((s) => (
          <li key={s.id}>
            <Link to={`/field/sessions/${s.id}`} className="card flex min-h-touch flex-col hover:border-slate">
              <span className="text-lg font-bold">{s.vehicleName}</span>
              <span>
                {s.testedOn} · {s.title || 'Flex test'}
                {s.pending && <span className="ml-2 rounded bg-signal/30 px-1 text-sm font-bold">not yet sent</span>}
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}
