import { render } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { vi, beforeAll } from 'vitest';
import { AppProviders } from '@/app/providers';
import { preloadPages, routes } from '@/app/router';
import { createQueryClient } from '@/lib/query-client';
import { requestUrl } from './request-url';

// pages are lazy chunks: load their code once up front, as a warm browser cache would have it
beforeAll(() => preloadPages(), 120_000);

/**
 * Mounts the whole client at an address with a fake fetch answering per 'METHOD /path'. For client
 * tests about what the screens show and send; the server side is tested against the real app.
 */
export type Answer = { status: number; body?: unknown };
export type Answers = Record<string, Answer | ((init: { body: unknown }) => Answer | Promise<Answer>)>;

export interface SentRequest {
  method: string;
  path: string;
  search: string;
  body: unknown;
}

export function renderApp(path: string, answers: Answers) {
  const sent: SentRequest[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
      const url = requestUrl(input);
      const method = (init.method ?? 'GET').toUpperCase();
      const body = typeof init.body === 'string' ? JSON.parse(init.body) : undefined;
      sent.push({ method, path: url.pathname, search: url.search, body });
      const entry = answers[`${method} ${url.pathname}`];
      const answer = typeof entry === 'function' ? await entry({ body }) : entry;
      const { status, body: out } = answer ?? { status: 404, body: { error: { code: 'not_found', message: 'Not found' } } };
      return new Response(out === undefined ? null : JSON.stringify(out), { status, headers: { 'Content-Type': 'application/json' } });
    }),
  );
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProviders queryClient={createQueryClient()}>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return { router, sent };
}
