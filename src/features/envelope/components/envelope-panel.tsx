import { lazy, Suspense, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { deskFlags, type DeskEnvelope, type DeskFlag, type DeskSessionData } from '@shared/desk-envelope';
import { startingSealFreeHeight } from '@shared/flex';
import { toDisplay } from '@shared/units';
import type { UnitSystem } from '@shared/schemas/common';
import type { EnvelopeParams, EnvelopeRecord } from '@shared/schemas/envelope';
import { AXIS_NAMES, formatDeg, formatIncrement, formatLength, formatPercent, formatTimestamp } from '@shared/format';
import { plural } from '@shared/plural';
import { OPTION_NAMES } from '@shared/pass-through-rows';
import { QueryState } from '@/components/query-state';
import { useSessionEnvelopes } from '../api/get-envelopes';
import { useCreateDraft } from '../api/create-draft';
import { useSaveDraft } from '../api/save-draft';
import { useSignOff } from '../api/sign-off';
import { useReopenEnvelope } from '../api/reopen';
import { useLiveEnvelope } from '../hooks/use-live-envelope';
import { EnvelopeResults } from './envelope-results';
import { RevisionState } from './revision-state';
import { revisionName } from '@shared/revision-name';
import { PassThroughOptions } from './pass-through-options';
import { ParamsForm } from './params-form';
import { fromFormState, toFormState, type ParamsFormState } from './params-form-state';
import { pathTo } from '@/paths';

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
              <h3 className="text-lg font-bold">Signed revisions of this session</h3>
              {signed.length === 0 ? (
                <p>None yet.</p>
              ) : (
                <ul className="space-y-1">
                  {signed.map((e) => (
                    <li key={e.id}>
                      <Link className="font-bold underline" to={pathTo('envelope', { id: e.id })}>
                        {revisionName(e)}
                      </Link>{' '}
                      <RevisionState status={e.status} /> · signed by {e.signedBy?.name} on {formatTimestamp(e.signedAt!)}
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

function DraftEditor({
  draft,
  data,
  unit,
  canDesign,
  canSign,
}: {
  draft: EnvelopeRecord;
  data: DeskSessionData;
  unit: UnitSystem;
  canDesign: boolean;
  canSign: boolean;
}) {
  const [form, setForm] = useState<ParamsFormState>(() => toFormState(draft.params, unit));
  const { params, problems } = fromFormState(form, unit);
  const { envelope, error } = useLiveEnvelope(data, params);
  const save = useSaveDraft(data.session.id);
  const sign = useSignOff();
  const navigate = useNavigate();
  const dirty = params !== null && JSON.stringify(params) !== JSON.stringify(draft.params);
  const failure = save.error ?? sign.error;
  const flags = envelope ? deskFlags(data, envelope.result) : [];
  const [kept, setKept] = useState<Record<string, { checked: boolean; note: string }>>({});
  const unacknowledged = flags.filter((f) => !kept[f.readingId]?.checked).length;
  const [confirming, setConfirming] = useState(false);
  // Why sign-off cannot be pressed yet, in words beside the button (never a silent grey button).
  const blocked = !params
    ? 'Correct the parameters above first.'
    : !envelope
      ? 'The envelope cannot be computed from these readings yet.'
      : unacknowledged > 0
        ? `${plural(unacknowledged, 'flagged reading')} still to acknowledge or exclude before signing off.`
        : null;

  const signOff = async () => {
    // The server signs the parameters it holds: save what is on screen first.
    const version = dirty && params ? (await save.mutateAsync({ id: draft.id, version: draft.version, params })).version : draft.version;
    const acknowledgements = flags.map((f) => ({ readingId: f.readingId, note: kept[f.readingId]?.note ?? '' }));
    const signed = await sign.mutateAsync({ id: draft.id, version, acknowledgements });
    navigate(pathTo('envelope', { id: signed.id }));
  };

  return (
    <section className="space-y-4" aria-label={`Envelope draft, revision ${draft.revision}`}>
      <h3 className="text-lg font-bold">
        {revisionName(draft)} <RevisionState status="draft" />
      </h3>
      <ParamsForm form={form} unit={unit} readOnly={!canDesign} onChange={(next) => setForm(withStartingSeal(form, next, envelope, unit))} />
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
      <PassThroughOptions
        design={form.design}
        unit={unit}
        readOnly={!canDesign}
        onChange={(design) => setForm({ ...form, design })}
        result={envelope?.passThrough ?? null}
        missing={envelope && !envelope.passThrough ? 'No options without a nominal fore-aft gap: set it on the vehicle.' : null}
      />
      {canSign && flags.length > 0 && <FlagAcknowledgements flags={flags} kept={kept} unit={unit} onChange={setKept} />}
      <div className="flex flex-wrap gap-2">
        {canDesign && (
          <button
            type="button"
            className="btn"
            aria-describedby={!dirty ? 'save-why' : undefined}
            disabled={!dirty || save.isPending}
            onClick={() => params && save.mutate({ id: draft.id, version: draft.version, params })}
          >
            Save parameters
          </button>
        )}
        {canSign && (
          <button
            type="button"
            className="btn-primary"
            aria-describedby={blocked ? 'sign-off-blocked' : undefined}
            disabled={blocked !== null || save.isPending || sign.isPending}
            onClick={() => setConfirming(true)}
          >
            Sign off revision {draft.revision}…
          </button>
        )}
        {canDesign && (!dirty || !params) && (
          <span className="self-center text-sm" id="save-why">
            {params ? 'Nothing to save: the parameters on screen are the saved ones.' : 'Correct the parameters to save them.'}
          </span>
        )}
      </div>
      {canSign && blocked && (
        <p className="text-sm font-bold" id="sign-off-blocked">
          {blocked}
        </p>
      )}
      {canSign && confirming && params && envelope && (
        <SignOffConfirmation
          name={revisionName(draft)}
          params={params}
          data={data}
          flags={flags}
          kept={kept}
          unit={unit}
          pending={save.isPending || sign.isPending}
          onCancel={() => setConfirming(false)}
          onConfirm={() => void signOff().catch(() => setConfirming(false))}
        />
      )}
      {canSign && (
        <p className="text-sm">Signing freezes the parameters and the readings as they are on the server now; later edits never change a signed revision.</p>
      )}
      {failure && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {failure.message}
        </p>
      )}
    </section>
  );
}

/**
 * What a sign-off freezes, said before it happens: the parameters, the chosen option, the readings
 * used and excluded, and every flagged reading kept in the computation with the engineer's note.
 */
function SignOffConfirmation({
  name,
  params,
  data,
  flags,
  kept,
  unit,
  pending,
  onCancel,
  onConfirm,
}: {
  name: string;
  params: EnvelopeParams;
  data: DeskSessionData;
  flags: DeskFlag[];
  kept: Record<string, { checked: boolean; note: string }>;
  unit: UnitSystem;
  pending: boolean;
  onCancel: () => void;
  onConfirm: () => void;
}) {
  const used = data.readings.filter((r) => !r.excluded && !r.deletedAt).length;
  const excluded = data.readings.filter((r) => r.excluded && !r.deletedAt).length;
  return (
    <section role="dialog" aria-label="Confirm sign-off" className="card space-y-2 border-4 border-slate">
      <h3 className="text-lg font-bold">Sign off {name}?</h3>
      <p>Signing freezes, for good:</p>
      <ul className="list-disc pl-6" aria-label="What the sign-off freezes">
        <li>
          design twist {formatDeg(params.designTwistDeg)}, {params.method === 'prediction' ? 'prediction bound' : 'tolerance bound'} at{' '}
          {formatPercent(params.confidence)}, margin {formatPercent(params.margin)}, allowance {formatLength(params.allowanceMm, unit)}, increment{' '}
          {formatIncrement(params.incrementMm, unit)}
        </li>
        <li>
          {params.seal
            ? `seal free height ${formatLength(params.seal.freeHeightMm, unit)} at ${params.seal.minCompressionPercent}–${params.seal.maxCompressionPercent} %`
            : 'no seal chosen'}
        </li>
        <li>
          {params.design.option
            ? `pass-through: ${OPTION_NAMES[params.design.option]}`
            : 'no pass-through option chosen: the sheet will give the envelope only'}
        </li>
        <li>
          {plural(used, 'reading')} used and {plural(excluded, 'reading')} excluded, as they are on the server now
        </li>
      </ul>
      {flags.length === 0 ? (
        <p>No reading is flagged far from the fit.</p>
      ) : (
        <>
          <p className="font-bold">{plural(flags.length, 'reading')} still flagged and kept in the computation:</p>
          <ul className="list-disc pl-6" aria-label="Flagged readings kept">
            {flags.map((f) => (
              <li key={f.readingId}>
                {f.poseLabel} {f.pointLabel} {AXIS_NAMES[f.flag.axis]}: {formatLength(f.flag.residualMm, unit)} off the fit
                {kept[f.readingId]?.note ? ` — ${kept[f.readingId].note}` : ''}
              </li>
            ))}
          </ul>
        </>
      )}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" disabled={pending} onClick={onConfirm}>
          Sign off and freeze
        </button>
        <button type="button" className="btn" onClick={onCancel}>
          Cancel
        </button>
      </div>
    </section>
  );
}

/**
 * Ticking the seal check with no free height typed starts from one that follows the gap range (the
 * middle of the heights that do, to 5 mm), or, where none does, the least that touches both faces.
 */
function withStartingSeal(before: ParamsFormState, next: ParamsFormState, envelope: DeskEnvelope | null, unit: UnitSystem): ParamsFormState {
  if (before.sealOn || !next.sealOn || next.sealFreeHeight.trim() !== '' || !envelope?.passThrough) return next;
  const frames = envelope.passThrough.frames;
  const minPct = Number(next.sealMinPct) || 25;
  const startMm = startingSealFreeHeight(frames.sealFreeHeightRangeMm) ?? Math.ceil(frames.gapMaxMm / (1 - minPct / 100) / 5) * 5;
  return { ...next, sealFreeHeight: String(Number(toDisplay(startMm, unit).toFixed(2))) };
}

/**
 * The readings the outlier rule flags that are still in the computation: the engineer either
 * excludes one (in the readings table) or ticks it to say it was checked and stays, with a note.
 */
function FlagAcknowledgements({
  flags,
  kept,
  unit,
  onChange,
}: {
  flags: DeskFlag[];
  kept: Record<string, { checked: boolean; note: string }>;
  unit: UnitSystem;
  onChange: (next: Record<string, { checked: boolean; note: string }>) => void;
}) {
  const set = (readingId: string, change: Partial<{ checked: boolean; note: string }>) =>
    onChange({ ...kept, [readingId]: { checked: kept[readingId]?.checked ?? false, note: kept[readingId]?.note ?? '', ...change } });
  return (
    <fieldset className="card space-y-2 border-signal">
      <legend className="px-1 font-bold">Flagged readings still in the computation</legend>
      <p className="text-sm">
        The outlier rule finds these readings far from what the others explain. If one is a misread, exclude it in the readings table; to keep it, tick it to
        say you have checked it. Each one you keep is printed on the fabrication sheet.
      </p>
      {flags.map((f) => {
        const name = `${f.poseLabel} ${f.pointLabel} ${AXIS_NAMES[f.flag.axis]}`;
        return (
          <div key={f.readingId} className="flex flex-wrap items-center gap-3">
            <label className="flex min-h-touch items-center gap-3">
              <input
                type="checkbox"
                className="h-6 w-6"
                checked={kept[f.readingId]?.checked ?? false}
                onChange={(e) => set(f.readingId, { checked: e.target.checked })}
              />
              <span>
                Keep <b>{name}</b>: entered {formatLength(f.enteredMm, unit)}, {formatLength(f.flag.residualMm, unit)} off the fit
                {f.flag.kind === 'misfit' ? ' (one of a set that does not fit; too few readings to tell which is off)' : ''}
              </span>
            </label>
            <input
              className="input max-w-md"
              aria-label={`Note on keeping ${name}`}
              placeholder="Note (optional)"
              maxLength={500}
              value={kept[f.readingId]?.note ?? ''}
              onChange={(e) => set(f.readingId, { note: e.target.value })}
            />
          </div>
        );
      })}
    </fieldset>
  );
}
