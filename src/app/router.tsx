import { createBrowserRouter, Navigate, Outlet } from 'react-router-dom';
import { useMe } from '@/features/auth/api/get-me';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { ConfirmSignUpPage, SignUpPage } from '@/features/auth/components/sign-up-page';
import { ForgotPasswordPage, ResetPasswordPage } from '@/features/auth/components/password-pages';
import { AcceptInvitationPage } from '@/features/auth/components/accept-invitation-page';

/** Pages behind sign-in. Offline with a cached identity, the app still opens. */
function RequireSignIn() {
  const me = useMe();
  if (me.isPending) return <p className="p-6" role="status">Loading…</p>;
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
  if (!me.data) return <Navigate to="/sign-in" replace />;
  return <Outlet />;
}

function Home() {
  const me = useMe();
  return <Navigate to={me.data?.role === 'tester' ? '/field' : '/desk'} replace />;
}

// The signed-out pages come with the app (a link between them must not wait on a chunk while the
// old page still takes typing); the signed-in shell and its pages load on demand, precached by the
// service worker (vite.config.ts) except the charts, so each opens offline too.
export const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/sign-up', element: <SignUpPage /> },
  { path: '/sign-up/confirm/:token', element: <ConfirmSignUpPage /> },
  { path: '/forgot-password', element: <ForgotPasswordPage /> },
  { path: '/reset-password/:token', element: <ResetPasswordPage /> },
  { path: '/invite/:token', element: <AcceptInvitationPage /> },
  {
    element: <RequireSignIn />,
    children: [
      {
        lazy: async () => ({ Component: (await import('@/components/layout')).Layout }),
        children: [
          { index: true, element: <Home /> },
          { path: 'field', lazy: async () => ({ Component: (await import('@/features/sessions/components/field-sessions-page')).FieldSessionsPage }) },
          { path: 'field/sessions/new', lazy: async () => ({ Component: (await import('@/features/sessions/components/start-session-page')).StartSessionPage }) },
          { path: 'field/sessions/:id', lazy: async () => ({ Component: (await import('@/features/sessions/components/field-session-page')).FieldSessionPage }) },
          { path: 'field/sessions/:id/poses/:poseId', lazy: async () => ({ Component: (await import('@/features/poses/components/pose-recorder-page')).PoseRecorderPage }) },
          { path: 'field/vehicles', lazy: async () => ({ Component: (await import('@/features/vehicles/components/vehicle-list-page')).VehicleListPage }) },
          { path: 'field/vehicles/:id', lazy: async () => ({ Component: (await import('@/features/vehicles/components/vehicle-setup-page')).VehicleSetupPage }) },
          { path: 'field/sync', lazy: async () => ({ Component: (await import('@/features/sync/components/sync-page')).SyncPage }) },
          { path: 'desk', lazy: async () => ({ Component: (await import('@/features/desk/components/desk-home-page')).DeskHomePage }) },
          // Desk pages load on demand so the field's first load stays small.
          { path: 'desk/sessions/:id', lazy: async () => ({ Component: (await import('@/features/desk/components/session-desk-page')).SessionDeskPage }) },
          { path: 'desk/envelopes/:id', lazy: async () => ({ Component: (await import('@/features/envelope/components/envelope-page')).EnvelopePage }) },
          { path: 'desk/compare', lazy: async () => ({ Component: (await import('@/features/compare/components/compare-page')).ComparePage }) },
          { path: 'account', lazy: async () => ({ Component: (await import('@/features/auth/components/account-page')).AccountPage }) },
          { path: 'team', lazy: async () => ({ Component: (await import('@/features/team/components/team-page')).TeamPage }) },
          // Any other address: an app page with the header and a way back, not the router's own error.
          { path: '*', lazy: async () => ({ Component: (await import('@/components/not-found-page')).NotFoundPage }) },
        ],
      },
    ],
  },
]);
