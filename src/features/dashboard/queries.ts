import { queryOptions } from '@tanstack/react-query';
import type { DashboardReport } from '@shared/reports/schemas';
import { api } from '@/lib/api-client';

export const dashboardKeys = {
  all: ['dashboard'] as const,
  /** `shop` undefined: every shop the person may see */
  figures: (shop?: string) => [...dashboardKeys.all, 'figures', shop ?? 'all'] as const,
};

export function dashboardQueryOptions(shop?: string) {
  return queryOptions({
    queryKey: dashboardKeys.figures(shop),
    queryFn: ({ signal }) =>
      api.get<DashboardReport>(`/api/reports/dashboard${shop ? `?shop=${encodeURIComponent(shop)}` : ''}`, signal),
    // figures move with the benches; a minute old is fresh enough and saves refetching on every focus
    staleTime: 60_000,
  });
}
