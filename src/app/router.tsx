import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppLayout } from './layout/app-layout';
import { AuditLogRoute } from './routes/audit-log';
import { DashboardRoute } from './routes/dashboard';
import { DevMailRoute } from './routes/dev-mail';
import { AcceptInvitationRoute, InvitationRoute } from './routes/invitation';
import { CustomerJobRoute } from './routes/customer-job';
import { InviteRoute } from './routes/invite';
import { PersonRoute } from './routes/person';
import { ShopRoute } from './routes/shop';
import { NewShopRoute } from './routes/shop-new';
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
import { TransfersRoute } from './routes/transfers';
import { TransferNewRoute } from './routes/transfer-new';
import { TransferDetailRoute } from './routes/transfer-detail';
import { RegistryRoute } from './routes/registry';
import { InstrumentRoute } from './routes/instrument';
import { InstrumentLabelRoute } from './routes/instrument-label';
import { IntakeRoute } from './routes/intake';
import { RegistryImportRoute } from './routes/registry-import';
import { PadMapRoute } from './routes/pad-map';
import { PadRulesRoute } from './routes/pad-rules';
import { StockRoute } from './routes/stock';
import { JobBoardRoute } from './routes/job-board';
import { MyBenchRoute } from './routes/my-bench';
import { JobRoute } from './routes/job';
import { ServiceCatalogRoute } from './routes/service-catalog';
import { InstrumentPhotosRoute } from './routes/instrument-photos';
import { InboxRoute } from './routes/inbox';
import { NotificationSettingsRoute } from './routes/notification-settings';

/** Shared by the browser router and by tests, which mount the same tree in a memory router. */
export const routes: RouteObject[] = [
  { path: '/sign-in', element: <SignInRoute />, errorElement: <RouteErrorBoundary /> },
  { path: '/dev/mail', element: <DevMailRoute />, errorElement: <RouteErrorBoundary /> },
  // an invitation is opened before its person holds any role, so it sits outside the session gate
  { path: '/invitations/:token', element: <InvitationRoute />, errorElement: <RouteErrorBoundary /> },
  { path: '/invitations/:token/accept', element: <AcceptInvitationRoute />, errorElement: <RouteErrorBoundary /> },
  // the customer's page of their job: no account, the token in the link is the key
  { path: '/c/:token', element: <CustomerJobRoute />, errorElement: <RouteErrorBoundary /> },
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
            path: 'people/invite',
            element: (
              <RequireAbility action="create" subject="Invitation">
                <InviteRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'people/:id',
            element: (
              <RequireAbility action="manage" subject="Membership">
                <PersonRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'audit-log',
            element: (
              <RequireAbility action="read" subject="AuditLog">
                <AuditLogRoute />
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
          {
            path: 'shops/new',
            element: (
              <RequireAbility action="create" subject="Shop">
                <NewShopRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'shops/:id',
            element: (
              <RequireAbility action="manage" subject="Shop">
                <ShopRoute />
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
            path: 'jobs/:jobId/pad-map',
            element: (
              <RequireAbility action="read" subject="PadMap">
                <PadMapRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'stock',
            element: (
              <RequireAbility action="read" subject="Stock">
                <StockRoute />
              </RequireAbility>
            ),
          },
          {
            path: 'pad-rules',
            element: (
              <RequireAbility action="read" subject="PadMap">
                <PadRulesRoute />
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
          // everyone signed in has an inbox: the server returns only their own notices
          { path: 'inbox', element: <InboxRoute /> },
          { path: 'inbox/settings', element: <NotificationSettingsRoute /> },
          { path: '*', element: <NotFoundRoute /> },
        ],
      },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
