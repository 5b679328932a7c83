import { lazy, Suspense, useEffect, useRef, useState, useSyncExternalStore } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { SafetyNotice } from '@/components/safety-notice';
import { AXIS_NAMES } from '@shared/format';
import { envelopeRemarks } from '@shared/envelope-rows';
import { plural } from '@shared/plural';
import { useMe } from '@/lib/auth/get-me';
import { useCan } from '@/lib/auth/can';
import { reviewQueries, useReview, type SessionReview } from '@/features/review/api/get-review';
import { useTeam } from '@/features/team/api/team';
import { syncState } from '@/features/sync/engine/sync-engine';
import { useLocalRetests } from '@/lib/db/live';
import { AskRetest, RetestList, type RetestLookups } from '@/components/retest-requests';
import { retestTargetWords } from '@shared/retest-words';
import { useFitFlags } from '@/features/review/hooks/use-fit-flags';
import { ReadingsTable } from '@/features/review/components/readings-table';
import { ReadingEditor } from '@/features/review/components/reading-editor';
import { SessionConditions } from '@/features/review/components/pose-context';
import { HistoryList } from '@/features/review/components/history-list';
import { OpeningPlot } from '@/features/review/components/opening-plot';
import { pathTo } from '@/paths';
import { EnvelopePanel } from '@/features/envelope/components/envelope-panel';

const TwistChart = lazy(() => import('@/components/desk-charts').then((m) => ({ default: m.TwistChart })));

const SECTIONS = [
  { id: 'readings', label: 'Readings' },
  { id: 'plots', label: 'Plots' },
  { id: 'envelope', label: 'Envelope and sign-off' },
  { id: 'history', label: 'History' },
] as const;
type Section = (typeof SECTIONS)[number]['id'];

/** The engineer's desk for one session: review the readings, look at the motion, derive and sign the envelope. */
export function SessionDeskPage() {
  const { id = '' } = useParams();
  const review = useReview(id);
  return <QueryState query={review}>{(data) => <SessionDesk review={data} />}</QueryState>;
}

/**
 * Asks for the review again after each sync run: re-test requests and the crew's answers travel
 * through the phone store's sync, and the history that records them is the server's.
 */
function useReviewAfterSync(sessionId: string) {
  const queryClient = useQueryClient();
  const running = useSyncExternalStore(syncState.subscribe, () => syncState.get().running);
  const wasRunning = useRef(running);
  useEffect(() => {
    if (wasRunning.current && !running) void queryClient.invalidateQueries({ queryKey: reviewQueries.detail(sessionId).queryKey });
    wasRunning.current = running;
  }, [running, sessionId, queryClient]);
}

function SessionDesk({ review }: { review: SessionReview }) {
  useReviewAfterSync(review.session.id);
  const retests = useLocalRetests(review.session.id)?.requests ?? [];
  const team = useTeam();
  const nameOf = (userId: string) => team.data?.members.find((m) => m.userId === userId)?.name;
  const look: RetestLookups = {
    pose: (pid) => review.poses.find((p) => p.id === pid),
    point: (gid) => review.gaugePoints.find((g) => g.id === gid),
  };
  const retestOf = (id: string) => {
    const r = retests.find((x) => x.id === id);
    return r ? retestTargetWords(r, look) : null;
  };
  const me = useMe();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  const can = useCan();
  const [search, setSearch] = useSearchParams();
  const section = (SECTIONS.find((s) => s.id === search.get('section'))?.id ?? 'readings') as Section;
  const [selected, setSelected] = useState<string | null>(null);
  const fit = useFitFlags(review);
  const readingRemarks = fit.result ? envelopeRemarks(fit.result, unit).readings : [];
  const labelOf = (readingId: string) => {
    const r = review.readings.find((x) => x.id === readingId);
    if (!r) return null;
    return `${review.poses.find((p) => p.id === r.poseId)?.label ?? '?'} ${review.gaugePoints.find((g) => g.id === r.gaugePointId)?.label ?? '?'} ${AXIS_NAMES[r.axis]}`;
  };
  return (
    <div className="space-y-4">
      <SafetyNotice compact />
      <header>
        <h1 className="text-2xl font-bold">
          <Link className="inline-flex min-h-touch items-center underline" to={pathTo('deskVehicle', { id: review.vehicle.id })}>
            {review.vehicle.name}
          </Link>
        </h1>
        <p>
          {review.session.testedOn} · {review.session.title} · {plural(review.poses.length, 'pose')} ·{' '}
          {plural(review.readings.filter((r) => r.excluded).length, 'reading')} excluded · {fit.flags.size} far from the fit
        </p>
      </header>
      <nav aria-label="Session sections" className="flex flex-wrap gap-2">
        {SECTIONS.map((s) => (
          <button
            key={s.id}
            type="button"
            aria-pressed={section === s.id}
            className={section === s.id ? 'btn-primary' : 'btn'}
            onClick={() => setSearch(s.id === 'readings' ? {} : { section: s.id }, { replace: true })}
          >
            {s.label}
          </button>
        ))}
      </nav>
      {fit.error && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          The fit cannot run on these readings: {fit.error}
        </p>
      )}
      {section === 'readings' && (
        <div className="space-y-3">
          <SessionConditions session={review.session} />
          <section className="card space-y-2" aria-label="Re-test requests of this session">
            <h2 className="font-bold">
              Re-test requests
              {retests.length > 0 &&
                ` · ${plural(retests.filter((r) => r.state === 'open').length, 'open request')}, ${retests.filter((r) => r.state === 'answered').length} answered`}
            </h2>
            <RetestList
              requests={retests}
              look={look}
              me={me.data?.user.id}
              canAnswer={false}
              canAsk={can('retest.ask')}
              nameOf={nameOf}
              empty="No re-test requests: ask for one on the session, a pose (beside its notes) or a reading (open it in the table)."
            />
            {can('retest.ask') && <AskRetest target={{ sessionId: review.session.id }} what="the whole session" />}
          </section>
          <ReadingsTable
            review={review}
            flags={fit.flags}
            unit={unit}
            selectedId={selected}
            onSelect={can('session.review') ? setSelected : undefined}
            poseExtra={(pose) => {
              const waiting = retests.filter((r) => r.poseId === pose.id && r.state === 'open').length;
              return (
                <p className="flex flex-wrap items-center gap-2">
                  {waiting > 0 && <b>{plural(waiting, 're-test request')} waiting for the crew</b>}
                  {can('retest.ask') && <AskRetest target={{ sessionId: review.session.id, poseId: pose.id }} what={pose.label || `Pose ${pose.seq}`} />}
                </p>
              );
            }}
            editor={
              selected && (
                <ReadingEditor
                  key={selected}
                  review={review}
                  readingId={selected}
                  flag={fit.flags.get(selected)}
                  unit={unit}
                  onClose={() => setSelected(null)}
                />
              )
            }
          />
          {readingRemarks.length > 0 && (
            <section className="card" aria-label="Remarks on the readings and the fit">
              <h2 className="font-bold">Remarks on the readings and the fit</h2>
              <ul className="list-disc pl-6 text-sm">
                {readingRemarks.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </section>
          )}
          <p className="flex flex-wrap gap-2">
            <a className="btn" href={`/api/sessions/${review.session.id}/readings.csv?unit=${unit}`} download>
              Readings (CSV)
            </a>
          </p>
        </div>
      )}
      {section === 'plots' && (
        <div className="space-y-4">
          <OpeningPlot review={review} result={fit.result} unit={unit} />
          {fit.result && (
            <Suspense fallback={<p role="status">Loading the charts…</p>}>
              <TwistChart result={fit.result} unit={unit} />
            </Suspense>
          )}
          <p className="text-sm">The charts here use the default parameters; the envelope section shows them with the draft's design twist and confidence.</p>
        </div>
      )}
      {section === 'envelope' && <EnvelopePanel data={review} unit={unit} canDesign={can('envelope.design')} canSign={can('envelope.signOff')} />}
      {section === 'history' && <HistoryList events={review.history} labelOf={labelOf} retestOf={retestOf} unit={unit} />}
    </div>
  );
}
