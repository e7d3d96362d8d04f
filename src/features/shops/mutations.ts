import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClosingDayInput, RelayRunInput, RelayRunUpdate, ShopInput, ShopSkillsInput, SkillInput, TechnicianSkillsInput } from '@shared/schemas/shops';
import { api } from '@/lib/api-client';
import { shopKeys, type ClosingDay, type RelayRun, type ShopDetail, type Skill } from './queries';

/** Any change to shops can show on every shop view (names in switchers, summaries, relay runs). */
function useInvalidateShops() {
  const client = useQueryClient();
  return () => client.invalidateQueries({ queryKey: shopKeys.all });
}

export function useCreateShop() {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (input: ShopInput) => api.post<{ shop: ShopDetail }>('/api/shops', input), onSuccess: invalidate });
}

export function useUpdateShop(id: string) {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (input: Partial<ShopInput>) => api.patch<{ shop: ShopDetail }>(`/api/shops/${id}`, input), onSuccess: invalidate });
}

export function useSetShopSkills(id: string) {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (input: ShopSkillsInput) => api.put<{ shop: ShopDetail }>(`/api/shops/${id}/skills`, input), onSuccess: invalidate });
}

export function useSetTechnicianSkills(id: string) {
  const invalidate = useInvalidateShops();
  return useMutation({
    mutationFn: (input: TechnicianSkillsInput) => api.put<{ shop: ShopDetail }>(`/api/shops/${id}/technician-skills`, input),
    onSuccess: invalidate,
  });
}

export function useCreateSkill() {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (input: SkillInput) => api.post<{ skill: Skill }>('/api/skills', input), onSuccess: invalidate });
}

export function useCreateRelayRun() {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (input: RelayRunInput) => api.post<{ relayRun: RelayRun }>('/api/relay-runs', input), onSuccess: invalidate });
}

export function useUpdateRelayRun() {
  const invalidate = useInvalidateShops();
  return useMutation({
    mutationFn: ({ id, ...input }: RelayRunUpdate & { id: string }) => api.patch<{ relayRun: RelayRun }>(`/api/relay-runs/${id}`, input),
    onSuccess: invalidate,
  });
}

export function useRemoveRelayRun() {
  const invalidate = useInvalidateShops();
  return useMutation({ mutationFn: (id: string) => api.delete<{ removed: boolean }>(`/api/relay-runs/${id}`), onSuccess: invalidate });
}

/** Closing days also change promised dates, so job pages read the shop's days afresh too. */
function useInvalidateClosingDays() {
  const client = useQueryClient();
  return () => Promise.all([client.invalidateQueries({ queryKey: shopKeys.all }), client.invalidateQueries({ queryKey: ['jobs'] })]);
}

export function useAddClosingDay(shopId: string) {
  const invalidate = useInvalidateClosingDays();
  return useMutation({
    mutationFn: (input: ClosingDayInput) => api.post<{ closingDays: ClosingDay[] }>(`/api/shops/${shopId}/closing-days`, input),
    onSuccess: invalidate,
  });
}

export function useRemoveClosingDay(shopId: string) {
  const invalidate = useInvalidateClosingDays();
  return useMutation({
    mutationFn: (date: string) => api.delete<{ closingDays: ClosingDay[] }>(`/api/shops/${shopId}/closing-days/${encodeURIComponent(date)}`),
    onSuccess: invalidate,
  });
}
