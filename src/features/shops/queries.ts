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

/** The bodies of the Shops API (server/modules/networks). */
import type { ClosingDayView as ClosingDay, ShopSkillView as ShopSkill, ShopView as Shop } from '@shared/schemas/shops';
export type { ClosingDay, ShopSkill, Shop };


export interface RelayRun {
  id: string;
  fromShopId: string;
  fromShopName: string | null;
  toShopId: string;
  toShopName: string | null;
  weekdays: number[];
  departureTime: string;
  transitHours: number;
  active: boolean;
}

export interface ShopDetail extends Shop {
  technicians: Array<{
    userId: string;
    name: string;
    email: string | null;
    active: boolean;
    skills: Array<{ skillId: string; name: string; weeklyHours: number }>;
  }>;
  relayRuns: RelayRun[];
}

export interface Skill {
  id: string;
  code: string;
  name: string;
}

export const shopAdminKeys = {
  list: () => [...shopKeys.all, 'list'] as const,
  detail: (id: string) => [...shopKeys.all, 'detail', id] as const,
  closingDays: (id: string) => [...shopKeys.all, 'closing-days', id] as const,
  skills: () => [...shopKeys.all, 'skills'] as const,
  relayRuns: () => [...shopKeys.all, 'relay-runs'] as const,
};

export function shopsQueryOptions() {
  return queryOptions({
    queryKey: shopAdminKeys.list(),
    queryFn: ({ signal }) => api.get<{ shops: Shop[] }>('/api/shops', signal),
    select: (data) => data.shops,
  });
}

export function shopQueryOptions(id: string) {
  return queryOptions({
    queryKey: shopAdminKeys.detail(id),
    queryFn: ({ signal }) => api.get<{ shop: ShopDetail }>(`/api/shops/${encodeURIComponent(id)}`, signal),
    select: (data) => data.shop,
  });
}

export function skillsQueryOptions() {
  return queryOptions({
    queryKey: shopAdminKeys.skills(),
    queryFn: ({ signal }) => api.get<{ skills: Skill[] }>('/api/skills', signal),
    select: (data) => data.skills,
  });
}

/** The owner's closing days of a shop, oldest first. */
export function closingDaysQueryOptions(shopId: string) {
  return queryOptions({
    queryKey: shopAdminKeys.closingDays(shopId),
    queryFn: ({ signal }) => api.get<{ closingDays: ClosingDay[] }>(`/api/shops/${encodeURIComponent(shopId)}/closing-days`, signal),
    select: (data) => data.closingDays,
  });
}
