import { createBrowserRouter, Navigate, Outlet } from 'react-router-dom';
import { Layout } from '@/components/layout';
import { useMe } from '@/features/auth/api/get-me';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { ConfirmSignUpPage, SignUpPage } from '@/features/auth/components/sign-up-page';
import { ForgotPasswordPage, ResetPasswordPage } from '@/features/auth/components/password-pages';
import { AcceptInvitationPage } from '@/features/auth/components/accept-invitation-page';
import { AccountPage } from '@/features/auth/components/account-page';
import { TeamPage } from '@/features/team/components/team-page';
import { DeskHomePage } from '@/features/desk/components/desk-home-page';
import { FieldSessionsPage } from '@/features/sessions/components/field-sessions-page';
import { StartSessionPage } from '@/features/sessions/components/start-session-page';
import { FieldSessionPage } from '@/features/sessions/components/field-session-page';
import { PoseRecorderPage } from '@/features/poses/components/pose-recorder-page';
import { VehicleListPage } from '@/features/vehicles/components/vehicle-list-page';
import { VehicleSetupPage } from '@/features/vehicles/components/vehicle-setup-page';
import { SyncPage } from '@/features/sync/components/sync-page';

/** Pages behind sign-in. Offline with a cached identity, the app still opens. */
function RequireSignIn() {
  const me = useMe();
  if (me.isPending) return <p className="p-6" role="status">Loading…</p>;
  if (!me.data) return <Navigate to="/sign-in" replace />;
  return <Outlet />;
}

function Home() {
  const me = useMe();
  return <Navigate to={me.data?.role === 'tester' ? '/field' : '/desk'} replace />;
}

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
        element: <Layout />,
        children: [
          { index: true, element: <Home /> },
          { path: 'field', element: <FieldSessionsPage /> },
          { path: 'field/sessions/new', element: <StartSessionPage /> },
          { path: 'field/sessions/:id', element: <FieldSessionPage /> },
          { path: 'field/sessions/:id/poses/:poseId', element: <PoseRecorderPage /> },
          { path: 'field/vehicles', element: <VehicleListPage /> },
          { path: 'field/vehicles/:id', element: <VehicleSetupPage /> },
          { path: 'field/sync', element: <SyncPage /> },
          { path: 'desk', element: <DeskHomePage /> },
          // Desk pages load on demand so the field's first load stays small.
          { path: 'desk/sessions/:id', lazy: async () => ({ Component: (await import('@/features/desk/components/session-desk-page')).SessionDeskPage }) },
          { path: 'desk/envelopes/:id', lazy: async () => ({ Component: (await import('@/features/envelope/components/envelope-page')).EnvelopePage }) },
          { path: 'desk/compare', lazy: async () => ({ Component: (await import('@/features/compare/components/compare-page')).ComparePage }) },
          { path: 'account', element: <AccountPage /> },
          { path: 'team', element: <TeamPage /> },
        ],
      },
    ],
  },
]);
