import { createBrowserRouter, Navigate, Outlet } from 'react-router-dom';
import { Layout } from '@/components/layout';
import { useMe } from '@/features/auth/api/get-me';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { SessionListPage } from '@/features/sessions/components/session-list-page';
import { SessionDetailPage } from '@/features/sessions/components/session-detail-page';
import { DeskHomePage } from '@/features/desk/components/desk-home-page';

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
  {
    element: <RequireSignIn />,
    children: [
      {
        element: <Layout />,
        children: [
          { index: true, element: <Home /> },
          { path: 'field', element: <SessionListPage /> },
          { path: 'field/sessions/:id', element: <SessionDetailPage /> },
          { path: 'desk', element: <DeskHomePage /> },
          { path: 'desk/sessions/:id', element: <SessionDetailPage /> },
        ],
      },
    ],
  },
]);
