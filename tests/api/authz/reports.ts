import type { RouteCase, Scope } from './types.js';

/**
 * Dashboard and reports (server/modules/reports). Every report takes `?shop=` to narrow it to one shop:
 * the owner may name any shop of the network, everyone else only a shop where they hold a role, and
 * another network's shop is "not found". Without `?shop=` a report covers the person's own shops
 * (tests/api/reports.test.ts checks those figures role by role).
 */
const anyShopForOwner: RouteCase['allow'] = {
  owner: ['own', 'otherShop'],
  regional_manager: ['own'],
  front_desk: ['own'],
  technician: ['own'],
  auditor: ['own'],
};
const shopQuery = (scope: Scope, ids: Record<Scope, Record<string, string>>) => ({ shop: ids[scope].shop });

const readRoutes = [
  '/api/reports/dashboard',
  '/api/reports/overdue',
  '/api/reports/transfers',
  '/api/reports/jobs',
];

// A CSV is a copy that leaves the app: every report file needs `export` on Report, like the invoices.
// Technicians and auditors read the figures on screen but download none of them.
const exportOnly: RouteCase['allow'] = { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'] };

const csvRoutes = [
  '/api/reports/open-jobs.csv',
  '/api/reports/overdue.csv',
  '/api/reports/transfers.csv',
  '/api/reports/bench-load.csv',
  '/api/reports/turnaround.csv',
  '/api/reports/weekly-intake.csv',
  '/api/reports/jobs.csv',
];

export const cases: RouteCase[] = [
  ...readRoutes.map(
    (path): RouteCase => ({
      route: `GET ${path}`,
      allow: anyShopForOwner,
      build: ({ world, scope }) => ({ path, query: shopQuery(scope, world.ids) }),
      // `shop` is the scope's target; the job lists narrow by skill too
      foreignIds: path.startsWith('/api/reports/jobs') ? { 'query.skill': { kind: 'skill', filter: true } } : {},
    }),
  ),
  ...csvRoutes.map(
    (path): RouteCase => ({
      route: `GET ${path}`,
      allow: exportOnly,
      build: ({ world, scope }) => ({ path, query: shopQuery(scope, world.ids) }),
      // `shop` is the scope's target; the job list narrows by skill too
      foreignIds: path === '/api/reports/jobs.csv' ? { 'query.skill': { kind: 'skill', filter: true } } : {},
    }),
  ),
  // Invoices carry customers and money: the owner, regional managers and front desk (who release and
  // bill) may export them; technicians and auditors may not.
  {
    route: 'GET /api/reports/invoices.csv',
    allow: exportOnly,
    build: ({ world, scope }) => ({
      path: '/api/reports/invoices.csv',
      query: { ...shopQuery(scope, world.ids), from: '2026-01-01', to: '2026-12-31' },
    }),
    foreignIds: {},
  },
];
