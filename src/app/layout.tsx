import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { useMe } from '@/lib/auth/get-me';
import { useSignOut } from '@/lib/auth/sign-out';
import { useCan } from '@/lib/auth/can';
import { SyncStatusBar } from '@/features/sync/components/sync-status-bar';
import { StoreGuard } from '@/features/sync/components/store-guard';
import { pathTo } from '@/paths';

const navClass = ({ isActive }: { isActive: boolean }) =>
  `flex min-h-touch shrink-0 items-center rounded-lg px-3 font-bold ${isActive ? 'bg-paper text-slate' : 'text-paper'}`;

/**
 * The app shell: one bar with the areas a role can reach, and the page below it. On a phone the
 * bar is one line (its links scroll sideways) so that, with the one-line sync state, it takes
 * about an eighth of the screen and the pose in hand gets the rest.
 */
export function Layout() {
  const me = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const can = useCan();
  const signedIn = !!me.data;
  return (
    <div className="min-h-dvh">
      <header className="bg-slate text-paper">
        <div className="mx-auto flex max-w-6xl items-center gap-2 px-3 py-1">
          <span className="shrink-0 text-lg font-bold tracking-tight">Twistlog</span>
          <nav aria-label="Main" className="flex min-w-0 flex-1 items-center gap-1 overflow-x-auto [scrollbar-width:none]">
            {can('session.record') && (
              <NavLink to={pathTo('fieldSessions')} className={navClass}>
                Field
              </NavLink>
            )}
            {signedIn && (
              <NavLink to={pathTo('desk')} className={navClass}>
                Desk
              </NavLink>
            )}
            {can('envelope.read') && (
              <NavLink to={pathTo('compare')} className={navClass}>
                Compare
              </NavLink>
            )}
            {can('team.manage') && (
              <NavLink to={pathTo('team')} className={navClass}>
                Team
              </NavLink>
            )}
            {signedIn && (
              <NavLink to={pathTo('account')} className={navClass}>
                Account
              </NavLink>
            )}
            {me.data && (
              <>
                {/* Who is signed in, at the end of the line (on a phone, a sideways scroll away). */}
                <span className="ml-auto shrink-0 px-2 text-sm">{`${me.data.user.name} · ${me.data.role} · ${me.data.team.name}`}</span>
                <button
                  type="button"
                  className="min-h-touch shrink-0 rounded-lg border-2 border-paper px-3 font-bold"
                  onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate(pathTo('signIn')) })}
                >
                  Sign out
                </button>
              </>
            )}
          </nav>
        </div>
      </header>
      {can('session.record') ? (
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
