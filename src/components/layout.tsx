import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { SyncStatusBar } from '@/features/sync/components/sync-status-bar';
import { StoreGuard } from '@/features/sync/components/store-guard';

const navClass = ({ isActive }: { isActive: boolean }) =>
  `flex min-h-touch items-center rounded-lg px-3 font-bold ${isActive ? 'bg-paper text-slate' : 'text-paper'}`;

/** The app shell: the bar with the areas a role can reach, and the page below it. */
export function Layout() {
  const me = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const role = me.data?.role;
  return (
    <div className="min-h-dvh">
      <header className="bg-slate text-paper">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-2 px-3 py-2">
          <span className="mr-2 text-xl font-bold tracking-tight">Twistlog</span>
          <nav aria-label="Main" className="flex flex-wrap gap-1">
            {role && role !== 'viewer' && <NavLink to="/field" className={navClass}>Field</NavLink>}
            {role && <NavLink to="/desk" className={navClass}>Desk</NavLink>}
            {role && role !== 'viewer' && <NavLink to="/desk/compare" className={navClass}>Compare</NavLink>}
            {role === 'admin' && <NavLink to="/team" className={navClass}>Team</NavLink>}
            {role && <NavLink to="/account" className={navClass}>Account</NavLink>}
          </nav>
          <span className="ml-auto text-sm">
            {me.data && `${me.data.user.name} · ${me.data.role} · ${me.data.team.name}`}
          </span>
          {me.data && (
            <button
              type="button"
              className="min-h-touch rounded-lg border-2 border-paper px-3 font-bold"
              onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate('/sign-in') })}
            >
              Sign out
            </button>
          )}
        </div>
      </header>
      {role && role !== 'viewer' ? (
        // Members who record keep a field store on the phone: it must be theirs before use.
        <StoreGuard>
          <SyncStatusBar />
          <main className="mx-auto max-w-6xl px-3 py-4">
            <Outlet />
          </main>
        </StoreGuard>
      ) : (
        <main className="mx-auto max-w-6xl px-3 py-4">
          <Outlet />
        </main>
      )}
    </div>
  );
}
