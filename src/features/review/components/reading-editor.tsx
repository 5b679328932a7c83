import { useState } from 'react';
import type { UnitSystem } from '@shared/schemas/common';
import { readingReviewInput } from '@shared/schemas/envelope';
import { AXIS_NAMES, formatLength, formatLengthValue } from '@shared/format';
import { fromDisplay } from '@shared/units';
import type { SessionReview } from '../api/get-review';
import { useReviewReading } from '../api/review-reading';
import type { FitFlag } from '../hooks/use-fit-flags';
import { AskRetest } from '@/components/retest-requests';
import { useCan } from '@/lib/auth/can';

interface Props {
  review: SessionReview;
  readingId: string;
  flag: FitFlag | undefined;
  unit: UnitSystem;
  onClose: () => void;
}

/** One reading under review: flag it with a note, exclude it with a reason, correct its value, or ask the crew to measure it again. */
export function ReadingEditor({ review, readingId, flag, unit, onClose }: Props) {
  const reading = review.readings.find((r) => r.id === readingId);
  const pose = review.poses.find((p) => p.id === reading?.poseId);
  const point = review.gaugePoints.find((g) => g.id === reading?.gaugePointId);
  const mutation = useReviewReading(review.session.id);
  const [flagNote, setFlagNote] = useState(reading?.flagNote ?? '');
  const [excluded, setExcluded] = useState(reading?.excluded ?? false);
  const [reason, setReason] = useState(reading?.excludeReason ?? '');
  const [value, setValue] = useState(reading ? formatLengthValue(reading.valueMm, unit) : '');
  const [problem, setProblem] = useState<string | null>(null);
  const can = useCan();
  if (!reading || !pose || !point) return null;

  const save = () => {
    const typed = Number(value.replace(',', '.'));
    if (value.trim() === '' || !Number.isFinite(typed)) return setProblem(`Value: "${value}" is not a number`);
    const valueMm = value === formatLengthValue(reading.valueMm, unit) ? reading.valueMm : fromDisplay(typed, unit);
    const parsed = readingReviewInput.safeParse({
      version: reading.version,
      excluded,
      excludeReason: excluded ? reason : null,
      flagNote: flagNote || null,
      valueMm,
    });
    if (!parsed.success)
      return setProblem(parsed.error.issues.map((i) => `${i.path.join('.') === 'excludeReason' ? 'Reason' : i.path.join('.')}: ${i.message}`).join('; '));
    setProblem(null);
    mutation.mutate({ readingId, input: parsed.data }, { onSuccess: onClose });
  };

  return (
    <section role="dialog" aria-label="Review reading" className="card space-y-3 border-slate">
      <h3 className="text-lg font-bold">
        {pose.label} · point {point.label} · {AXIS_NAMES[reading.axis]}: {formatLength(reading.valueMm, unit)}
      </h3>
      <p className="text-sm">
        Entered by {review.people[reading.enteredBy] ?? 'unknown'} · version {reading.version}
        {flag &&
          (flag.kind === 'outlier'
            ? ` · far from the fit: residual ${formatLength(flag.residualMm, unit)}, ${flag.score?.toFixed(1)} × its expected scatter`
            : ` · one of a set of readings that do not fit one rigid motion (residual ${formatLength(flag.residualMm, unit)}); too few readings to tell which is off`)}
      </p>
      <label className="block">
        <span className="field-label">Note (flag)</span>
        <input className="input" value={flagNote} onChange={(e) => setFlagNote(e.target.value)} maxLength={500} />
      </label>
      <label className="flex min-h-touch items-center gap-3">
        <input type="checkbox" className="h-6 w-6" checked={excluded} onChange={(e) => setExcluded(e.target.checked)} />
        <span className="font-bold">Exclude from the computation</span>
      </label>
      {excluded && (
        <label className="block">
          <span className="field-label">Reason for excluding</span>
          <input className="input" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} />
        </label>
      )}
      <label className="block">
        <span className="field-label">Value ({unit})</span>
        <input className="input" inputMode="decimal" value={value} onChange={(e) => setValue(e.target.value)} />
      </label>
      {(problem || mutation.isError) && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {problem ?? mutation.error?.message}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" onClick={save} disabled={mutation.isPending}>
          Save review
        </button>
        <button type="button" className="btn" onClick={onClose}>
          Close
        </button>
      </div>
      {can('retest.ask') && (
        <AskRetest
          target={{ sessionId: review.session.id, poseId: pose.id, gaugePointId: point.id, axis: reading.axis }}
          what={`point ${point.label} ${AXIS_NAMES[reading.axis]} in ${pose.label || `Pose ${pose.seq}`}`}
        />
      )}
    </section>
  );
}
