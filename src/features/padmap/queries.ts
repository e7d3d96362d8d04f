import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SavePadMapInput } from '@shared/padmap/entries';
import type { PadRules } from '@shared/padmap/rules';
import type { PadMapWorkspace, SavedPadMap } from './types';

export const padMapKeys = {
  all: ['padmap'] as const,
  workspaces: () => [...padMapKeys.all, 'job'] as const,
  workspace: (jobId: string) => [...padMapKeys.workspaces(), jobId] as const,
  rules: () => [...padMapKeys.all, 'rules'] as const,
};

export function padMapWorkspaceQueryOptions(jobId: string) {
  return queryOptions({
    queryKey: padMapKeys.workspace(jobId),
    queryFn: ({ signal }) => api.get<PadMapWorkspace>(`/api/jobs/${encodeURIComponent(jobId)}/pad-map`, signal),
    // the screen holds the technician's typing; a refetch on focus must not look like a change under them
    refetchOnWindowFocus: false,
  });
}

export function padRulesQueryOptions() {
  return queryOptions({
    queryKey: padMapKeys.rules(),
    queryFn: ({ signal }) => api.get<{ rules: PadRules; defaults: PadRules }>('/api/pad-rules', signal),
  });
}

export function useSavePadMap(jobId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: SavePadMapInput) => api.put<SavedPadMap>(`/api/jobs/${encodeURIComponent(jobId)}/pad-map`, input),
    onSuccess: (data) => {
      const { saved: _saved, ...workspace } = data;
      client.setQueryData(padMapKeys.workspace(jobId), workspace);
    },
  });
}

export function useRequestParts(jobId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { partId: string; fromShopId: string; toShopId: string; quantity: number }) =>
      api.post<{ created: boolean }>('/api/stock/part-transfers', { ...input, jobId }),
    onSettled: () => client.invalidateQueries({ queryKey: padMapKeys.workspace(jobId) }),
  });
}

export function useSavePadRules() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (rules: PadRules) => api.put<{ rules: PadRules; defaults: PadRules }>('/api/pad-rules', rules),
    onSuccess: (data) => {
      client.setQueryData(padMapKeys.rules(), data);
      void client.invalidateQueries({ queryKey: padMapKeys.workspaces() });
    },
  });
}
