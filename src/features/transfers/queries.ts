import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { TransferView } from '@shared/transfers';
import type { Recommendation, RequestableJob, StepAccepted, TransferAction, TransferDetail, TransferSummary } from './types';

export type TransferStatusFilter = 'open' | 'closed' | 'any';

export const transferKeys = {
  all: ['transfers'] as const,
  lists: () => [...transferKeys.all, 'list'] as const,
  list: (view: TransferView, shopId: string | undefined, status: TransferStatusFilter) =>
    [...transferKeys.lists(), { view, shopId, status }] as const,
  details: () => [...transferKeys.all, 'detail'] as const,
  detail: (id: string) => [...transferKeys.details(), id] as const,
  recommendation: (jobId: string, skillId: string | undefined) => [...transferKeys.all, 'recommendation', { jobId, skillId }] as const,
  requestableJobs: (shopId: string) => [...transferKeys.all, 'requestable-jobs', shopId] as const,
};

const query = (params: Record<string, string | undefined>) => {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value) search.set(key, value);
  return search.toString();
};

export function transferListQueryOptions(view: TransferView, shopId: string | undefined, status: TransferStatusFilter) {
  return queryOptions({
    queryKey: transferKeys.list(view, shopId, status),
    queryFn: ({ signal }) =>
      api.get<{ transfers: TransferSummary[] }>(`/api/transfers?${query({ view, shopId, status })}`, signal),
    select: (data) => data.transfers,
    enabled: view === 'approvals' || view === 'all' || !!shopId,
    // the board is watched while instruments move: look again now and then
    refetchInterval: 20_000,
  });
}

export function transferDetailQueryOptions(id: string) {
  return queryOptions({
    queryKey: transferKeys.detail(id),
    queryFn: ({ signal }) => api.get<{ transfer: TransferDetail }>(`/api/transfers/${id}`, signal),
    select: (data) => data.transfer,
    // a step is queued: look again every second until the worker has carried it out
    refetchInterval: (q) => (q.state.data?.transfer.pendingStep ? 1000 : false),
  });
}

export function recommendationQueryOptions(jobId: string, skillId: string | undefined) {
  return queryOptions({
    queryKey: transferKeys.recommendation(jobId, skillId),
    queryFn: ({ signal }) => api.get<Recommendation>(`/api/transfers/recommendation?${query({ jobId, skillId })}`, signal),
  });
}

export function requestableJobsQueryOptions(shopId: string) {
  return queryOptions({
    queryKey: transferKeys.requestableJobs(shopId),
    queryFn: ({ signal }) => api.get<{ jobs: RequestableJob[] }>(`/api/transfers/requestable-jobs?${query({ shopId })}`, signal),
    select: (data) => data.jobs,
  });
}

export function useRequestTransfer() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: { jobId: string; toShopId: string; reason: string }) => api.post<StepAccepted>('/api/transfers', body),
    onSuccess: () => client.invalidateQueries({ queryKey: transferKeys.all }),
  });
}

/** The worker usually finishes a step within a second; lists look again then to show it done. */
const WORKER_SETTLE_MS = 1200;

export function useTransferAction(id: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ action, body }: { action: TransferAction; body?: Record<string, unknown> }) =>
      api.post<StepAccepted>(`/api/transfers/${id}/${action}`, body ?? {}),
    onSuccess: () => {
      setTimeout(() => void client.invalidateQueries({ queryKey: transferKeys.lists() }), WORKER_SETTLE_MS);
      return Promise.all([
        client.invalidateQueries({ queryKey: transferKeys.detail(id) }),
        client.invalidateQueries({ queryKey: transferKeys.lists() }),
      ]);
    },
  });
}
