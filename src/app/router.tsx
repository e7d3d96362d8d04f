import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout/app-layout';
import { DashboardRoute } from './routes/dashboard';
import { DevMailRoute } from './routes/dev-mail';
import { HomeRoute } from './routes/home';
import { NotFoundRoute } from './routes/not-found';
import { PeopleRoute } from './routes/people';
import { OverdueRoute, ReportJobsRoute, TransfersInFlightRoute } from './routes/report-lists';
import { ReportsRoute } from './routes/reports';
import { RequireAbility } from './routes/require-ability';
import { RouteErrorBoundary } from './routes/route-error';
import { SessionGate } from './routes/session-gate';
import { SignInRoute } from './routes/sign-in';
import { ShopsRoute } from './routes/shops';

/** Shared by the browser router and by tests, which mount the same tree in a memory router. */
export const routes: RouteObject[] = [
  { path: '/sign-in', element: <SignInRoute />, errorElement: <RouteErrorBoundary /> },
  { path: '/dev/mail', element: <DevMailRoute />, errorElement: <RouteErrorBoundary /> },
  {
    path: '/',
    element: <SessionGate />,
    errorElement: <RouteErrorBoundary />,
    children: [
      {
        element: <AppLayout />,
        children: [
          { index: true, element: <HomeRoute /> },
          {
            path: 'people',
            element: (
              <RequireAbility action="manage" subject="Membership">
                <PeopleRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'shops',
            element: (
              <RequireAbility action="manage" subject="Shop">
                <ShopsRoute />
              </RequireAbility>
            ),
          },
          ...[
            { path: 'dashboard', element: <DashboardRoute /> },
            { path: 'reports', element: <ReportsRoute /> },
            { path: 'reports/overdue', element: <OverdueRoute /> },
            { path: 'reports/transfers', element: <TransfersInFlightRoute /> },
            { path: 'reports/jobs', element: <ReportJobsRoute /> },
          ].map((r) => ({
            ...r,
            element: (
              <RequireAbility action="read" subject="Report">
                {r.element}
              </RequireAbility>
            ),
          })),
          { path: '*', element: <NotFoundRoute /> },
        ],
      },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
