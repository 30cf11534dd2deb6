import { createBrowserRouter } from 'react-router-dom';
import { Spinner } from '@/components/spinner';
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
/** Who makes and sends quotes and reads the outbox. */
const SELLERS = ['owner', 'sales'] as const;

export function createRouter() {
  return createBrowserRouter([
    { path: paths.signIn, element: <SignInPage />, errorElement: <RouteError /> },
    {
      path: paths.forgotPassword,
      errorElement: <RouteError />,
      hydrateFallbackElement: <Spinner />,
      lazy: async () => ({ Component: (await import('@/features/auth/routes/reset-password')).ForgotPasswordPage }),
    },
    {
      path: paths.resetPassword,
      errorElement: <RouteError />,
      hydrateFallbackElement: <Spinner />,
      lazy: async () => ({ Component: (await import('@/features/auth/routes/reset-password')).ChooseNewPasswordPage }),
    },
    // The customer's quote page: reached from the e-mailed link, no sign-in, outside the staff layout.
    { path: paths.publicQuote, errorElement: <RouteError />, hydrateFallbackElement: <Spinner label="Opening your quote…" />, lazy: () => import('@/features/public-quote/routes/public-quote') },
    {
      path: '/',
      element: <AppLayout />,
      errorElement: <RouteError />,
      hydrateFallbackElement: <Spinner label="Opening Shellwright…" />,
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
        { path: paths.quotes, lazy: () => import('@/features/quotes/routes/quotes') },
        { path: paths.quote, lazy: () => import('@/features/quotes/routes/quote') },
        {
          path: paths.outbox,
          lazy: async () => {
            const { OutboxPage } = await import('@/features/outbox/routes/outbox');
            return { element: <RequireRole roles={SELLERS}><OutboxPage /></RequireRole> };
          },
        },
        {
          path: paths.users,
          element: (
            <RequireRole roles={['owner']}>
              <UsersPage />
            </RequireRole>
          ),
        },
        {
          path: paths.reprice,
          lazy: async () => {
            const { RepricePage } = await import('@/features/reprice/routes/reprice');
            return { element: <RequireRole roles={['owner']}><RepricePage /></RequireRole> };
          },
        },
        // Planning: the board and jobs for all staff; the forecast for owner and planner; actuals for the owner.
        { path: paths.planning, lazy: async () => ({ Component: (await import('@/features/planning/routes/planning-board')).PlanningBoardPage }) },
        { path: paths.planningJob, lazy: async () => ({ Component: (await import('@/features/planning/routes/job')).JobPage }) },
        {
          path: paths.forecast,
          lazy: async () => {
            const { ForecastPage } = await import('@/features/forecast/routes/forecast');
            return { element: <RequireRole roles={['owner', 'workshop']}><ForecastPage /></RequireRole> };
          },
        },
        {
          path: paths.actuals,
          lazy: async () => {
            const { ActualsPage } = await import('@/features/actuals/routes/actuals');
            return { element: <RequireRole roles={['owner']}><ActualsPage /></RequireRole> };
          },
        },
        ...ownerRoutes,
        { path: '*', element: <NotFound /> },
      ],
    },
  ]);
}
