import { lazy, Suspense, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { DeskSessionData } from '@shared/desk-envelope';
import type { UnitSystem } from '@shared/schemas/common';
import type { EnvelopeRecord } from '@shared/schemas/envelope';
import { formatTimestamp } from '@shared/format';
import { QueryState } from '@/components/query-state';
import { useSessionEnvelopes } from '../api/get-envelopes';
import { useCreateDraft } from '../api/create-draft';
import { useSaveDraft } from '../api/save-draft';
import { useSignOff } from '../api/sign-off';
import { useReopenEnvelope } from '../api/reopen';
import { useLiveEnvelope } from '../hooks/use-live-envelope';
import { EnvelopeResults } from './envelope-results';
import { ParamsForm, fromFormState, toFormState, type ParamsFormState } from './params-form';

const TwistChart = lazy(() => import('@/components/desk-charts').then((m) => ({ default: m.TwistChart })));

interface Props {
  data: DeskSessionData;
  unit: UnitSystem;
  canDesign: boolean;
  canSign: boolean;
}

/** The envelope of a session: the open draft with its live results, sign-off, and the signed revisions. */
export function EnvelopePanel({ data, unit, canDesign, canSign }: Props) {
  const envelopes = useSessionEnvelopes(data.session.id);
  return (
    <QueryState query={envelopes}>
      {(list) => {
        const draft = list.find((e) => e.status === 'draft');
        const signed = list.filter((e) => e.status !== 'draft');
        return (
          <div className="space-y-4">
            {draft ? (
              <DraftEditor key={`${draft.id}-${draft.version}`} draft={draft} data={data} unit={unit} canDesign={canDesign} canSign={canSign} />
            ) : (
              <NoDraft sessionId={data.session.id} latest={signed[0]} canDesign={canDesign} />
            )}
            <section>
              <h3 className="text-lg font-bold">Signed revisions</h3>
              {signed.length === 0 ? (
                <p>None yet.</p>
              ) : (
                <ul className="space-y-1">
                  {signed.map((e) => (
                    <li key={e.id}>
                      <Link className="font-bold underline" to={`/desk/envelopes/${e.id}`}>
                        Revision {e.revision}
                      </Link>{' '}
                      · {e.status} · signed by {e.signedBy?.name} on {formatTimestamp(e.signedAt!)}
                    </li>
                  ))}
                </ul>
              )}
            </section>
          </div>
        );
      }}
    </QueryState>
  );
}

function NoDraft({ sessionId, latest, canDesign }: { sessionId: string; latest: EnvelopeRecord | undefined; canDesign: boolean }) {
  const create = useCreateDraft(sessionId);
  const reopen = useReopenEnvelope();
  const error = create.error ?? reopen.error;
  if (!canDesign) return <p>No draft is open.</p>;
  return (
    <div className="space-y-2">
      {latest?.status === 'signed' ? (
        <button type="button" className="btn-primary" disabled={reopen.isPending} onClick={() => reopen.mutate(latest.id)}>
          Re-open as revision {latest.revision + 1}
        </button>
      ) : (
        <button type="button" className="btn-primary" disabled={create.isPending} onClick={() => create.mutate(undefined)}>
          Start an envelope draft
        </button>
      )}
      {latest?.status === 'signed' && <p className="text-sm">Revision {latest.revision} stays signed until the new revision is signed off.</p>}
      {error && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {error.message}
        </p>
      )}
    </div>
  );
}

function DraftEditor({ draft, data, unit, canDesign, canSign }: { draft: EnvelopeRecord; data: DeskSessionData; unit: UnitSystem; canDesign: boolean; canSign: boolean }) {
  const [form, setForm] = useState<ParamsFormState>(() => toFormState(draft.params, unit));
  const { params, problems } = fromFormState(form, unit);
  const { envelope, error } = useLiveEnvelope(data, params);
  const save = useSaveDraft(data.session.id);
  const sign = useSignOff();
  const navigate = useNavigate();
  const dirty = params !== null && JSON.stringify(params) !== JSON.stringify(draft.params);
  const failure = save.error ?? sign.error;

  const signOff = async () => {
    // The server signs the parameters it holds: save what is on screen first.
    const version = dirty && params ? (await save.mutateAsync({ id: draft.id, version: draft.version, params })).version : draft.version;
    const signed = await sign.mutateAsync({ id: draft.id, version });
    navigate(`/desk/envelopes/${signed.id}`);
  };

  return (
    <section className="space-y-4" aria-label={`Envelope draft, revision ${draft.revision}`}>
      <h3 className="text-lg font-bold">Draft revision {draft.revision}</h3>
      <ParamsForm form={form} unit={unit} readOnly={!canDesign} onChange={setForm} />
      {problems.length > 0 && (
        <ul role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      )}
      {error && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          The envelope cannot be computed: {error}
        </p>
      )}
      {envelope && (
        <>
          <EnvelopeResults result={envelope.result} boot={envelope.boot} bootNote={envelope.bootNote} unit={unit} />
          <Suspense fallback={<p role="status">Loading the charts…</p>}>
            <TwistChart result={envelope.result} unit={unit} />
          </Suspense>
        </>
      )}
      <div className="flex flex-wrap gap-2">
        {canDesign && (
          <button type="button" className="btn" disabled={!dirty || save.isPending} onClick={() => params && save.mutate({ id: draft.id, version: draft.version, params })}>
            Save parameters
          </button>
        )}
        {canSign && (
          <button type="button" className="btn-primary" disabled={!params || !envelope || save.isPending || sign.isPending} onClick={() => void signOff().catch(() => undefined)}>
            Sign off revision {draft.revision}
          </button>
        )}
      </div>
      {canSign && <p className="text-sm">Signing freezes the parameters and the readings as they are on the server now; later edits never change a signed revision.</p>}
      {failure && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {failure.message}
        </p>
      )}
    </section>
  );
}
