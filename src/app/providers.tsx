import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { AbilityContext, emptyAbility } from '@/lib/ability';
import { queryClient as defaultQueryClient } from '@/lib/query-client';

interface AppProvidersProps {
  children: ReactNode;
  /** Tests pass a fresh client so no cached answer leaks from one test into the next. */
  queryClient?: QueryClient;
}

export function AppProviders({ children, queryClient = defaultQueryClient }: AppProvidersProps) {
  return (
    <QueryClientProvider client={queryClient}>
      {/* Signed-out screens see an ability that allows nothing; the session gate provides the real one. */}
      <AbilityContext ability={emptyAbility}>{children}</AbilityContext>
    </QueryClientProvider>
  );
}
