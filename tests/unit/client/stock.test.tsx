// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi, beforeAll } from 'vitest';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import type { StockPage } from '@/features/stock/types';
import { requestUrl } from '../../helpers/request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

// The stock screen against fixed answers; tests/api/padmaps-stock.test.ts checks the API itself.
vi.mock('@/lib/browser', () => ({ assignLocation: vi.fn() }));

const shop = { id: 'shop-1', name: 'Harbour Street Bench', city: 'Halifax', timeZone: 'America/Halifax' };
const me = (rules: unknown[]) => ({
  user: { id: 'user-1', email: 'ines@example.test', name: 'Ines Barros' },
  network: { id: 'net-1', name: 'Tidewater Band Repair' },
  memberships: [{ shopId: shop.id, shopName: shop.name, role: 'technician' }],
  shops: [shop],
  rules,
});
const technicianRules = [
  { action: 'read', subject: 'Stock', conditions: { shopId: { $in: [shop.id] } } },
  { action: ['request', 'receive'], subject: 'Stock', conditions: { shopId: { $in: [shop.id] } } },
];

const page: StockPage = {
  shop: { id: shop.id, name: shop.name },
  rows: [
    {
      partId: 'p-30', sku: 'PAD-S-30.0', name: 'Self-leveling pad 30.0 mm × 3.6 mm', kind: 'pad', padKind: 'self_leveling', diameterMm: 30, thicknessMm: 3.6, unitPriceCents: 610,
      onHand: 1, reserved: 3, reorderPoint: 2, available: -2, shortage: 2, incoming: 0, belowReorderPoint: true,
      source: { shopId: 'shop-2', shopName: 'Mill Lane Woodwinds', free: 5, distanceKm: 232, relayRun: true, coversAll: true },
      hazards: ['adhesive'],
    },
  ],
  totals: { parts: 1, short: 1, belowReorderPoint: 1 },
  transfers: {
    incoming: [
      {
        id: 't-1', state: 'sent', quantity: 2, part: { partId: 'p-29', sku: 'PAD-S-29.0', name: 'Self-leveling pad 29.0 mm × 3.6 mm' },
        fromShop: { id: 'shop-2', name: 'Mill Lane Woodwinds' }, toShop: { id: shop.id, name: shop.name }, jobId: 'job-1', jobNumber: 1042, relayRun: true, note: null,
        requestedAt: '2026-01-01T00:00:00Z', sentAt: '2026-01-02T00:00:00Z', receivedAt: null,
      },
    ],
    outgoing: [],
  },
  can: { update: false, pack: false, request: true, receive: true, setHazards: false },
};

function renderStock() {
  const calls: Array<{ method: string; path: string; body?: unknown }> = [];
  vi.stubGlobal(
    'fetch',
    vi.fn((input: RequestInfo | URL, init: RequestInit = {}) => {
      const url = requestUrl(input);
      const method = (init.method ?? 'GET').toUpperCase();
      calls.push({ method, path: `${url.pathname}${url.search}`, body: typeof init.body === 'string' ? JSON.parse(init.body) : undefined });
      let body: unknown = { error: { code: 'not_found', message: 'Not found' } };
      let status = 404;
      if (url.pathname === '/api/me') [status, body] = [200, me(technicianRules)];
      if (url.pathname === '/api/stock') [status, body] = [200, page];
      if (method === 'POST' && url.pathname.startsWith('/api/stock/part-transfers')) [status, body] = [201, { created: true, transfer: page.transfers.incoming[0] }];
      return Promise.resolve(new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } }));
    }),
  );
  const router = createMemoryRouter(routes, { initialEntries: ['/stock?shop=shop-1'] });
  render(
    <AppProviders queryClient={createQueryClient()}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return calls;
}

beforeEach(() => window.localStorage.clear());
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('stock screen', () => {
  it('lists the shortage with the nearest shop, and asks for the parts in one click', async () => {
    const calls = renderStock();
    await screen.findByRole('heading', { name: 'Stock at Harbour Street Bench' });
    expect(calls.find((c) => c.path.startsWith('/api/stock?'))?.path).toBe('/api/stock?shopId=shop-1&attention=true');
    const row = (await screen.findByText('Self-leveling pad 30.0 mm × 3.6 mm')).closest('tr') as HTMLElement;
    expect(within(row).getByText('Short 2')).toBeInTheDocument();
    expect(within(row).getByText(/Mill Lane Woodwinds has 5 · 232 km · relay run/)).toBeInTheDocument();
    expect(within(row).queryByRole('button', { name: 'Count' })).not.toBeInTheDocument(); // technicians do not set counts
    fireEvent.click(within(row).getByRole('button', { name: 'Request 2 from Mill Lane Woodwinds' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.path === '/api/stock/part-transfers')).toBe(true));
    expect(calls.find((c) => c.method === 'POST')?.body).toEqual({ partId: 'p-30', fromShopId: 'shop-2', toShopId: 'shop-1', quantity: 2 });
  });

  it('takes in parts that were sent', async () => {
    const calls = renderStock();
    const incoming = (await screen.findByText('2 × Self-leveling pad 29.0 mm × 3.6 mm')).closest('li') as HTMLElement;
    expect(incoming).toHaveTextContent(/from Mill Lane Woodwinds · job 1042 · on the relay run · sent, on the way/);
    fireEvent.click(within(incoming).getByRole('button', { name: 'Receive' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.path === '/api/stock/part-transfers/t-1/receive')).toBe(true));
  });
});
