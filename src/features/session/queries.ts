import { queryOptions, useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { assignLocation } from '@/lib/browser';
import type { Me } from './types';

export const sessionKeys = {
  all: ['session'] as const,
  me: () => [...sessionKeys.all, 'me'] as const,
};

export function meQueryOptions() {
  return queryOptions({
    queryKey: sessionKeys.me(),
    queryFn: ({ signal }) => api.get<Me>('/api/me', signal),
    // Who is signed in changes rarely; a focus refetch still notices a sign-out in another tab.
    staleTime: 5 * 60_000,
  });
}

/** Only relative paths inside the app may come back after sign-in; anything else is dropped. */
export function safeReturnTo(value: string | null | undefined): string | undefined {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return undefined;
  if (value.startsWith('/auth/') || value === '/sign-in' || value.startsWith('/sign-in?')) return undefined;
  return value;
}

export function signInHref(returnTo?: string | null): string {
  const safe = safeReturnTo(returnTo);
  return safe && safe !== '/' ? `/auth/login?returnTo=${encodeURIComponent(safe)}` : '/auth/login';
}

export function useSignOut() {
  return useMutation({
    mutationFn: () => api.post<{ redirectTo?: string }>('/auth/logout'),
    onSuccess: ({ redirectTo }) => {
      // A full page load drops every cached query of the signed-out user along with the page.
      assignLocation(redirectTo || '/sign-in');
    },
  });
}
