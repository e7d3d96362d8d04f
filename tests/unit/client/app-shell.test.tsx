// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi, beforeAll } from 'vitest';
import { CURRENT_SHOP_STORAGE_KEY } from '@/app/current-shop';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import { assignLocation } from '@/lib/browser';
import { requestUrl } from '../../helpers/request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

// A fake fetch is enough here: these tests are about what the client shows for each answer of the
// API contract; the server side of that contract is tested against the real app elsewhere.
vi.mock('@/lib/browser', () => ({ assignLocation: vi.fn() }));

type Answer = { status: number; body?: unknown };
type Answers = Record<string, Answer | (() => Answer | Promise<Answer>)>;

interface FetchCall {
  method: string;
  path: string;
  credentials: RequestCredentials | undefined;
}

function renderApp(path: string, answers: Answers) {
  const calls: FetchCall[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = requestUrl(input);
    const method = (init.method ?? 'GET').toUpperCase();
    calls.push({ method, path: url.pathname, credentials: init.credentials });
    const entry = answers[`${method} ${url.pathname}`];
    const answer = typeof entry === 'function' ? await entry() : entry;
    const { status, body } = answer ?? { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
    return new Response(body === undefined ? null : JSON.stringify(body), {
      status,
      headers: { 'Content-Type': 'application/json' },
    });
  });
  vi.stubGlobal('fetch', fetchMock);
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const queryClient = createQueryClient();
  render(
    <AppProviders queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return { router, calls, queryClient };
}

const harbourShop = { id: 'shop-harbour', name: 'Harbour Street Bench', city: 'Halifax', timeZone: 'America/Halifax' };
const millShop = { id: 'shop-mill', name: 'Mill Lane Woodwinds', city: 'Winnipeg', timeZone: 'America/Winnipeg' };
const ridgeShop = { id: 'shop-ridge', name: 'Ridge Road Brass', city: 'Calgary', timeZone: 'America/Edmonton' };

function meBody(overrides: Partial<{ name: string; memberships: unknown[]; shops: unknown[]; rules: unknown[] }> = {}) {
  return {
    user: { id: 'user-1', email: 'wren.okafor@example.test', name: overrides.name ?? 'Wren Okafor' },
    network: { id: 'net-1', name: 'Tidewater Band Repair' },
    memberships: overrides.memberships ?? [{ shopId: null, shopName: null, role: 'owner' }],
    shops: overrides.shops ?? [harbourShop, millShop],
    rules: overrides.rules ?? [{ action: 'manage', subject: 'all' }],
  };
}

const ownerAnswers: Answers = {
  'GET /api/me': { status: 200, body: meBody() },
  'GET /api/shops/summary': {
    status: 200,
    body: {
      shops: [
        { ...harbourShop, openJobs: 14, jobsByStage: { intake: 3, on_bench: 9, waiting_for_parts: 2 } },
        { ...millShop, openJobs: 1, jobsByStage: { quality_check: 1 } },
      ],
    },
  },
};

const technicianAnswers: Answers = {
  'GET /api/me': {
    status: 200,
    body: meBody({
      name: 'Ines Barros',
      memberships: [{ shopId: millShop.id, shopName: millShop.name, role: 'technician' }],
      shops: [millShop],
      rules: [
        { action: 'read', subject: 'Job', conditions: { shopId: { $in: [millShop.id] } } },
        { action: 'update', subject: 'Job', conditions: { shopId: { $in: [millShop.id] } } },
        { action: 'read', subject: 'Instrument' },
      ],
    }),
  },
  'GET /api/shops/summary': {
    status: 200,
    body: { shops: [{ ...millShop, openJobs: 6, jobsByStage: { on_bench: 4, ready: 2 } }] },
  },
};

beforeEach(() => {
  window.localStorage.clear();
  vi.mocked(assignLocation).mockClear();
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('signed out (401 from /api/me)', () => {
  it('shows the sign-in page with a link to /auth/login that comes back to the same address', async () => {
    const { calls } = renderApp('/shops?view=all', {
      'GET /api/me': { status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in first.' } } },
    });

    expect(await screen.findByRole('heading', { name: 'Sign in to Benchrelay' })).toBeInTheDocument();
    expect(screen.getByText(/one instrument registry/i)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Sign in' })).toHaveAttribute(
      'href',
      `/auth/login?returnTo=${encodeURIComponent('/shops?view=all')}`,
    );
    expect(screen.queryByRole('navigation', { name: 'Main' })).not.toBeInTheDocument();
    expect(calls.find((call) => call.path === '/api/me')?.credentials).toBe('same-origin');
  });

  it('/sign-in links straight to /auth/login and keeps only an in-app returnTo', async () => {
    renderApp('/sign-in?returnTo=https://elsewhere.example/steal', {
      'GET /api/me': { status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in first.' } } },
    });
    expect(await screen.findByRole('link', { name: 'Sign in' })).toHaveAttribute('href', '/auth/login');
  });

  it('/sign-in?error=identity_mismatch says in plain words that another account holds this address', async () => {
    renderApp('/sign-in?error=identity_mismatch', {
      'GET /api/me': { status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in first.' } } },
    });
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('You were not signed in');
    expect(alert).toHaveTextContent('signs in to Benchrelay with a different account');
    expect(screen.getByRole('link', { name: 'Sign in' })).toHaveAttribute('href', '/auth/login');
  });

  it('/sign-in?error=email_unverified asks to confirm the address with the provider', async () => {
    renderApp('/sign-in?error=email_unverified', {
      'GET /api/me': { status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in first.' } } },
    });
    expect(await screen.findByRole('alert')).toHaveTextContent('has not confirmed that this e-mail address is yours');
  });

  it('/sign-in sends someone who is already signed in to the app', async () => {
    const { router } = renderApp('/sign-in', ownerAnswers);
    expect(await screen.findByRole('heading', { name: 'Your shops' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/');
  });
});

describe('signed in without a role (403 no_access)', () => {
  const answers: Answers = {
    'GET /api/me': {
      status: 403,
      body: { error: { code: 'no_access', message: 'No role in this network.', email: 'sol.marsh@example.test' } },
    },
    'POST /auth/logout': { status: 200, body: { redirectTo: 'http://127.0.0.1:4400/session/end' } },
  };

  it('says plainly that the e-mail has no role and to ask the owner for an invitation', async () => {
    renderApp('/', answers);
    expect(await screen.findByRole('heading', { name: 'No access yet' })).toBeInTheDocument();
    expect(screen.getByText('sol.marsh@example.test')).toBeInTheDocument();
    expect(screen.getByText(/has no role in any shop yet/)).toBeInTheDocument();
    expect(screen.getByText(/Ask your network.s owner to send an invitation/)).toBeInTheDocument();
    expect(screen.queryByRole('link', { name: 'Sign in' })).not.toBeInTheDocument();
  });

  it('signs out with POST /auth/logout and follows the redirect the server gives', async () => {
    const { calls } = renderApp('/', answers);
    fireEvent.click(await screen.findByRole('button', { name: 'Sign out' }));
    await waitFor(() => expect(assignLocation).toHaveBeenCalledWith('http://127.0.0.1:4400/session/end'));
    expect(calls).toContainEqual({ method: 'POST', path: '/auth/logout', credentials: 'same-origin' });
  });
});

describe('signed in (200 from /api/me)', () => {
  it('lists exactly the shops from /api/me in the shop switcher', async () => {
    renderApp('/', ownerAnswers);
    const switcher = await screen.findByRole('combobox', { name: 'Shop' });
    const options = within(switcher).getAllByRole('option');
    expect(options.map((option) => option.textContent)).toEqual([
      'Harbour Street Bench · Halifax',
      'Mill Lane Woodwinds · Winnipeg',
    ]);
    expect(options.map((option) => (option as HTMLOptionElement).value)).toEqual([harbourShop.id, millShop.id]);
    expect(screen.queryByRole('option', { name: new RegExp(ridgeShop.name) })).not.toBeInTheDocument();
  });

  it('opens on a shop where the person holds a role when they may read others that sort before it', async () => {
    // a regional manager reads every shop; with nothing in the address or remembered, their own shop comes up
    renderApp('/', {
      ...ownerAnswers,
      'GET /api/me': {
        status: 200,
        body: meBody({ memberships: [{ shopId: millShop.id, shopName: millShop.name, role: 'regional_manager' }], shops: [harbourShop, millShop] }),
      },
    });
    const switcher = await screen.findByRole('combobox', { name: 'Shop' });
    await waitFor(() => expect((switcher as HTMLSelectElement).value).toBe(millShop.id));
    expect(window.localStorage.getItem(CURRENT_SHOP_STORAGE_KEY)).toBe(millShop.id);
  });

  it('shows the network, the person and each shop with its open jobs and stages', async () => {
    renderApp('/', ownerAnswers);
    const harbour = await screen.findByRole('article', { name: 'Harbour Street Bench' });
    const banner = screen.getByRole('banner');
    expect(within(banner).getByText('Tidewater Band Repair')).toBeInTheDocument();
    expect(within(banner).getByText('Wren Okafor')).toBeInTheDocument();
    expect(within(banner).getByText('Owner')).toBeInTheDocument();

    expect(within(harbour).getByTestId('open-jobs')).toHaveTextContent('14');
    expect(within(harbour).getByText('open jobs')).toBeInTheDocument();
    expect(harbour).toHaveTextContent('Halifax · time zone America/Halifax');
    const harbourStages = within(harbour).getByLabelText('Jobs by stage at Harbour Street Bench');
    const terms = within(harbourStages).getAllByRole('term').map((term) => term.textContent);
    expect(terms).toEqual(['Intake', 'On bench', 'Waiting for parts']);

    const mill = screen.getByRole('article', { name: 'Mill Lane Woodwinds' });
    expect(within(mill).getByTestId('open-jobs')).toHaveTextContent('1');
    expect(within(mill).getByText('open job')).toBeInTheDocument();
    expect(within(mill).getByText('Quality check')).toBeInTheDocument();
  });

  it('shows the dashboard, reports, registry, intake, job screens, transfers, People, Shops, the service catalog, stock and pad rules in the navigation for an owner', async () => {
    renderApp('/', ownerAnswers);
    const nav = await screen.findByRole('navigation', { name: 'Main' });
    expect(within(nav).getAllByRole('link').map((link) => link.textContent)).toEqual([
      'Home', 'Dashboard', 'Reports', 'Registry', 'Intake', 'Job board', 'My bench', 'Transfers', 'People', 'Shops', 'Service catalog', 'Stock', 'Pad rules',
    ]);
  });

  it('shows a technician Home, the registry and the job screens, and hides intake and the owner screens even by address', async () => {
    renderApp('/people', technicianAnswers);
    const nav = await screen.findByRole('navigation', { name: 'Main' });
    expect(within(nav).getAllByRole('link').map((link) => link.textContent)).toEqual(['Home', 'Registry', 'Job board', 'My bench']);
    expect(within(nav).queryByRole('link', { name: 'People' })).not.toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
  });

  it('opens the People page for an owner with everyone’s roles per shop', async () => {
    renderApp('/people', {
      ...ownerAnswers,
      'GET /api/invitations': { status: 200, body: { invitations: [] } },
      'GET /api/people': {
        status: 200,
        body: {
          people: [
            {
              id: 'user-2', name: 'Tamsin Oduya', email: 'tamsin@example.test', active: true, deactivatedAt: null, lastSignInAt: null,
              createdAt: '2025-01-01T00:00:00Z',
              memberships: [
                { id: 'm1', shopId: harbourShop.id, shopName: harbourShop.name, role: 'technician' },
                { id: 'm2', shopId: millShop.id, shopName: millShop.name, role: 'front_desk' },
              ],
            },
          ],
        },
      },
    });
    expect(await screen.findByRole('heading', { level: 1, name: 'People' })).toBeInTheDocument();
    const person = await screen.findByRole('link', { name: /Tamsin Oduya/ });
    expect(within(person).getByText(`Technician at ${harbourShop.name}`)).toBeInTheDocument();
    expect(within(person).getByText(`Front desk at ${millShop.name}`)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Invite someone' })).toBeInTheDocument();
  });

  it('opens the Shops page for an owner with a row per shop', async () => {
    renderApp('/shops', ownerAnswers);
    const table = await screen.findByRole('table', { name: 'Shops of the network' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows.map((row) => within(row).getByRole('rowheader').textContent)).toEqual([harbourShop.name, millShop.name]);
    expect(within(rows[0]).getByText('14')).toBeInTheDocument();
  });

  it('shows a not-found page for an unknown address', async () => {
    renderApp('/no/such/screen', ownerAnswers);
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeInTheDocument();
  });
});

describe('current shop', () => {
  it('puts the first shop in the address when none is chosen, and remembers a switch', async () => {
    const { router } = renderApp('/', ownerAnswers);
    const switcher = await screen.findByRole('combobox', { name: 'Shop' });
    await waitFor(() => expect(router.state.location.search).toBe(`?shop=${harbourShop.id}`));
    expect(switcher).toHaveValue(harbourShop.id);

    fireEvent.change(switcher, { target: { value: millShop.id } });

    await waitFor(() => expect(router.state.location.search).toBe(`?shop=${millShop.id}`));
    expect(window.localStorage.getItem(CURRENT_SHOP_STORAGE_KEY)).toBe(millShop.id);
    expect(screen.getByRole('combobox', { name: 'Shop' })).toHaveValue(millShop.id);
    const mill = await screen.findByRole('article', { name: 'Mill Lane Woodwinds' });
    expect(within(mill).getByText('Current shop')).toBeInTheDocument();
    // Navigation keeps the shop of this tab.
    const nav = screen.getByRole('navigation', { name: 'Main' });
    expect(within(nav).getByRole('link', { name: 'People' })).toHaveAttribute('href', `/people?shop=${millShop.id}`);
  });

  it('reopens the remembered shop when the address has none', async () => {
    window.localStorage.setItem(CURRENT_SHOP_STORAGE_KEY, millShop.id);
    const { router } = renderApp('/', ownerAnswers);
    expect(await screen.findByRole('combobox', { name: 'Shop' })).toHaveValue(millShop.id);
    await waitFor(() => expect(router.state.location.search).toBe(`?shop=${millShop.id}`));
  });

  it('replaces a shop in the address that is not one of the person\u2019s shops', async () => {
    const { router } = renderApp(`/?shop=${ridgeShop.id}`, ownerAnswers);
    expect(await screen.findByRole('combobox', { name: 'Shop' })).toHaveValue(harbourShop.id);
    await waitFor(() => expect(router.state.location.search).toBe(`?shop=${harbourShop.id}`));
  });

  it('switches from a shop card too', async () => {
    const { router } = renderApp('/', ownerAnswers);
    fireEvent.click(await screen.findByRole('button', { name: 'Switch to Mill Lane Woodwinds' }));
    await waitFor(() => expect(router.state.location.search).toBe(`?shop=${millShop.id}`));
    expect(screen.queryByRole('button', { name: 'Switch to Mill Lane Woodwinds' })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Switch to Harbour Street Bench' })).toBeInTheDocument();
  });
});

describe('home page states', () => {
  it('says "No shops yet" when the summary is empty', async () => {
    renderApp('/', {
      'GET /api/me': { status: 200, body: meBody({ shops: [] }) },
      'GET /api/shops/summary': { status: 200, body: { shops: [] } },
    });
    expect(await screen.findByRole('heading', { name: 'No shops yet' })).toBeInTheDocument();
  });

  it('shows a spinner while the summary loads', async () => {
    let release: (answer: Answer) => void = () => {};
    renderApp('/', {
      ...ownerAnswers,
      'GET /api/shops/summary': () => new Promise<Answer>((resolve) => (release = resolve)),
    });
    expect(await screen.findByText('Loading your shops…')).toBeInTheDocument();
    expect(screen.getByRole('status')).toHaveTextContent('Loading your shops…');
    release(ownerAnswers['GET /api/shops/summary'] as Answer);
    expect(await screen.findByRole('article', { name: 'Harbour Street Bench' })).toBeInTheDocument();
    expect(screen.queryByRole('status')).not.toBeInTheDocument();
  });

  it('shows the server message and recovers with Try again', async () => {
    let failing = true;
    const { queryClient } = renderApp('/', {
      ...ownerAnswers,
      'GET /api/shops/summary': () =>
        failing
          ? { status: 503, body: { error: { code: 'unavailable', message: 'The database is restarting.' } } }
          : (ownerAnswers['GET /api/shops/summary'] as Answer),
    });
    // Retries with back-off are right for people, but would only slow this test down.
    queryClient.setQueryDefaults(['shops'], { retry: false });

    const alert = await screen.findByRole('alert', {}, { timeout: 5000 });
    expect(alert).toHaveTextContent('Your shops could not be loaded');
    expect(alert).toHaveTextContent('The database is restarting.');

    failing = false;
    fireEvent.click(within(alert).getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('article', { name: 'Harbour Street Bench' })).toBeInTheDocument();
  });
});

describe('development mail link', () => {
  it('appears in the footer when the development mail endpoint answers', async () => {
    renderApp('/', { ...ownerAnswers, 'GET /api/dev/mail': { status: 200, body: { messages: [] } } });
    const footer = await screen.findByRole('contentinfo');
    expect(await within(footer).findByRole('link', { name: 'Caught e-mail' })).toHaveAttribute('href', '/dev/mail');
  });

  it('stays hidden when the endpoint is missing (production)', async () => {
    const { calls } = renderApp('/', ownerAnswers);
    await screen.findByRole('article', { name: 'Harbour Street Bench' });
    await waitFor(() => expect(calls.some((call) => call.path === '/api/dev/mail')).toBe(true));
    expect(screen.queryByRole('link', { name: 'Caught e-mail' })).not.toBeInTheDocument();
  });
});
