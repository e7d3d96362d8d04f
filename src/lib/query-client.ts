import { QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

/** Builds a client with Benchrelay's defaults; tests make a fresh one per render. */
export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // A 4xx answer (signed out, no access, not found) will not change by asking again.
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 2;
        },
        refetchOnWindowFocus: true,
      },
      mutations: { retry: false },
    },
  });
}

export const queryClient = createQueryClient();
