import { Link } from 'react-router-dom';
import { QueryState } from '@/components/query-state';
import { SafetyNotice } from '@/components/safety-notice';
import { formatLength } from '@shared/units';
import { useMe } from '@/lib/auth/get-me';
import { useCan } from '@/lib/auth/can';
import { useVehicles } from '@/features/vehicles/api/get-vehicles';
import { SessionListPage } from '@/features/sessions/components/session-list-page';
import { SignedEnvelopesList } from '@/features/envelope/components/signed-envelopes-list';
import { pathTo } from '@/paths';

/** Desk: the team's vehicles and sessions, the starting point for review. */
export function DeskHomePage() {
  const me = useMe();
  const vehicles = useVehicles();
  const unit = me.data?.user.unitSystem ?? me.data?.team.unitSystem ?? 'mm';
  const can = useCan();
  // Who cannot see sessions (a viewer) sees the signed-off envelopes alone.
  if (me.data && !can('session.read'))
    return (
      <div className="space-y-6">
        <SafetyNotice compact />
        <SignedEnvelopesList />
      </div>
    );
  return (
    <div className="space-y-6">
      <SafetyNotice compact />
      <section>
        <h1 className="mb-3 text-2xl font-bold">Vehicles</h1>
        <QueryState query={vehicles}>
          {(list) => (
            <ul className="grid gap-2 sm:grid-cols-2">
              {list.map((v) => (
                <li key={v.id} className="card">
                  <Link to={pathTo('deskVehicle', { id: v.id })} className="text-lg font-bold underline">
                    {v.name}
                  </Link>
                  <p className="text-sm">{v.chassis}</p>
                  <p className="text-sm">
                    Wheelbase {formatLength(v.wheelbaseMm, unit, 0)} · track {formatLength(v.trackFrontMm, unit, 0)} / {formatLength(v.trackRearMm, unit, 0)}
                  </p>
                </li>
              ))}
            </ul>
          )}
        </QueryState>
      </section>
      <SessionListPage />
      <p>
        <Link to={pathTo('compare')} className="btn">
          Compare sessions and vehicles
        </Link>
      </p>
      <SignedEnvelopesList />
    </div>
  );
}
