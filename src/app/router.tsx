import { createBrowserRouter } from 'react-router-dom';
import { paths } from '@/config/paths';
import { SignInPage } from '@/features/auth/routes/sign-in';
import { OverviewPage } from '@/features/home/routes/overview';
import { UsersPage } from '@/features/users/routes/users';
import { AppLayout } from './layout';
import { NotFound } from './not-found';
import { ownerRoutes } from './owner-routes';
import { RequireRole } from './require-role';
import { RouteError } from './route-error';

/** Who may create and revise estimates (the server enforces the same). */
const ESTIMATE_EDITORS = ['owner', 'estimator'] as const;

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
          path: paths.customers,
          lazy: async () => ({ Component: (await import('@/features/customers/routes/customers')).CustomersPage }),
        },
        {
          path: paths.customer,
          lazy: async () => ({ Component: (await import('@/features/customers/routes/customer')).CustomerPage }),
        },
        {
          path: paths.piece,
          lazy: async () => ({ Component: (await import('@/features/pieces/routes/piece')).PiecePage }),
        },
        {
          path: paths.estimates,
          lazy: async () => ({ Component: (await import('@/features/estimates/routes/estimates')).EstimatesPage }),
        },
        {
          path: paths.newEstimate,
          lazy: async () => {
            const { NewEstimatePage } = await import('@/features/estimates/routes/new-estimate');
            return { element: <RequireRole roles={ESTIMATE_EDITORS}><NewEstimatePage /></RequireRole> };
          },
        },
        {
          path: paths.estimate,
          lazy: async () => ({ Component: (await import('@/features/estimates/routes/estimate')).EstimatePage }),
        },
        {
          path: paths.editEstimate,
          lazy: async () => {
            const { EditEstimatePage } = await import('@/features/estimates/routes/edit-estimate');
            return { element: <RequireRole roles={ESTIMATE_EDITORS}><EditEstimatePage /></RequireRole> };
          },
        },
        {
          path: paths.compareRevisions,
          lazy: async () => ({ Component: (await import('@/features/estimates/routes/compare')).CompareRevisionsPage }),
        },
        {
          path: paths.users,
          element: (
            <RequireRole roles={['owner']}>
              <UsersPage />
            </RequireRole>
          ),
        },
        ...ownerRoutes,
        { path: '*', element: <NotFound /> },
      ],
    },
  ]);
}
