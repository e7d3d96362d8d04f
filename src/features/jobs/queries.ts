import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { BenchJob, BoardResponse, CatalogItemDto, JobDetail, PersonRef } from '@shared/jobs/dto';
import type { JobStage } from '@shared/domain';

/** Filters of the job board as they sit in the address bar (all strings, `shop` always present). */
export interface BoardParams {
  shop: string;
  stage?: string;
  technician?: string;
  skill?: string;
  family?: string;
  overdue?: string;
  sort?: string;
  dir?: string;
  page?: string;
  pageSize?: string;
}

export const jobKeys = {
  all: ['jobs'] as const,
  boards: () => [...jobKeys.all, 'board'] as const,
  board: (params: BoardParams) => [...jobKeys.boards(), params] as const,
  mine: () => [...jobKeys.all, 'mine'] as const,
  details: () => [...jobKeys.all, 'detail'] as const,
  detail: (jobId: string) => [...jobKeys.details(), jobId] as const,
  catalog: (family?: string, includeInactive = false) => [...jobKeys.all, 'catalog', { family, includeInactive }] as const,
};

const toQuery = (params: object) => {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value !== undefined && value !== '') search.set(key, String(value));
  return search.toString();
};

export function boardQueryOptions(params: BoardParams) {
  return queryOptions({
    queryKey: jobKeys.board(params),
    queryFn: ({ signal }) => api.get<BoardResponse>(`/api/jobs?${toQuery(params)}`, signal),
    // keep the last page on screen while the next filter loads, instead of flashing a spinner
    placeholderData: keepPreviousData,
  });
}

export function myBenchQueryOptions() {
  return queryOptions({
    queryKey: jobKeys.mine(),
    queryFn: ({ signal }) => api.get<{ jobs: BenchJob[] }>('/api/jobs/mine', signal),
    select: (data) => data.jobs,
  });
}

export function jobQueryOptions(jobId: string) {
  return queryOptions({
    queryKey: jobKeys.detail(jobId),
    queryFn: ({ signal }) => api.get<JobDetail>(`/api/jobs/${jobId}`, signal),
  });
}

export function catalogQueryOptions(family?: string, includeInactive = false) {
  return queryOptions({
    queryKey: jobKeys.catalog(family, includeInactive),
    queryFn: ({ signal }) =>
      api.get<{ items: CatalogItemDto[]; skills: PersonRef[] }>(
        `/api/service-catalog?${toQuery({ family, includeInactive: includeInactive ? 'true' : undefined })}`,
        signal,
      ),
    staleTime: 5 * 60_000,
  });
}

/**
 * Every change to a job answers with the whole job page, which goes straight into the cache;
 * boards and my bench are refreshed because stage, promise or assignee may have moved.
 */
export function useJobMutation<TVariables>(jobId: string, request: (variables: TVariables) => Promise<JobDetail>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    onSuccess: (detail) => {
      queryClient.setQueryData(jobKeys.detail(jobId), detail);
      void queryClient.invalidateQueries({ queryKey: jobKeys.boards() });
      void queryClient.invalidateQueries({ queryKey: jobKeys.mine() });
    },
  });
}

export const jobApi = {
  move: (jobId: string, to: JobStage, note?: string) => api.post<JobDetail>(`/api/jobs/${jobId}/stage`, { to, note }),
  update: (jobId: string, body: object) => api.patch<JobDetail>(`/api/jobs/${jobId}`, body),
  addLine: (jobId: string, body: object) => api.post<JobDetail>(`/api/jobs/${jobId}/line-items`, body),
  updateLine: (jobId: string, itemId: string, body: object) => api.patch<JobDetail>(`/api/jobs/${jobId}/line-items/${itemId}`, body),
  removeLine: (jobId: string, itemId: string) => api.delete<JobDetail>(`/api/jobs/${jobId}/line-items/${itemId}`),
  approve: (jobId: string, body: object) => api.post<JobDetail>(`/api/jobs/${jobId}/approval`, body),
  sendEstimate: (jobId: string) => api.post<JobDetail>(`/api/jobs/${jobId}/estimate/send`, {}),
  issueCustomerLink: (jobId: string) => api.post<{ url: string }>(`/api/jobs/${jobId}/customer-link`, {}),
  updateCustomer: (jobId: string, body: object) => api.patch<JobDetail>(`/api/jobs/${jobId}/customer`, body),
  revokeCustomerLinks: (jobId: string) => api.delete<JobDetail>(`/api/jobs/${jobId}/customer-link`),
  logTime: (jobId: string, body: object) => api.post<JobDetail>(`/api/jobs/${jobId}/time-logs`, body),
  removeTime: (jobId: string, logId: string) => api.delete<JobDetail>(`/api/jobs/${jobId}/time-logs/${logId}`),
  createCatalogItem: (body: object) => api.post<{ item: CatalogItemDto }>('/api/service-catalog', body),
  updateCatalogItem: (itemId: string, body: object) => api.patch<{ item: CatalogItemDto }>(`/api/service-catalog/${itemId}`, body),
};
