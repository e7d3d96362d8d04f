// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, apiRequest } from '@/lib/api-client';
import { ErrorState } from '@/components/ui/error-state';

/* A failed request keeps the server's request id, and the error screen shows it for the person to quote. */

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function answer(status: number, body: string, headers: Record<string, string> = {}) {
  vi.stubGlobal('fetch', vi.fn(() => Promise.resolve(new Response(body, { status, headers }))));
}

describe('request ids on the client', () => {
  it('reads error.requestId from the error answer', async () => {
    answer(500, JSON.stringify({ error: { code: 'internal', message: 'Something went wrong on our side.', requestId: 'req-123' } }), { 'X-Request-Id': 'req-123' });
    const error = await apiRequest('/api/jobs').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).requestId).toBe('req-123');
    expect((error as ApiError).details).toEqual({});
  });

  it('falls back to the X-Request-Id header when a proxy answered with HTML', async () => {
    answer(502, '<html>Bad gateway</html>', { 'X-Request-Id': 'edge-9' });
    const error = (await apiRequest('/api/jobs').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('server_error');
    expect(error.requestId).toBe('edge-9');
  });

  it('shows the reference on the error screen', () => {
    render(<ErrorState error={new ApiError({ status: 500, code: 'internal', message: 'Something went wrong on our side.', requestId: 'req-123' })} />);
    expect(screen.getByRole('alert')).toHaveTextContent('Reference for support: req-123');
  });
});
