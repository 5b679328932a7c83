import { Link } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { useSessions } from '@/lib/api/get-sessions';
import { pathTo } from '@/paths';

/** The team's test sessions at the desk, newest first, with the latest signed-off revision of each. */
export function SessionListPage() {
  const sessions = useSessions();
  return (
    <section>
      <h1 className="mb-3 text-2xl font-bold">Sessions</h1>
      <QueryState query={sessions}>
        {(list) =>
          list.length === 0 ? (
            <p>No sessions yet.</p>
          ) : (
            <ul className="space-y-2">
              {list.map((s) => (
                <li key={s.id}>
                  <Link to={pathTo('deskSession', { id: s.id })} className="card flex min-h-touch flex-col hover:border-slate">
                    <span className="text-lg font-bold">{s.vehicleName}</span>
                    <span>
                      {s.testedOn} · {s.title || 'Flex test'}
                      {s.signed && (
                        <span className="ml-2 rounded bg-good-light px-1 text-sm font-bold text-good">signed off, revision {s.signed.revision}</span>
                      )}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          )
        }
      </QueryState>
    </section>
  );
}
