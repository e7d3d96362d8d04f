import { queryOptions } from '@tanstack/react-query';
import type { ListAnswer, OverdueJob, ReportJob, TransferInFlight } from '@shared/reports/schemas';
import type { JobListFilters } from '@shared/reports/links';
import { api } from '@/lib/api-client';

const qs = (params: Record<string, string | number | undefined>) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== '') q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : '';
};

export const reportKeys = {
  all: ['reports'] as const,
  overdue: (shop?: string) => [...reportKeys.all, 'overdue', shop ?? 'all'] as const,
  transfers: (shop?: string) => [...reportKeys.all, 'transfers', shop ?? 'all'] as const,
  jobs: (filters: JobListFilters) => [...reportKeys.all, 'jobs', filters] as const,
};

export function overdueQueryOptions(shop?: string) {
  return queryOptions({
    queryKey: reportKeys.overdue(shop),
    queryFn: ({ signal }) => api.get<ListAnswer<OverdueJob>>(`/api/reports/overdue${qs({ shop })}`, signal),
  });
}

export function transfersQueryOptions(shop?: string) {
  return queryOptions({
    queryKey: reportKeys.transfers(shop),
    queryFn: ({ signal }) => api.get<ListAnswer<TransferInFlight> & { late: number }>(`/api/reports/transfers${qs({ shop })}`, signal),
  });
}

export function jobsQueryOptions(filters: JobListFilters) {
  return queryOptions({
    queryKey: reportKeys.jobs(filters),
    queryFn: ({ signal }) =>
      api.get<ListAnswer<ReportJob>>(`/api/reports/jobs${qs({ ...filters })}`, signal),
  });
}
