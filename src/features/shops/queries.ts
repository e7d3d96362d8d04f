import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface ShopSummary {
  id: string;
  name: string;
  city: string;
  timeZone: string;
  openJobs: number;
  jobsByStage: Record<string, number>;
}

export const shopKeys = {
  all: ['shops'] as const,
  summary: () => [...shopKeys.all, 'summary'] as const,
};

export function shopsSummaryQueryOptions() {
  return queryOptions({
    queryKey: shopKeys.summary(),
    queryFn: ({ signal }) => api.get<{ shops: ShopSummary[] }>('/api/shops/summary', signal),
    select: (data) => data.shops,
  });
}
