import { Link, useNavigate, useParams } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { SafetyNotice } from '@/components/safety-notice';
import { formatDeg, formatLength, formatPercent, formatTimestamp } from '@shared/format';
import { useMe } from '@/lib/auth/get-me';
import { Can, useCan } from '@/lib/auth/can';
import { useEnvelope } from '../api/get-envelopes';
import { useReopenEnvelope } from '../api/reopen';
import { EnvelopeResults } from './envelope-results';
import { SendSheetForm } from './send-sheet-form';
import { RevisionState } from './revision-state';
import { revisionName } from '@shared/revision-name';
import { OptionsTable } from './pass-through-options';
import { OPTION_NAMES } from '@shared/pass-through-rows';
import { pathTo } from '@/paths';

/** One envelope revision: the frozen snapshot, its hash check, the sheet and CSV, sending, re-opening. */
export function EnvelopePage() {
  const { id = '' } = useParams();
  const envelope = useEnvelope(id);
  const me = useMe();
  const reopen = useReopenEnvelope();
  const navigate = useNavigate();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  const can = useCan();
  return (
    <QueryState query={envelope}>
      {(e) => {
        const s = e.snapshot;
        return (
          <article className="space-y-4">
            <SafetyNotice compact />
            <header>
              <h1 className="text-2xl font-bold">{revisionName(e)}</h1>
              <p>
                Envelope of the session of {e.testedOn} · <RevisionState status={e.status} />
                {can('session.read') && (
                  <>
                    {' '}
                    ·{' '}
                    <Link className="underline" to={pathTo('deskSession', { id: e.sessionId })}>
                      back to the session
                    </Link>
                  </>
                )}
              </p>
            </header>
            {s === null ? (
              <p>This revision is a draft: its results are computed live on the session page until it is signed off.</p>
            ) : (
              <>
                <section className="card space-y-1" aria-label="Sign-off">
                  <p>
                    Signed off by <b>{s.signedBy.name}</b> on {formatTimestamp(s.signedAt)}.
                  </p>
                  <p className="break-all text-sm">
                    Content hash (SHA-256): <code>{e.contentHash}</code>
                  </p>
                  {e.hashVerifies ? (
                    <p className="text-good" role="status">
                      The stored snapshot matches its hash.
                    </p>
                  ) : (
                    <p className="rounded-lg bg-alert-light p-2 text-alert" role="alert">
                      The stored snapshot does NOT match its hash: do not use this sheet.
                    </p>
                  )}
                  <p className="text-sm">
                    Design twist {formatDeg(s.params.designTwistDeg)} ·{' '}
                    {s.params.method === 'prediction'
                      ? 'prediction bound per twist direction'
                      : `tolerance bound, runs within ±${formatDeg(s.params.repeatBandDeg ?? 1)}`}{' '}
                    at {formatPercent(s.params.confidence)} · margin {formatPercent(s.params.margin)} · allowance {formatLength(s.params.allowanceMm, unit)} ·
                    increment {formatLength(s.params.incrementMm, unit)} · {s.readings.length} readings used, {s.excludedReadings.length} excluded
                  </p>
                </section>
                <EnvelopeResults
                  result={s.result}
                  boot={s.boot}
                  bootNote={s.bootNote}
                  unit={unit}
                  acknowledgedFlags={s.format === 2 ? s.acknowledgedFlags : []}
                />
                {s.format === 2 && s.passThrough && (
                  <section className="space-y-2" aria-label="Pass-through design options, as signed">
                    <h3 className="text-lg font-bold">Pass-through design options, as signed</h3>
                    <p>{s.params.design?.option ? `Chosen: ${OPTION_NAMES[s.params.design.option]}.` : 'No option was chosen at sign-off.'}</p>
                    <OptionsTable result={s.passThrough} unit={unit} chosen={s.params.design?.option ?? null} />
                  </section>
                )}
                <p className="flex flex-wrap gap-2">
                  <a className="btn" href={`/api/envelopes/${e.id}/sheet.pdf?unit=${unit}`} download>
                    Fabrication sheet (PDF)
                  </a>
                  <a className="btn" href={`/api/envelopes/${e.id}/envelope.csv?unit=${unit}`} download>
                    Envelope (CSV)
                  </a>
                  {can('envelope.design') && e.status === 'signed' && (
                    <button
                      type="button"
                      className="btn"
                      disabled={reopen.isPending}
                      onClick={() =>
                        reopen.mutate(e.id, {
                          onSuccess: () => navigate({ pathname: pathTo('deskSession', { id: e.sessionId }), search: '?section=envelope' }),
                        })
                      }
                    >
                      Re-open as revision {e.revision + 1}
                    </button>
                  )}
                </p>
                {reopen.isError && (
                  <p role="alert" className="text-alert">
                    {reopen.error.message}
                  </p>
                )}
                {e.status === 'signed' && (
                  <Can action="envelope.send">
                    <SendSheetForm envelopeId={e.id} />
                  </Can>
                )}
                {e.sends.length > 0 && (
                  <section>
                    <h3 className="font-bold">Sent</h3>
                    <ul aria-label="Sheets sent">
                      {e.sends.map((x) => (
                        <li key={x.id}>
                          {formatTimestamp(x.sentAt)} · {x.toEmail} · by {x.sentBy}
                        </li>
                      ))}
                    </ul>
                  </section>
                )}
              </>
            )}
          </article>
        );
      }}
    </QueryState>
  );
}
