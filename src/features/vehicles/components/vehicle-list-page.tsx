import { Link } from 'react-router-dom';
import { useLocalVehicles } from '@/lib/db/live';
import { pathTo } from '@/paths';

export function VehicleListPage() {
  const data = useLocalVehicles();
  return (
    <section className="space-y-3">
      <div className="flex items-center gap-2">
        <h1 className="mr-auto text-2xl font-bold">Vehicles</h1>
        <Link to={pathTo('vehicle', { id: 'new' })} className="btn-primary">
          New vehicle
        </Link>
      </div>
      {data?.vehicles.length === 0 && <p>No vehicles on this phone yet.</p>}
      <ul className="space-y-2">
        {data?.vehicles.map((v) => (
          <li key={v.id}>
            <Link to={pathTo('vehicle', { id: v.id })} className="card flex min-h-touch flex-col hover:border-slate">
              <span className="text-lg font-bold">{v.name}</span>
              <span>{v.chassis}</span>
            </Link>
          </li>
        ))}
      </ul>
    </section>
  );
}
