import { Link } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { formatTimestamp } from '@shared/format';
import { useSignedEnvelopes } from '../api/get-envelopes';
import { RevisionState } from './revision-state';
import { revisionName } from '@shared/revision-name';
import { pathTo } from '@/paths';

/** Every signed-off envelope of the workshop, newest first, with its sheet. */
export function SignedEnvelopesList() {
  const signed = useSignedEnvelopes();
  return (
    <section>
      <h2 className="mb-3 text-2xl font-bold">Signed-off envelopes</h2>
      <QueryState query={signed}>
        {(list) =>
          list.length === 0 ? (
            <p>No envelope has been signed off yet.</p>
          ) : (
            <ul className="grid gap-2 sm:grid-cols-2">
              {list.map((e) => (
                <li key={e.id} className="card">
                  <Link className="text-lg font-bold underline" to={pathTo('envelope', { id: e.id })}>
                    {revisionName(e)}
                  </Link>{' '}
                  <RevisionState status="signed" />
                  <p className="text-sm">
                    {e.sessionTitle} ({e.testedOn}) · signed by {e.signedBy} on {formatTimestamp(e.signedAt)}
                  </p>
                  <a className="underline" href={`/api/envelopes/${e.id}/sheet.pdf`} download>
                    Fabrication sheet (PDF)
                  </a>
                </li>
              ))}
            </ul>
          )
        }
      </QueryState>
    </section>
  );
}
