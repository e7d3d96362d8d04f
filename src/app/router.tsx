import { lazy, Suspense, useState, type ComponentType } from 'react';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { Spinner } from '@/components/ui/spinner';
import { AppLayout } from './layout/app-layout';
import { NotFoundRoute } from './routes/not-found';
import { RequireAbility } from './routes/require-ability';
import { RouteErrorBoundary } from './routes/route-error';
import { SessionGate } from './routes/session-gate';

/**
 * Every page is a chunk of its own, loaded when first visited: the first script holds only the shell
 * (router, session, layout), and charts, the CSV parser and QR labels arrive with the pages that use them.
 */
const pageLoaders: Array<() => Promise<unknown>> = [];

function page(load: () => Promise<{ default: ComponentType }>) {
  let loaded: ComponentType | undefined;
  const loadAndKeep = () =>
    load().then((module) => {
      loaded = module.default;
      return module;
    });
  pageLoaders.push(loadAndKeep);
  const Lazy = lazy(loadAndKeep);
  return function Page() {
    // a page whose code is already here renders at once; the choice is fixed per mount, so the page is
    // never remounted (and its state lost) when its code arrives while it is shown
    const [Ready] = useState(() => loaded);
    if (Ready) return <Ready />;
    return (
      <Suspense fallback={<PageLoading />}>
        <Lazy />
      </Suspense>
    );
  };
}

/** Loads every page's code now (tests, which would otherwise wait for each module on first render). */
export function preloadPages(): Promise<unknown> {
  return Promise.all(pageLoaders.map((load) => load()));
}

function PageLoading() {
  return (
    <div className="flex justify-center p-8">
      <Spinner label="Loading the page…" />
    </div>
  );
}

const AuditLogRoute = page(() => import('./routes/audit-log').then((m) => ({ default: m.AuditLogRoute })));
const DashboardRoute = page(() => import('./routes/dashboard').then((m) => ({ default: m.DashboardRoute })));
const DevMailRoute = page(() => import('./routes/dev-mail').then((m) => ({ default: m.DevMailRoute })));
const AcceptInvitationRoute = page(() => import('./routes/invitation').then((m) => ({ default: m.AcceptInvitationRoute })));
const InvitationRoute = page(() => import('./routes/invitation').then((m) => ({ default: m.InvitationRoute })));
const InviteRoute = page(() => import('./routes/invite').then((m) => ({ default: m.InviteRoute })));
const PersonRoute = page(() => import('./routes/person').then((m) => ({ default: m.PersonRoute })));
const ShopRoute = page(() => import('./routes/shop').then((m) => ({ default: m.ShopRoute })));
const NewShopRoute = page(() => import('./routes/shop-new').then((m) => ({ default: m.NewShopRoute })));
const CustomerJobRoute = page(() => import('./routes/customer-job').then((m) => ({ default: m.CustomerJobRoute })));
const HomeRoute = page(() => import('./routes/home').then((m) => ({ default: m.HomeRoute })));
const PeopleRoute = page(() => import('./routes/people').then((m) => ({ default: m.PeopleRoute })));
const OverdueRoute = page(() => import('./routes/report-lists').then((m) => ({ default: m.OverdueRoute })));
const ReportJobsRoute = page(() => import('./routes/report-lists').then((m) => ({ default: m.ReportJobsRoute })));
const TransfersInFlightRoute = page(() => import('./routes/report-lists').then((m) => ({ default: m.TransfersInFlightRoute })));
const ReportsRoute = page(() => import('./routes/reports').then((m) => ({ default: m.ReportsRoute })));
const SignInRoute = page(() => import('./routes/sign-in').then((m) => ({ default: m.SignInRoute })));
const ShopsRoute = page(() => import('./routes/shops').then((m) => ({ default: m.ShopsRoute })));
const TransfersRoute = page(() => import('./routes/transfers').then((m) => ({ default: m.TransfersRoute })));
const TransferNewRoute = page(() => import('./routes/transfer-new').then((m) => ({ default: m.TransferNewRoute })));
const TransferDetailRoute = page(() => import('./routes/transfer-detail').then((m) => ({ default: m.TransferDetailRoute })));
const RegistryRoute = page(() => import('./routes/registry').then((m) => ({ default: m.RegistryRoute })));
const InstrumentRoute = page(() => import('./routes/instrument').then((m) => ({ default: m.InstrumentRoute })));
const InstrumentLabelRoute = page(() => import('./routes/instrument-label').then((m) => ({ default: m.InstrumentLabelRoute })));
const IntakeRoute = page(() => import('./routes/intake').then((m) => ({ default: m.IntakeRoute })));
const RegistryImportRoute = page(() => import('./routes/registry-import').then((m) => ({ default: m.RegistryImportRoute })));
const PadMapRoute = page(() => import('./routes/pad-map').then((m) => ({ default: m.PadMapRoute })));
const PadRulesRoute = page(() => import('./routes/pad-rules').then((m) => ({ default: m.PadRulesRoute })));
const StockRoute = page(() => import('./routes/stock').then((m) => ({ default: m.StockRoute })));
const JobBoardRoute = page(() => import('./routes/job-board').then((m) => ({ default: m.JobBoardRoute })));
const MyBenchRoute = page(() => import('./routes/my-bench').then((m) => ({ default: m.MyBenchRoute })));
const JobRoute = page(() => import('./routes/job').then((m) => ({ default: m.JobRoute })));
const ServiceCatalogRoute = page(() => import('./routes/service-catalog').then((m) => ({ default: m.ServiceCatalogRoute })));
const InstrumentPhotosRoute = page(() => import('./routes/instrument-photos').then((m) => ({ default: m.InstrumentPhotosRoute })));
const InboxRoute = page(() => import('./routes/inbox').then((m) => ({ default: m.InboxRoute })));
const NotificationSettingsRoute = page(() => import('./routes/notification-settings').then((m) => ({ default: m.NotificationSettingsRoute })));

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
