import { createBrowserRouter } from 'react-router-dom';
import { paths } from '@/config/paths';
import { SignInPage } from '@/features/auth/routes/sign-in';
import { OverviewPage } from '@/features/home/routes/overview';
import { UsersPage } from '@/features/users/routes/users';
import { AppLayout } from './layout';
import { NotFound } from './not-found';
import { RequireRole } from './require-role';
import { RouteError } from './route-error';

export function createRouter() {
  return createBrowserRouter([
    { path: paths.signIn, element: <SignInPage />, errorElement: <RouteError /> },
    {
      path: '/',
      element: <AppLayout />,
      errorElement: <RouteError />,
      children: [
        { index: true, element: <OverviewPage /> },
        {
          path: paths.users,
          element: (
            <RequireRole roles={['owner']}>
              <UsersPage />
            </RequireRole>
          ),
        },
        { path: '*', element: <NotFound /> },
      ],
    },
  ]);
}
