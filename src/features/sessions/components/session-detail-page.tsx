import { useParams } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { formatLength } from '@shared/units';
import { useMe } from '@/features/auth/api/get-me';
import { useSession } from '../api/get-sessions';
import type { Axis } from '@shared/schemas';

const axisName: Record<Axis, string> = { foreAft: 'fore-aft', lateral: 'lateral', vertical: 'vertical' };

/** A session's poses and readings as a pose × gauge point × axis table. */
export function SessionDetailPage() {
  const { id = '' } = useParams();
  const session = useSession(id);
  const me = useMe();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  return (
    <QueryState query={session}>
      {({ session: s, vehicle, gaugePoints, poses, readings }) => {
        const value = (poseId: string, pointId: string, axis: Axis) =>
          readings.find((r) => r.poseId === poseId && r.gaugePointId === pointId && r.axis === axis);
        return (
          <section>
            <h1 className="text-2xl font-bold">{vehicle.name}</h1>
            <p className="mb-3">
              {s.testedOn} · {s.title} · readings entered as {s.readingMode === 'gap' ? 'raw gaps' : 'displacements'}
            </p>
            <div className="overflow-x-auto">
              <table className="min-w-full border-collapse bg-white text-right">
                <caption className="p-2 text-left font-bold">Readings ({unit})</caption>
                <thead>
                  <tr>
                    <th scope="col" className="border border-rule p-2 text-left">Pose</th>
                    {gaugePoints.flatMap((g) =>
                      (['foreAft', 'lateral', 'vertical'] as const).map((a) => (
                        <th key={`${g.id}-${a}`} scope="col" className="border border-rule p-2">
                          {g.label} {axisName[a]}
                        </th>
                      )),
                    )}
                  </tr>
                </thead>
                <tbody>
                  {poses.map((p) => (
                    <tr key={p.id}>
                      <th scope="row" className="border border-rule p-2 text-left">{p.label || `Pose ${p.seq}`}</th>
                      {gaugePoints.flatMap((g) =>
                        (['foreAft', 'lateral', 'vertical'] as const).map((a) => {
                          const r = value(p.id, g.id, a);
                          return (
                            <td key={`${g.id}-${a}`} className="border border-rule p-2 tabular-nums">
                              {r ? formatLength(r.valueMm, unit).replace(/ (mm|in)$/, '') : '—'}
                            </td>
                          );
                        }),
                      )}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        );
      }}
    </QueryState>
  );
}
