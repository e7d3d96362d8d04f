import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout/app-layout';
import { DevMailRoute } from './routes/dev-mail';
import { HomeRoute } from './routes/home';
import { NotFoundRoute } from './routes/not-found';
import { PeopleRoute } from './routes/people';
import { RequireAbility } from './routes/require-ability';
import { RouteErrorBoundary } from './routes/route-error';
import { SessionGate } from './routes/session-gate';
import { SignInRoute } from './routes/sign-in';
import { ShopsRoute } from './routes/shops';
import { TransfersRoute } from './routes/transfers';
import { TransferNewRoute } from './routes/transfer-new';
import { TransferDetailRoute } from './routes/transfer-detail';

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
          {
            path: 'transfers',
            element: (
              <RequireAbility action="read" subject="Transfer">
                <TransfersRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'transfers/new',
            element: (
              <RequireAbility action="request" subject="Transfer">
                <TransferNewRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'transfers/:id',
            element: (
              <RequireAbility action="read" subject="Transfer">
                <TransferDetailRoute />
              </RequireAbility>
            ),
          },
          { path: '*', element: <NotFoundRoute /> },
        ],
      },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
