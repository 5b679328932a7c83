import { lazy, Suspense } from 'react';
import { useSearchParams } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { ColumnHeads } from '@/components/column-heads';
import { AXIS_NAMES, formatDegValue, formatLengthValue, formatSlopeValue } from '@shared/format';
import { useMe } from '@/lib/auth/get-me';
import { useSessions } from '@/lib/api/get-sessions';
import { useComparison } from '../api/get-comparison';

const CompareChart = lazy(() => import('@/components/desk-charts').then((m) => ({ default: m.CompareChart })));
const AXES = ['foreAft', 'lateral', 'vertical'] as const;

/** Sessions side by side: twist reached, worst per axis and slope per degree, so different twists compare fairly. */
export function ComparePage() {
  const me = useMe();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  const sessions = useSessions();
  const [search, setSearch] = useSearchParams();
  const chosen = (search.get('sessions') ?? '').split(',').filter(Boolean);
  const comparison = useComparison(chosen);
  const toggle = (id: string, on: boolean) => {
    const next = on ? [...chosen, id] : chosen.filter((x) => x !== id);
    setSearch(next.length ? { sessions: next.join(',') } : {}, { replace: true });
  };
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Compare sessions</h1>
      <QueryState query={sessions}>
        {(list) => (
          <fieldset className="card grid gap-1 sm:grid-cols-2">
            <legend className="font-bold">Choose sessions</legend>
            {list.map((s) => (
              <label key={s.id} className="flex min-h-touch items-center gap-3">
                <input type="checkbox" className="h-6 w-6" checked={chosen.includes(s.id)} onChange={(e) => toggle(s.id, e.target.checked)} />
                <span>
                  <b>{s.vehicleName}</b> · {s.title || 'untitled'} ({s.testedOn})
                </span>
              </label>
            ))}
          </fieldset>
        )}
      </QueryState>
      {chosen.length === 0 ? (
        <p>Tick two or more sessions to compare them.</p>
      ) : (
        <QueryState query={comparison}>
          {(rows) => (
            <>
              <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Comparison, scrollable">
                <table className="min-w-full border-collapse bg-white text-right" aria-label="Comparison">
                  <caption className="p-2 text-left font-bold">
                    Worst perimeter displacement ({unit}) and slope ({unit}/°)
                  </caption>
                  <ColumnHeads
                    names={[
                      'Vehicle · session',
                      'Poses',
                      'Twist reached (°)',
                      ...AXES.map((a) => `Worst ${AXIS_NAMES[a]}`),
                      ...AXES.map((a) => `Slope ${AXIS_NAMES[a]}`),
                    ]}
                    left={['Vehicle · session']}
                  />
                  <tbody>
                    {rows.map((r) => (
                      <tr key={r.sessionId}>
                        <th scope="row" className="border border-rule p-2 text-left">
                          {r.vehicleName} · {r.title} ({r.testedOn})
                        </th>
                        <td className="border border-rule p-2 tabular-nums">{r.poseCount}</td>
                        <td className="border border-rule p-2 tabular-nums">{formatDegValue(r.twistReachedDeg)}</td>
                        {AXES.map((a) => (
                          <td key={`w-${a}`} className="border border-rule p-2 tabular-nums">
                            {formatLengthValue(Math.abs(r.worstMm[a]), unit)}
                          </td>
                        ))}
                        {AXES.map((a) => (
                          <td key={`s-${a}`} className="border border-rule p-2 tabular-nums">
                            {formatSlopeValue(r.slopeMmPerDeg[a], unit)}
                          </td>
                        ))}
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              <Suspense fallback={<p role="status">Loading the chart…</p>}>
                <CompareChart rows={rows} unit={unit} />
              </Suspense>
            </>
          )}
        </QueryState>
      )}
    </div>
  );
}
