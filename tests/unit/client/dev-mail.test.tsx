// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, describe, expect, it, vi, beforeAll } from 'vitest';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import { requestUrl } from '../../helpers/request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

// The development mail page only reads `GET /api/dev/mail`; a fake fetch answers it here, while the
// catcher behind the endpoint is tested against real SMTP elsewhere.
function renderDevMail(path: string, answer: { status: number; body: unknown }) {
  const fetchMock = vi.fn((input: RequestInfo | URL) => {
    const { pathname } = requestUrl(input);
    const { status, body } =
      pathname === '/api/dev/mail' ? answer : { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
    return Promise.resolve(new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } }));
  });
  vi.stubGlobal('fetch', fetchMock);
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProviders queryClient={createQueryClient()}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return { router, fetchMock };
}

const invitation = {
  id: 'm-older',
  receivedAt: '2025-03-04T09:15:00.000Z',
  from: 'Benchrelay <no-reply@benchrelay.test>',
  to: ['ines.barros@example.test'],
  subject: 'You are invited to Tidewater Band Repair',
  text: 'Hello Ines,\n\nAccept your invitation: http://localhost:3000/invitations/abc123\n\nSee you at the bench.',
  html: '<p>Hello Ines,</p><p><a href="http://localhost:3000/invitations/abc123">Accept your invitation</a></p><script>parent.alert(1)</script>',
};

const transferNotice = {
  id: 'm-newer',
  receivedAt: '2025-03-05T16:40:00.000Z',
  from: 'Benchrelay <no-reply@benchrelay.test>',
  to: ['harbour.desk@example.test', 'mill.desk@example.test'],
  subject: 'Incoming transfer: baritone saxophone',
  text: 'A baritone saxophone is on the next relay run to your shop.',
  // what the catcher stores for a message with no HTML part (docker-free-dev/mail-catcher.ts)
  html: null,
};

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('development mail page', () => {
  it('lists caught messages newest first', async () => {
    renderDevMail('/dev/mail', { status: 200, body: { messages: [invitation, transferNotice] } });
    expect(await screen.findByRole('heading', { level: 1, name: 'Caught e-mail' })).toBeInTheDocument();
    const links = await screen.findAllByRole('link', { name: /Incoming transfer|You are invited/ });
    expect(links.map((link) => link.textContent)).toEqual([
      expect.stringContaining('Incoming transfer: baritone saxophone'),
      expect.stringContaining('You are invited to Tidewater Band Repair'),
    ]);
    expect(screen.getByRole('heading', { name: 'Pick a message' })).toBeInTheDocument();
  });

  it('opens a message: text with clickable links, HTML only in an empty sandbox', async () => {
    const { router } = renderDevMail('/dev/mail', { status: 200, body: { messages: [invitation, transferNotice] } });
    fireEvent.click(await screen.findByRole('link', { name: /You are invited/ }));

    const reader = await screen.findByRole('article', { name: 'You are invited to Tidewater Band Repair' });
    expect(router.state.location.search).toBe('?message=m-older');
    expect(within(reader).getByText('ines.barros@example.test')).toBeInTheDocument();
    expect(within(reader).getByText(/See you at the bench/)).toBeInTheDocument();
    expect(within(reader).getByRole('link', { name: 'http://localhost:3000/invitations/abc123' })).toHaveAttribute(
      'href',
      'http://localhost:3000/invitations/abc123',
    );

    fireEvent.click(within(reader).getByRole('button', { name: 'HTML' }));
    const frame = within(reader).getByTitle('HTML version of “You are invited to Tidewater Band Repair”');
    expect(frame.tagName).toBe('IFRAME');
    // no scripts and not this page's origin; links may only open a new tab, outside the sandbox
    const sandbox = (frame.getAttribute('sandbox') ?? '').split(/\s+/).filter(Boolean).sort();
    expect(sandbox).toEqual(['allow-popups', 'allow-popups-to-escape-sandbox']);
    const srcdoc = frame.getAttribute('srcdoc') ?? '';
    expect(srcdoc).toContain('Accept your invitation');
    expect(srcdoc).toMatch(/<head><base target="_blank"><\/head>/);
  });

  it('offers no HTML view for a text-only message', async () => {
    renderDevMail('/dev/mail?message=m-newer', { status: 200, body: { messages: [invitation, transferNotice] } });
    const reader = await screen.findByRole('article', { name: 'Incoming transfer: baritone saxophone' });
    expect(within(reader).getByText('harbour.desk@example.test, mill.desk@example.test')).toBeInTheDocument();
    expect(within(reader).queryByRole('button', { name: 'HTML' })).not.toBeInTheDocument();
    expect(within(reader).getByText('A baritone saxophone is on the next relay run to your shop.')).toBeInTheDocument();
    expect(screen.queryByText('This screen stopped working')).not.toBeInTheDocument();
  });

  it('opens an HTML-only message in the frame, and a message the mail brought its own base into', async () => {
    const htmlOnly = {
      ...invitation, id: 'm-html', subject: 'Estimate ready', text: null,
      html: '<html><head><base target="_self" href="http://localhost:3000/"></head><body><a href="/jobs/1">Open</a></body></html>',
    };
    renderDevMail('/dev/mail?message=m-html', { status: 200, body: { messages: [htmlOnly] } });
    const reader = await screen.findByRole('article', { name: 'Estimate ready' });
    const frame = within(reader).getByTitle('HTML version of “Estimate ready”');
    const srcdoc = frame.getAttribute('srcdoc') ?? '';
    expect(srcdoc).toContain('<head><base target="_blank">');
    expect(srcdoc).not.toContain('target="_self"');
  });

  it('says when nothing has been caught yet', async () => {
    renderDevMail('/dev/mail', { status: 200, body: { messages: [] } });
    expect(await screen.findByRole('heading', { name: 'No e-mail caught yet' })).toBeInTheDocument();
  });

  it('explains a missing catcher (404 in production)', async () => {
    renderDevMail('/dev/mail', { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } });
    expect(await screen.findByRole('heading', { name: 'No mail catcher here' })).toBeInTheDocument();
  });
});
