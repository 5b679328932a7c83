import { createBrowserRouter, Navigate, Outlet } from 'react-router-dom';
import { useMe } from '@/lib/auth/get-me';
import { startPath } from '@/lib/auth/start-page';
import { pathTo, routes } from '@/paths';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { ConfirmSignUpPage, SignUpPage } from '@/features/auth/components/sign-up-page';
import { ForgotPasswordPage, ResetPasswordPage } from '@/features/auth/components/password-pages';
import { AcceptInvitationPage } from '@/features/auth/components/accept-invitation-page';

/** Pages behind sign-in. Offline with a cached identity, the app still opens. */
function RequireSignIn() {
  const me = useMe();
  if (me.isPending)
    return (
      <p className="p-6" role="status">
        Loading…
      </p>
    );
  // Only the server's answer "nobody is signed in" leads to the sign-in page; no answer at all
  // (no signal and nothing kept on this phone) says so, and what is stored here stays.
  if (me.data === undefined) {
    return (
      <div className="p-6" role="alert">
        <p className="font-bold">Twistlog cannot reach the server to check who is signed in.</p>
        <p>Everything recorded on this phone is kept. Try again when there is signal.</p>
        <button type="button" className="btn mt-2" onClick={() => void me.refetch()}>
          Try again
        </button>
      </div>
    );
  }
  if (!me.data) return <Navigate to={pathTo('signIn')} replace />;
  return <Outlet />;
}

function Home() {
  // Only a signed-in person gets here (RequireSignIn), so their role is known.
  const me = useMe();
  return <Navigate to={me.data ? startPath(me.data.role) : pathTo('signIn')} replace />;
}

// The signed-out pages come with the app (a link between them must not wait on a chunk while the
// old page still takes typing); the signed-in shell and its pages load on demand, precached by the
// service worker (vite.config.ts) except the charts, so each opens offline too.
// Every path comes from src/paths.ts, where links are built from the same table.
export const router = createBrowserRouter([
  { path: routes.signIn, element: <SignInPage /> },
  { path: routes.signUp, element: <SignUpPage /> },
  { path: routes.confirmSignUp, element: <ConfirmSignUpPage /> },
  { path: routes.forgotPassword, element: <ForgotPasswordPage /> },
  { path: routes.resetPassword, element: <ResetPasswordPage /> },
  { path: routes.invitation, element: <AcceptInvitationPage /> },
  {
    element: <RequireSignIn />,
    children: [
      {
        lazy: async () => ({ Component: (await import('@/app/layout')).Layout }),
        children: [
          { path: routes.home, element: <Home /> },
          {
            path: routes.fieldSessions,
            lazy: async () => ({ Component: (await import('@/features/sessions/components/field-sessions-page')).FieldSessionsPage }),
          },
          { path: routes.newSession, lazy: async () => ({ Component: (await import('@/features/sessions/components/start-session-page')).StartSessionPage }) },
          {
            path: routes.fieldSession,
            lazy: async () => ({ Component: (await import('@/features/sessions/components/field-session-page')).FieldSessionPage }),
          },
          { path: routes.fieldPose, lazy: async () => ({ Component: (await import('@/features/poses/components/pose-recorder-page')).PoseRecorderPage }) },
          { path: routes.vehicles, lazy: async () => ({ Component: (await import('@/features/vehicles/components/vehicle-list-page')).VehicleListPage }) },
          { path: routes.vehicle, lazy: async () => ({ Component: (await import('@/features/vehicles/components/vehicle-setup-page')).VehicleSetupPage }) },
          { path: routes.sync, lazy: async () => ({ Component: (await import('@/features/sync/components/sync-page')).SyncPage }) },
          { path: routes.desk, lazy: async () => ({ Component: (await import('@/app/desk/desk-home-page')).DeskHomePage }) },
          // Desk pages load on demand so the field's first load stays small.
          { path: routes.deskVehicle, lazy: async () => ({ Component: (await import('@/app/desk/vehicle-desk-page')).VehicleDeskPage }) },
          { path: routes.deskSession, lazy: async () => ({ Component: (await import('@/app/desk/session-desk-page')).SessionDeskPage }) },
          { path: routes.envelope, lazy: async () => ({ Component: (await import('@/features/envelope/components/envelope-page')).EnvelopePage }) },
          { path: routes.compare, lazy: async () => ({ Component: (await import('@/features/compare/components/compare-page')).ComparePage }) },
          { path: routes.account, lazy: async () => ({ Component: (await import('@/features/auth/components/account-page')).AccountPage }) },
          { path: routes.team, lazy: async () => ({ Component: (await import('@/features/team/components/team-page')).TeamPage }) },
          // Any other address: an app page with the header and a way back, not the router's own error.
          { path: '*', lazy: async () => ({ Component: (await import('@/components/not-found-page')).NotFoundPage }) },
        ],
      },
    ],
  },
]);
