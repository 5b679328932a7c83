import { ColumnHeads } from '@/components/column-heads';
import type { ReactNode } from 'react';
import type { Axis, Pose } from '@shared/schemas';
import { PoseContext } from './pose-context';
import type { UnitSystem } from '@shared/schemas/common';
import { AXIS_NAMES, formatLengthValue } from '@shared/format';
import type { SessionReview } from '../api/get-review';
import type { FitFlag } from '../hooks/use-fit-flags';

const AXES: Axis[] = ['foreAft', 'lateral', 'vertical'];

interface Props {
  review: SessionReview;
  flags: Map<string, FitFlag>;
  unit: UnitSystem;
  selectedId: string | null;
  onSelect?: (readingId: string) => void;
  /** The editor of the selected reading, shown in the row under it, where the engineer clicked. */
  editor?: ReactNode;
  /** More about a pose, under its context (the desk's re-test requests). */
  poseExtra?: (pose: Pose) => ReactNode;
}

/** Readings as pose × gauge point rows with one column per axis; flags and exclusions marked in the cell. */
export function ReadingsTable({ review, flags, unit, selectedId, onSelect, editor, poseExtra }: Props) {
  const at = new Map(review.readings.map((r) => [`${r.poseId}|${r.gaugePointId}|${r.axis}`, r]));
  const photosOf = (poseId: string) => review.photos.filter((p) => p.poseId === poseId);
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full border-collapse bg-white text-right">
        <caption className="p-2 text-left">
          <span className="font-bold">Readings ({unit})</span> as entered ({review.session.readingMode === 'gap' ? 'raw gaps' : 'displacements'}).
          <span className="ml-2 text-sm">⚑ far from the fit, or in a set that does not fit together · ✎ note · struck through: excluded</span>
        </caption>
        <ColumnHeads names={['Pose', 'Point', ...AXES.map((a) => AXIS_NAMES[a]), 'Entered by']} left={['Pose', 'Point', 'Entered by']} />
        <tbody>
          {review.poses.flatMap((pose) => [
            <tr key={`${pose.id}-context`} className="border-t-4 border-rule bg-paper">
              <td colSpan={AXES.length + 3} className="border border-rule p-2">
                <PoseContext pose={pose} photos={photosOf(pose.id)} wheelbaseMm={review.vehicle.wheelbaseMm} unit={unit} />
                {poseExtra?.(pose)}
              </td>
            </tr>,
            ...review.gaugePoints.flatMap((point, pi) => {
              const cells = AXES.map((axis) => at.get(`${pose.id}|${point.id}|${axis}`));
              const holdsSelected = selectedId !== null && cells.some((c) => c?.id === selectedId);
              const who = [...new Set(cells.flatMap((c) => (c ? [review.people[c.enteredBy] ?? '?'] : [])))].join(', ');
              const row = (
                <tr key={`${pose.id}-${point.id}`}>
                  <th scope="row" className="border border-rule p-2 text-left font-normal">
                    {pi === 0 ? <b>{pose.label || `Pose ${pose.seq}`}</b> : <span className="sr-only">{pose.label}</span>}
                  </th>
                  <td className="border border-rule p-2 text-left font-bold">{point.label}</td>
                  {cells.map((r, ai) => {
                    if (!r)
                      return (
                        <td key={ai} className="border border-rule p-2">
                          —
                        </td>
                      );
                    const flag = flags.get(r.id);
                    const label = `${pose.label} ${point.label} ${AXIS_NAMES[AXES[ai]]}`;
                    const flagWords = flag ? (flag.kind === 'outlier' ? 'far from the fit' : 'in a set of readings that do not fit together') : '';
                    return (
                      <td
                        key={ai}
                        className={`border border-rule p-0 ${selectedId === r.id ? 'outline outline-3 outline-signal' : ''} ${flag ? 'bg-signal/25' : ''}`}
                      >
                        <button
                          type="button"
                          className="block min-h-touch w-full px-2 text-right tabular-nums"
                          aria-label={`Reading ${label}: ${formatLengthValue(r.valueMm, unit)}${flag ? `, ${flagWords}` : ''}${r.flagNote ? ', has a note' : ''}${r.excluded ? ', excluded' : ''}`}
                          disabled={!onSelect}
                          onClick={() => onSelect?.(r.id)}
                          title={[
                            flag && `${flagWords} (residual ${formatLengthValue(flag.residualMm, unit)} ${unit})`,
                            r.flagNote,
                            r.excluded && `excluded: ${r.excludeReason}`,
                          ]
                            .filter(Boolean)
                            .join(' · ')}
                        >
                          <span className={r.excluded ? 'text-slate line-through' : ''}>{formatLengthValue(r.valueMm, unit)}</span>
                          {flag && (
                            <span className="ml-1 text-signal-dark" aria-hidden="true">
                              ⚑
                            </span>
                          )}
                          {r.flagNote && (
                            <span className="ml-1" aria-hidden="true">
                              ✎
                            </span>
                          )}
                        </button>
                      </td>
                    );
                  })}
                  <td className="border border-rule p-2 text-left text-sm">{who}</td>
                </tr>
              );
              if (!holdsSelected || !editor) return [row];
              return [
                row,
                <tr key={`${pose.id}-${point.id}-editor`}>
                  <td colSpan={AXES.length + 3} className="border border-rule p-2 text-left">
                    {editor}
                  </td>
                </tr>,
              ];
            }),
          ])}
        </tbody>
      </table>
    </div>
  );
}
