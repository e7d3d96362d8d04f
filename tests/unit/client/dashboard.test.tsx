// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { DashboardReport } from '@shared/reports/schemas';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import { requestUrl } from '../../helpers/request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

// As in app-shell.test.tsx: a fake fetch that answers the API contract; the server side of the contract
// is tested against the real app in tests/api/reports*.test.ts.
vi.mock('@/lib/browser', () => ({ assignLocation: vi.fn() }));

type Answer = { status: number; body?: unknown };

function renderAt(path: string, answers: Record<string, Answer>) {
  const calls: string[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn((input: RequestInfo | URL) => {
      const url = requestUrl(input);
      calls.push(url.pathname + url.search);
      const answer = answers[`GET ${url.pathname}`] ?? { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
      return Promise.resolve(new Response(JSON.stringify(answer.body), { status: answer.status, headers: { 'Content-Type': 'application/json' } }));
    }),
  );
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProviders queryClient={createQueryClient()}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return { router, calls };
}

const fen = { id: 'shop-fen', name: 'Fenwick Row Bench', city: 'Boise', timeZone: 'America/Boise' };
const quay = { id: 'shop-quay', name: 'Quayside Winds', city: 'Duluth', timeZone: 'America/Chicago' };
const reportShop = (s: typeof fen, code: string) => ({ id: s.id, name: s.name, code, timeZone: s.timeZone, openingDays: [1, 2, 3, 4, 5] });

const me = (rules: unknown[], role = 'regional_manager') => ({
  user: { id: 'u-1', email: 'oriel.vance@example.test', name: 'Oriel Vance' },
  network: { id: 'n-1', name: 'Lakeshore Band Repair' },
  memberships: [
    { shopId: fen.id, shopName: fen.name, role },
    { shopId: quay.id, shopName: quay.name, role },
  ],
  shops: [fen, quay],
  rules,
});
const managerRules = [{ action: ['read', 'export'], subject: 'Report', conditions: { shopId: { $in: [fen.id, quay.id] } } }];

const figure = (jobs: number, median: number | null, p90: number | null) => ({
  jobs, medianBusinessDays: median, p90BusinessDays: p90, medianCalendarDays: median, p90CalendarDays: p90,
});

const report: DashboardReport = {
  generatedAt: '2026-12-01T18:00:00.000Z',
  shops: [reportShop(fen, 'FEN'), reportShop(quay, 'QUA')],
  openJobsByStage: [
    { shopId: fen.id, stage: 'intake', count: 3 },
    { shopId: fen.id, stage: 'on_bench', count: 2 },
    { shopId: quay.id, stage: 'ready', count: 1 },
  ],
  overdue: {
    total: 1,
    byShop: [{ shopId: fen.id, count: 1 }],
    oldest: [
      {
        id: 'job-77', number: 77, shopId: fen.id, shopName: fen.name, stage: 'on_bench', family: 'clarinet', maker: 'Ashgrove',
        model: 'C-1', serial: 'AG 100', customerName: null, customerHidden: false, promisedOn: '2026-11-27', daysLate: 4, assigneeName: null,
      },
    ],
  },
  transfersInFlight: { total: 0, late: 0, items: [] },
  benchLoad: [
    { shopId: fen.id, skillId: 'sk-1', skillName: 'General woodwind', weeklyBenchHours: 40, openHours: 46, openJobs: 5, unestimatedJobs: 1, weeksOfWork: 1.15 },
  ],
  turnaround: [30, 90, 365].map((days) => ({
    days: days as 30 | 90 | 365,
    overall: figure(4, 3, 6),
    byShop: [{ shopId: fen.id, ...figure(4, 3, 6) }],
    byFamily: [{ family: 'clarinet' as const, ...figure(4, 3, 6) }],
  })),
  weeklyIntake: [
    { weekStart: '2026-11-23', total: 0, byShop: {} },
    { weekStart: '2026-11-30', total: 5, byShop: { [fen.id]: 5 } },
  ],
};

beforeAll(() => {
  // jsdom has no layout; the charts only need to be told their size changed
  vi.stubGlobal('ResizeObserver', class { observe() {} unobserve() {} disconnect() {} });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  vi.stubGlobal('ResizeObserver', class { observe() {} unobserve() {} disconnect() {} });
});

describe('dashboard screen', () => {
  it('shows the figures with links to the lists behind them, and each chart’s table', async () => {
    const { calls } = renderAt('/dashboard', { 'GET /api/me': { status: 200, body: me(managerRules) }, 'GET /api/reports/dashboard': { status: 200, body: report } });
    expect(await screen.findByRole('heading', { level: 1, name: 'Dashboard' })).toBeInTheDocument();
    const overdue = await screen.findByRole('link', { name: /Overdue promises\s*1/ });
    expect(overdue).toHaveAttribute('href', '/reports/overdue');
    expect(screen.getByRole('link', { name: /Open jobs\s*6/ })).toHaveAttribute('href', '/reports/jobs?stage=open');

    const stages = screen.getByRole('table', { name: 'Open jobs by stage, per shop' });
    expect(within(stages).getByRole('link', { name: '3 Intake at Fenwick Row Bench' })).toHaveAttribute(
      'href',
      `/reports/jobs?scope=${fen.id}&stage=intake`,
    );
    const load = screen.getByRole('table', { name: 'Bench load per skill, per shop' });
    expect(within(load).getByText('115 %')).toBeInTheDocument();
    expect(within(load).getByRole('link', { name: /5 open General woodwind jobs/ })).toHaveAttribute('href', `/reports/jobs?scope=${fen.id}&skill=sk-1`);
    expect(screen.getByRole('link', { name: 'Job 77' })).toHaveAttribute('href', '/jobs/job-77');
    expect(calls).toContain('/api/reports/dashboard');
  });

  it('narrows to one shop through “Figures for”, asking the API for that shop only', async () => {
    const { router, calls } = renderAt('/dashboard', {
      'GET /api/me': { status: 200, body: me(managerRules) },
      'GET /api/reports/dashboard': { status: 200, body: report },
    });
    const picker = await screen.findByLabelText('Figures for');
    expect(within(picker).getAllByRole('option').map((o) => o.textContent)).toEqual(['All your shops (2)', fen.name, quay.name]);
    fireEvent.change(picker, { target: { value: quay.id } });
    await screen.findByText(/Quayside Winds at a glance/);
    expect(router.state.location.search).toContain(`scope=${quay.id}`);
    await vi.waitFor(() => expect(calls).toContain(`/api/reports/dashboard?shop=${quay.id}`));
  });

  it('says what went wrong when the figures cannot be loaded, and retries', async () => {
    renderAt('/dashboard', {
      'GET /api/me': { status: 200, body: me(managerRules) },
      'GET /api/reports/dashboard': { status: 403, body: { error: { code: 'forbidden', message: 'You may not see this shop’s figures.' } } },
    });
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('The figures could not be loaded');
    expect(alert).toHaveTextContent('You may not see this shop’s figures.');
    expect(within(alert).getByRole('button', { name: 'Try again' })).toBeInTheDocument();
  });

  it('has no Dashboard for someone whose rules give no figures, even by address', async () => {
    renderAt('/dashboard', { 'GET /api/me': { status: 200, body: me([{ action: 'read', subject: 'Instrument' }], 'technician') } });
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
    const nav = screen.getByRole('navigation', { name: 'Main' });
    expect(within(nav).queryByRole('link', { name: 'Dashboard' })).not.toBeInTheDocument();
  });
});

describe('lists behind the figures', () => {
  it('the overdue list: an empty answer is said plainly, with the CSV still offered', async () => {
    renderAt(`/reports/overdue?scope=${fen.id}`, {
      'GET /api/me': { status: 200, body: me(managerRules) },
      'GET /api/reports/overdue': { status: 200, body: { shops: [reportShop(fen, 'FEN')], total: 0, items: [] } },
    });
    expect(await screen.findByRole('heading', { name: 'Nothing overdue' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: /Download CSV/ })).toHaveAttribute('href', `/api/reports/overdue.csv?shop=${fen.id}`);
  });

  it('someone who reads the figures but may not export them sees the list without a CSV link', async () => {
    const readOnly = [{ action: 'read', subject: 'Report', conditions: { shopId: { $in: [fen.id, quay.id] } } }];
    renderAt(`/reports/overdue?scope=${fen.id}`, {
      'GET /api/me': { status: 200, body: me(readOnly, 'technician') },
      'GET /api/reports/overdue': { status: 200, body: { shops: [reportShop(fen, 'FEN')], total: 0, items: [] } },
    });
    expect(await screen.findByRole('heading', { name: 'Nothing overdue' })).toBeInTheDocument();
    expect(screen.queryByRole('link', { name: /Download CSV/ })).toBeNull();
  });

  it('the jobs list says which figure it is behind and offers the same rows as CSV', async () => {
    renderAt(`/reports/jobs?scope=${fen.id}&stage=on_bench`, {
      'GET /api/me': { status: 200, body: me(managerRules) },
      'GET /api/reports/jobs': {
        status: 200,
        body: {
          shops: [reportShop(fen, 'FEN')],
          total: 1,
          items: [
            {
              id: 'job-9', number: 9, shopId: fen.id, shopName: fen.name, stage: 'on_bench', family: 'flute', maker: 'Ashgrove', model: null,
              serial: 'F 9', customerName: null, customerHidden: false, skillName: 'Flutes', estimatedHours: 5, openedAt: '2026-11-30T06:30:00.000Z', readyAt: null,
              promisedOn: null, assigneeName: null,
            },
          ],
        },
      },
    });
    expect(await screen.findByText(/Jobs at the stage “On bench”/)).toBeInTheDocument();
    const table = await screen.findByRole('table', { name: 'Jobs' });
    // taken in at 06:30 UTC on 30 Nov is still 29 Nov in Boise
    expect(within(table).getByText('Sun 29 Nov 2026')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: /Download CSV/ })).toHaveAttribute('href', `/api/reports/jobs.csv?shop=${fen.id}&stage=on_bench`);
  });

  it('the invoice export shows the schema’s field error before asking the server', async () => {
    const { calls } = renderAt('/reports', {
      'GET /api/me': { status: 200, body: me(managerRules) },
      'GET /api/reports/dashboard': { status: 200, body: report },
    });
    fireEvent.change(await screen.findByLabelText('Released from'), { target: { value: '2026-11-20' } });
    fireEvent.change(screen.getByLabelText('Released to (inclusive)'), { target: { value: '2026-11-01' } });
    fireEvent.click(screen.getByRole('button', { name: 'Download invoice CSV' }));
    expect(await screen.findByText('The end date must not be before the start date.')).toBeInTheDocument();
    expect(screen.getByLabelText('Released to (inclusive)')).toHaveAttribute('aria-invalid', 'true');
    expect(calls.some((c) => c.startsWith('/api/reports/invoices.csv'))).toBe(false);
  });
});
