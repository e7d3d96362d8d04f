import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Hazard } from '@shared/safety/hazards';
import type { PartTransferView, StockFilters, StockPage } from './types';

export const stockKeys = {
  all: ['stock'] as const,
  shops: () => [...stockKeys.all, 'shop'] as const,
  shop: (shopId: string, filters: StockFilters) => [...stockKeys.shops(), shopId, filters] as const,
};

export function stockQueryOptions(shopId: string, filters: StockFilters) {
  const params = new URLSearchParams({ shopId });
  if (filters.kind) params.set('kind', filters.kind);
  if (filters.attention) params.set('attention', 'true');
  if (filters.q?.trim()) params.set('q', filters.q.trim());
  return queryOptions({
    queryKey: stockKeys.shop(shopId, filters),
    queryFn: ({ signal }) => api.get<StockPage>(`/api/stock?${params.toString()}`, signal),
    placeholderData: keepPreviousData,
  });
}

export function useAdjustStock(shopId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { partId: string; onHand?: number; reorderPoint?: number }) =>
      api.patch(`/api/stock/${encodeURIComponent(shopId)}/parts/${encodeURIComponent(input.partId)}`, { onHand: input.onHand, reorderPoint: input.reorderPoint }),
    onSettled: () => client.invalidateQueries({ queryKey: stockKeys.all }),
  });
}

/** The owner's hazard tags on a part (network-wide, like the service catalog). */
export function useSetPartHazards() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { partId: string; hazards: Hazard[] }) =>
      api.put(`/api/parts/${encodeURIComponent(input.partId)}/hazards`, { hazards: input.hazards }),
    onSettled: () => client.invalidateQueries({ queryKey: stockKeys.all }),
  });
}

export function useRequestTransfer() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { partId: string; fromShopId: string; toShopId: string; quantity: number }) =>
      api.post<{ transfer: PartTransferView; created: boolean }>('/api/stock/part-transfers', input),
    onSettled: () => client.invalidateQueries({ queryKey: stockKeys.all }),
  });
}

export function useTransferStep() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, step }: { id: string; step: 'send' | 'receive' | 'cancel' }) =>
      api.post<{ transfer: PartTransferView }>(`/api/stock/part-transfers/${encodeURIComponent(id)}/${step}`),
    onSettled: () => client.invalidateQueries({ queryKey: stockKeys.all }),
  });
}
