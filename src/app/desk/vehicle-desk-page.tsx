import { Link, useParams } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { ColumnHeads } from '@/components/column-heads';
import { SafetyNotice } from '@/components/safety-notice';
import { formatLength } from '@shared/format';
import { plural } from '@shared/plural';
import type { VehicleDesk } from '@shared/desk-responses';
import type { UnitSystem } from '@shared/schemas/common';
import { useMe } from '@/lib/auth/get-me';
import { Can } from '@/lib/auth/can';
import { useVehicleDesk } from '@/features/vehicles/api/get-vehicles';
import { RevisionState } from '@/features/envelope/components/revision-state';
import { pathTo } from '@/paths';
import { sessionState } from './session-state';

/** A vehicle at the desk: what it is, where its gaps are read, and every session with its envelope revisions. */
export function VehicleDeskPage() {
  const { id = '' } = useParams();
  const desk = useVehicleDesk(id);
  const me = useMe();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  return <QueryState query={desk}>{(data) => <VehicleDeskView desk={data} unit={unit} />}</QueryState>;
}

function VehicleDeskView({ desk, unit }: { desk: VehicleDesk; unit: UnitSystem }) {
  const { vehicle, gaugePoints, sessions } = desk;
  const o = vehicle.opening;
  const details: [string, string][] = [
    ['Chassis', vehicle.chassis || 'not given'],
    ['Body', vehicle.body || 'not given'],
    ['Wheelbase', formatLength(vehicle.wheelbaseMm, unit)],
    ['Track front / rear', `${formatLength(vehicle.trackFrontMm, unit)} / ${formatLength(vehicle.trackRearMm, unit)}`],
    ['Pass-through opening (width × height)', `${formatLength(o.widthMm, unit)} × ${formatLength(o.heightMm, unit)}`],
    ['Corner radius', formatLength(o.cornerRadiusMm, unit)],
    ['Opening centre y (+ = left)', formatLength(o.centreYMm, unit)],
    ['Opening bottom z (above the frame rail)', formatLength(o.bottomZMm, unit)],
    ['Nominal gap', formatLength(vehicle.nominalGapMm, unit)],
  ];
  const compareTo = `${pathTo('compare')}?sessions=${sessions.map((s) => s.id).join(',')}`;
  return (
    <div className="space-y-6">
      <SafetyNotice compact />
      <header className="space-y-2">
        <h1 className="text-2xl font-bold">{vehicle.name}</h1>
        <Can action="vehicle.write">
          <p>
            <Link to={pathTo('vehicle', { id: vehicle.id })} className="btn">
              Edit vehicle and gauge points
            </Link>
          </p>
        </Can>
      </header>
      <section className="card" aria-labelledby="vehicle-details">
        <h2 id="vehicle-details" className="mb-2 text-xl font-bold">
          Details
        </h2>
        <dl className="grid gap-x-4 gap-y-1 sm:grid-cols-[max-content_1fr]">
          {details.map(([term, value]) => (
            <div key={term} className="contents">
              <dt className="font-bold">{term}</dt>
              <dd>{value}</dd>
            </div>
          ))}
        </dl>
        {vehicle.notes && <p className="mt-2 whitespace-pre-line">{vehicle.notes}</p>}
      </section>
      <section className="card" aria-labelledby="vehicle-gauge-points">
        <h2 id="vehicle-gauge-points" className="mb-2 text-xl font-bold">
          Gauge points
        </h2>
        {gaugePoints.length === 0 ? (
          <p>No gauge points marked yet.</p>
        ) : (
          <table className="border-collapse bg-white text-right" aria-label="Gauge points">
            <ColumnHeads names={['Point', `y (${unit}, + = left)`, `z (${unit}, + = up)`]} left={['Point']} />
            <tbody>
              {gaugePoints.map((g) => (
                <tr key={g.id}>
                  <th scope="row" className="border border-rule p-2 text-left">
                    {g.label}
                  </th>
                  <td className="border border-rule p-2 tabular-nums">{formatLength(g.yMm, unit)}</td>
                  <td className="border border-rule p-2 tabular-nums">{formatLength(g.zMm, unit)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section aria-labelledby="vehicle-sessions" className="space-y-2">
        <h2 id="vehicle-sessions" className="text-xl font-bold">
          Sessions
        </h2>
        {sessions.length === 0 ? (
          <p>No sessions of this vehicle yet.</p>
        ) : (
          <ul className="space-y-2">
            {sessions.map((s) => (
              <li key={s.id} className="card space-y-1" aria-label={`${s.testedOn} ${s.title || 'Flex test'}`}>
                <p className="text-lg font-bold">
                  {s.testedOn} · {s.title || 'Flex test'}
                </p>
                <p>
                  {sessionState(s)} · {plural(s.poseCount, 'pose')}, {plural(s.readingCount, 'reading')}
                </p>
                <p>
                  <Link className="underline" to={pathTo('deskSession', { id: s.id })}>
                    Review this session
                  </Link>
                </p>
                {s.envelopes.length > 0 && (
                  <ul aria-label="Envelope revisions">
                    {s.envelopes.map((e) => (
                      <li key={e.id}>
                        <Link className="underline" to={pathTo('envelope', { id: e.id })}>
                          Envelope revision {e.revision}
                        </Link>{' '}
                        <RevisionState status={e.status} />
                      </li>
                    ))}
                  </ul>
                )}
              </li>
            ))}
          </ul>
        )}
        {sessions.length > 0 && (
          <p>
            <Link to={compareTo} className="btn">
              Compare this vehicle&apos;s sessions
            </Link>
          </p>
        )}
      </section>
    </div>
  );
}
