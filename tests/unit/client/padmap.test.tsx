// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi, beforeAll } from 'vitest';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import { DEFAULT_PAD_RULES } from '@shared/padmap/rules';
import type { PadMapWorkspace } from '@/features/padmap/types';
import { requestUrl } from '../../helpers/request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

// The screen against fixed answers of the pad map API; the API itself is tested against the real app
// in tests/api/padmaps.test.ts, and the whole flow in Chromium in tests/e2e/pad-map.test.ts.
vi.mock('@/lib/browser', () => ({ assignLocation: vi.fn() }));

type Answer = { status: number; body?: unknown };
type Handler = (body: unknown) => Answer;

const shop = { id: 'shop-1', name: 'Harbour Street Bench', city: 'Halifax', timeZone: 'America/Halifax' };
const me = {
  user: { id: 'user-1', email: 'wren@example.test', name: 'Wren Okafor' },
  network: { id: 'net-1', name: 'Tidewater Band Repair' },
  memberships: [{ shopId: null, shopName: null, role: 'owner' }],
  shops: [shop],
  rules: [{ action: 'manage', subject: 'all' }],
};

const pads = (kind: 'self_leveling' | 'glued', thickness: number) =>
  [28, 28.5, 29, 29.5, 30, 30.5, 31, 45, 45.5, 46].map((d) => ({
    diameterMm: d, thicknessMm: thickness, partId: `${kind}-${d}`, sku: `PAD-${kind === 'glued' ? 'G' : 'S'}-${d.toFixed(1)}`, name: `Pad ${d}`, unitPriceCents: 500,
  }));

function workspace(over: Partial<PadMapWorkspace> = {}): PadMapWorkspace {
  return {
    job: { id: 'job-1', number: 1042, stage: 'on_bench', shopId: shop.id, shopName: shop.name },
    instrument: { id: 'inst-1', family: 'alto_saxophone', familyLabel: 'Alto saxophone', maker: 'Quillfield', model: 'QA-2', serial: 'QF 1001' },
    rules: { ...DEFAULT_PAD_RULES, stemHeightsMm: [0.5, 1, 1.5] },
    catalog: { self_leveling: pads('self_leveling', 3.6), glued: pads('glued', 4) },
    services: [{ id: 'svc-1', name: 'Repad — alto saxophone', standardHours: 6, family: 'alto_saxophone' }],
    defaultServiceId: 'svc-1',
    padMap: null,
    previous: null,
    suggestions: { family: 'alto_saxophone', maker: 'Quillfield', model: 'QA-2', basedOnMaps: 2, keys: { low_c: { keyId: 'low_c', basedOn: 2, cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: null, padDiameterMm: 30, padKind: 'self_leveling', padByKind: { self_leveling: 30, glued: null } } } },
    stock: [{ partId: 'self_leveling-30', onHand: 1, reserved: 0, reservedForJob: 0 }],
    parts: [],
    can: { edit: true, requestParts: true },
    ...over,
  };
}

function renderScreen(ws: PadMapWorkspace, onSave?: Handler) {
  const sent: unknown[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn((input: RequestInfo | URL, init: RequestInit = {}) => {
      const url = requestUrl(input);
      const method = (init.method ?? 'GET').toUpperCase();
      let answer: Answer = { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
      if (url.pathname === '/api/me') answer = { status: 200, body: me };
      if (method === 'GET' && url.pathname === '/api/jobs/job-1/pad-map') answer = { status: 200, body: ws };
      if (method === 'PUT' && url.pathname === '/api/jobs/job-1/pad-map') {
        const body: unknown = typeof init.body === 'string' ? JSON.parse(init.body) : undefined;
        sent.push(body);
        answer = onSave ? onSave(body) : { status: 200, body: { ...ws, saved: { padMapId: 'pm-1', created: true, labor: null, reservation: { reserved: 0, released: 0 } } } };
      }
      return Promise.resolve(new Response(JSON.stringify(answer.body ?? null), { status: answer.status, headers: { 'Content-Type': 'application/json' } }));
    }),
  );
  const router = createMemoryRouter(routes, { initialEntries: ['/jobs/job-1/pad-map?shop=shop-1'] });
  render(
    <AppProviders queryClient={createQueryClient()}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return { sent };
}

const cell = (label: string) => screen.getByLabelText<HTMLInputElement>(label);
const rowOf = (label: string) => cell(label).closest('tr') as HTMLElement;

beforeEach(() => window.localStorage.clear());
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('pad map screen', () => {
  it('previews each key as it is typed, in both units, and Enter goes down the column', async () => {
    renderScreen(workspace());
    await screen.findByRole('heading', { name: 'Pad map · Job 1042' });
    const lowCs = cell('Low C♯ cup diameter');
    lowCs.focus();
    fireEvent.change(lowCs, { target: { value: '1.200in' } });
    expect(within(rowOf('Low C♯ cup diameter')).getByText('= 30.480 mm')).toBeInTheDocument();
    expect(within(rowOf('Low C♯ cup diameter')).getByText('30.0 mm')).toBeInTheDocument();
    fireEvent.keyDown(lowCs, { key: 'Enter' });
    expect(document.activeElement).toBe(cell('Low C cup diameter'));
    fireEvent.keyDown(cell('Low C cup diameter'), { key: 'Enter', shiftKey: true });
    expect(document.activeElement).toBe(lowCs);
  });

  it('puts each warning beside the cell that causes it', async () => {
    renderScreen(workspace());
    await screen.findByRole('heading', { name: 'Pad map · Job 1042' });
    fireEvent.change(cell('Low C cup diameter'), { target: { value: '30.5' } });
    fireEvent.change(cell('Low C tone-hole rim diameter'), { target: { value: '30.2' } });
    const rim = cell('Low C tone-hole rim diameter');
    expect(rim).toHaveAttribute('aria-invalid', 'true');
    expect(rim).toHaveAccessibleDescription(/does not cover the 30\.20 mm tone-hole rim/);
    fireEvent.change(cell('Low C cup depth'), { target: { value: '5' } });
    expect(cell('Low C cup depth')).toHaveAccessibleDescription(/Even the tallest stem/);
    fireEvent.change(cell('Low C cup depth'), { target: { value: 'deep' } });
    expect(cell('Low C cup depth')).toHaveAccessibleDescription(/Type a length/);
  });

  it('saves only the measured keys as typed, and shows the server’s field errors by the cell', async () => {
    const { sent } = renderScreen(workspace(), () => ({ status: 400, body: { error: { code: 'invalid_request', message: 'Some readings need attention.', fields: { 'entries.0.cupDepth': 'Depth checked on the server.' } } } }));
    await screen.findByRole('heading', { name: 'Pad map · Job 1042' });
    fireEvent.change(cell('Low C cup diameter'), { target: { value: '30.5mm' } });
    fireEvent.change(cell('Low C cup depth'), { target: { value: '4' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save pad map' }));
    await screen.findByText('Some readings need attention.');
    expect(sent).toEqual([
      { unitSystem: 'mm', catalogItemId: 'svc-1', entries: [{ keyId: 'low_c', keyName: null, padKind: 'self_leveling', floor: 'flat', cupDiameter: '30.5mm', cupDepth: '4', rimDiameter: '' }] },
    ]);
    expect(cell('Low C cup depth')).toHaveAccessibleDescription(/Depth checked on the server/);
  });

  it('offers the network’s medians for a serial never mapped', async () => {
    renderScreen(workspace());
    await screen.findByText(/median of 2 maps of Quillfield QA-2/);
    expect(within(rowOf('Low C cup diameter')).getByText('Network: 30.0 mm pad · 2 maps')).toBeInTheDocument();
    fireEvent.click(screen.getByRole('button', { name: 'Fill empty cups from the suggestions' }));
    expect(cell('Low C cup diameter').value).toBe('30.5mm');
    expect(cell('Low B cup diameter').value).toBe('');
  });

  it('shows the cautions in the glue step, deferring to the data sheet, codes and licensed practice', async () => {
    renderScreen(workspace());
    const checklist = await screen.findByRole('region', { name: 'Install checklist' });
    const safety = within(checklist).getByRole('note', { name: 'Safety cautions' });
    expect(safety.closest('li')).toHaveTextContent(/Glue only the stem/);
    expect(safety).toHaveTextContent(/Cyanoacrylate bonds skin/);
    expect(safety).toHaveTextContent(/strip lacquer/);
    expect(safety).toHaveTextContent(/Heat or open flame/);
    expect(safety).toHaveTextContent(/Removing old pads and cleaning pad cups/);
    expect(safety).toHaveTextContent(/eye protection/);
    expect(safety).toHaveTextContent(/safety data sheet, local codes and licensed practice/);
  });

  it('is read only for someone who may not record it', async () => {
    renderScreen(workspace({ can: { edit: false, requestParts: false } }));
    await screen.findByText(/You can read this pad map/);
    expect(screen.queryByRole('button', { name: 'Save pad map' })).not.toBeInTheDocument();
    expect(cell('Low C cup diameter')).toHaveAttribute('readonly');
  });

  it('after saving, shows the reservation, the shortage and a one-click request to the nearest shop', async () => {
    const saved = workspace({
      padMap: { id: 'pm-1', instrumentId: 'inst-1', jobId: 'job-1', jobNumber: 1042, shopId: shop.id, shopName: shop.name, unitSystem: 'mm', entries: [{ keyId: 'low_c', keyName: null, padKind: 'self_leveling', floor: 'flat', cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: null, typed: { cupDiameter: '30.5', cupDepth: '4' } }, { keyId: 'low_cs', keyName: null, padKind: 'self_leveling', floor: 'flat', cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: null, typed: { cupDiameter: '30.5', cupDepth: '4' } }], results: [], createdBy: 'Wren Okafor', createdAt: '2026-01-01T00:00:00Z', updatedAt: '2026-01-01T00:00:00Z' },
      parts: [{ partId: 'self_leveling-30', sku: 'PAD-S-30.0', name: 'Pad 30', padKind: 'self_leveling', diameterMm: 30, thicknessMm: 3.6, quantity: 2, onHand: 1, reservedAtShop: 2, shortfall: 1, uncovered: 1, requested: [], source: { shopId: 'shop-2', shopName: 'Mill Lane Woodwinds', free: 4, distanceKm: 232, relayRun: true, coversAll: true } }],
    });
    renderScreen(saved);
    const parts = await screen.findByRole('region', { name: 'Parts list' });
    expect(within(parts).getByText('Reserved 2')).toBeInTheDocument();
    expect(within(parts).getByText('Short 1')).toBeInTheDocument();
    expect(within(parts).getByText(/Mill Lane Woodwinds has 4 · 232 km · relay run/)).toBeInTheDocument();
    expect(within(parts).getByRole('button', { name: 'Request 1 from Mill Lane Woodwinds' })).toBeInTheDocument();
    // a change not yet saved shows the shelf instead of a reservation that would be out of date
    fireEvent.change(cell('Low B cup diameter'), { target: { value: '30.5' } });
    await waitFor(() => expect(within(parts).queryByText('Reserved 2')).not.toBeInTheDocument());
    expect(within(parts).getByText(/Short 2 \(1 free\)/)).toBeInTheDocument();
  });
});
