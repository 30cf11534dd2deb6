import { createBrowserRouter } from 'react-router-dom';
import { Spinner } from '@/components/spinner';
import { paths } from '@/config/paths';
import { SignInPage } from '@/features/auth/routes/sign-in';
import { OverviewPage } from '@/features/home/routes/overview';
import { UsersPage } from '@/features/users/routes/users';
import { AppLayout } from './layout';
import { NotFound } from './not-found';
import { ownerRoutes } from './owner-routes';
import { RequireAccess } from './require-access';
import { RouteError } from './route-error';

// Pages for some roles only are wrapped in RequireAccess with a permission of shared/roles.ts (the server enforces
// the same permission on every route the page calls).

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
    // A new workshop's sign-up and the confirmation of its owner's address: no sign-in, outside the staff layout.
    { path: paths.signUp, errorElement: <RouteError />, hydrateFallbackElement: <Spinner />, lazy: () => import('@/features/signup/routes/signup') },
    { path: paths.confirmEmail, errorElement: <RouteError />, hydrateFallbackElement: <Spinner />, lazy: () => import('@/features/signup/routes/confirm-email') },
    // The customer's quote page: reached from the e-mailed link, no sign-in, outside the staff layout.
    { path: paths.publicQuote, errorElement: <RouteError />, hydrateFallbackElement: <Spinner label="Opening your quote…" />, lazy: () => import('@/features/public-quote/routes/public-quote') },
    { path: paths.publicVariation, errorElement: <RouteError />, hydrateFallbackElement: <Spinner label="Opening…" />, lazy: () => import('@/features/public-quote/routes/public-variation') },
    // An invitation to join a workshop: no sign-in; accepting it signs the person in.
    { path: paths.invite, errorElement: <RouteError />, hydrateFallbackElement: <Spinner label="Opening your invitation…" />, lazy: () => import('@/features/invite/routes/invite') },
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
          lazy: async () => ({ Component: (await import('@/app/routes/customer')).CustomerPage }),
        },
        {
          path: paths.piece,
          lazy: async () => ({ Component: (await import('@/features/pieces/routes/piece')).PiecePage }),
        },
        {
          path: paths.estimates,
          lazy: async () => ({ Component: (await import('@/app/routes/estimates')).EstimatesPage }),
        },
        {
          path: paths.newEstimate,
          lazy: async () => {
            const { NewEstimatePage } = await import('@/app/routes/new-estimate');
            return { element: <RequireAccess access="editEstimates"><NewEstimatePage /></RequireAccess> };
          },
        },
        {
          path: paths.estimate,
          lazy: async () => ({ Component: (await import('@/app/routes/estimate')).EstimatePage }),
        },
        {
          path: paths.editEstimate,
          lazy: async () => {
            const { EditEstimatePage } = await import('@/features/estimates/routes/edit-estimate');
            return { element: <RequireAccess access="editEstimates"><EditEstimatePage /></RequireAccess> };
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
            return { element: <RequireAccess access="sendQuotes"><OutboxPage /></RequireAccess> };
          },
        },
        {
          path: paths.messageTemplates,
          lazy: async () => {
            const { MessageTemplatesPage } = await import('@/features/messages/routes/message-templates');
            return { element: <RequireAccess access="readMessages"><MessageTemplatesPage /></RequireAccess> };
          },
        },
        {
          path: paths.owed,
          lazy: async () => {
            const { OwedPage } = await import('@/features/accounts/routes/owed');
            return { element: <RequireAccess access="takePayments"><OwedPage /></RequireAccess> };
          },
        },
        {
          path: paths.account,
          lazy: async () => {
            const { AccountPage } = await import('@/features/accounts/routes/account');
            return { element: <RequireAccess access="takePayments"><AccountPage /></RequireAccess> };
          },
        },
        {
          path: paths.users,
          element: (
            <RequireAccess access="manageUsers">
              <UsersPage />
            </RequireAccess>
          ),
        },
        {
          path: paths.reprice,
          lazy: async () => {
            const { RepricePage } = await import('@/features/reprice/routes/reprice');
            return { element: <RequireAccess access="repriceEstimates"><RepricePage /></RequireAccess> };
          },
        },
        // Planning: the board and jobs for all staff; the forecast for owner and planner; actuals for the owner.
        { path: paths.planning, lazy: async () => ({ Component: (await import('@/features/planning/routes/planning-board')).PlanningBoardPage }) },
        { path: paths.planningJob, lazy: async () => ({ Component: (await import('@/features/planning/routes/job')).JobPage }) },
        {
          path: paths.forecast,
          lazy: async () => {
            const { ForecastPage } = await import('@/features/forecast/routes/forecast');
            return { element: <RequireAccess access="readForecast"><ForecastPage /></RequireAccess> };
          },
        },
        {
          path: paths.actuals,
          lazy: async () => {
            const { ActualsPage } = await import('@/features/actuals/routes/actuals');
            return { element: <RequireAccess access="reviewActuals"><ActualsPage /></RequireAccess> };
          },
        },
        {
          path: paths.stock,
          lazy: async () => {
            const { StockPage } = await import('@/features/stock/routes/stock');
            return { element: <RequireAccess access="keepStock"><StockPage /></RequireAccess> };
          },
        },
        {
          path: paths.reports,
          lazy: async () => {
            const { ReportsPage } = await import('@/features/reports/routes/reports');
            return { element: <RequireAccess access="readReports"><ReportsPage /></RequireAccess> };
          },
        },
        ...ownerRoutes,
        { path: '*', element: <NotFound /> },
      ],
    },
  ]);
}
