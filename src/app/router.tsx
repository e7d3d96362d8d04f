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
import { RegistryRoute } from './routes/registry';
import { InstrumentRoute } from './routes/instrument';
import { InstrumentLabelRoute } from './routes/instrument-label';
import { IntakeRoute } from './routes/intake';
import { RegistryImportRoute } from './routes/registry-import';
import { JobBoardRoute } from './routes/job-board';
import { MyBenchRoute } from './routes/my-bench';
import { JobRoute } from './routes/job';
import { ServiceCatalogRoute } from './routes/service-catalog';
import { InstrumentPhotosRoute } from './routes/instrument-photos';

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
            path: 'jobs',
            element: (
              <RequireAbility action="read" subject="Job">
                <JobBoardRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'jobs/:jobId',
            element: (
              <RequireAbility action="read" subject="Job">
                <JobRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'bench',
            element: (
              <RequireAbility action="update" subject="Job">
                <MyBenchRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'catalog',
            element: (
              <RequireAbility action="create" subject="ServiceCatalog">
                <ServiceCatalogRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'instruments/:instrumentId/photos',
            element: (
              <RequireAbility action="read" subject="Attachment">
                <InstrumentPhotosRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'registry',
            element: (
              <RequireAbility action="read" subject="Instrument">
                <RegistryRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'registry/import',
            element: (
              <RequireAbility action="create" subject="Instrument">
                <RegistryImportRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'registry/instruments/:id',
            element: (
              <RequireAbility action="read" subject="Instrument">
                <InstrumentRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'registry/instruments/:id/label',
            element: (
              <RequireAbility action="read" subject="Instrument">
                <InstrumentLabelRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'intake',
            element: (
              <RequireAbility action="create" subject="Job">
                <IntakeRoute />
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
