import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { InstrumentSearchInput, IntakeInput, ImportBatchInput, TimelineFilter, CustomerInput } from '@shared/schemas/registry';
import { api } from '@/lib/api-client';
import type {
  CustomerView,
  ImportBatchResult,
  InstrumentDetail,
  InstrumentHit,
  IntakeResult,
  SerialCheck,
  TimelineItem,
} from './types';

export type SearchParams = Pick<InstrumentSearchInput, 'q' | 'family' | 'shopId' | 'status' | 'ownerCustomerId' | 'limit'>;

/** Drops empty values so equal searches share one cache entry and one address. */
export function searchQueryString(params: SearchParams): string {
  const out = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    const text = typeof value === 'string' || typeof value === 'number' ? String(value).trim() : '';
    if (text !== '') out.set(key, text);
  }
  return out.toString();
}

export const registryKeys = {
  all: ['registry'] as const,
  searches: () => [...registryKeys.all, 'search'] as const,
  search: (params: SearchParams) => [...registryKeys.searches(), searchQueryString(params)] as const,
  instruments: () => [...registryKeys.all, 'instrument'] as const,
  instrument: (id: string) => [...registryKeys.instruments(), id] as const,
  timeline: (id: string, kinds: readonly TimelineFilter[]) => [...registryKeys.instrument(id), 'timeline', [...kinds].sort().join(',')] as const,
  serialCheck: (serial: string, maker: string) => [...registryKeys.all, 'serial-check', serial, maker] as const,
  customers: () => [...registryKeys.all, 'customers'] as const,
  customerSearch: (q: string) => [...registryKeys.customers(), q] as const,
};

export function instrumentSearchQueryOptions(params: SearchParams) {
  const qs = searchQueryString(params);
  return queryOptions({
    queryKey: registryKeys.search(params),
    queryFn: ({ signal }) => api.get<{ results: InstrumentHit[] }>(`/api/instruments/search?${qs}`, signal),
    select: (data) => data.results,
    // while typing, the previous answer stays on screen until the next one arrives
    placeholderData: keepPreviousData,
    staleTime: 10_000,
  });
}

export const exportUrl = (params: SearchParams) => `/api/instruments/export.csv?${searchQueryString({ ...params, limit: undefined })}`;

export function instrumentQueryOptions(id: string) {
  return queryOptions({
    queryKey: registryKeys.instrument(id),
    queryFn: ({ signal }) => api.get<InstrumentDetail>(`/api/instruments/${encodeURIComponent(id)}`, signal),
  });
}

export function timelineQueryOptions(id: string, kinds: readonly TimelineFilter[]) {
  const qs = kinds.length ? `?kinds=${kinds.join(',')}` : '';
  return queryOptions({
    queryKey: registryKeys.timeline(id, kinds),
    queryFn: ({ signal }) => api.get<{ items: TimelineItem[] }>(`/api/instruments/${encodeURIComponent(id)}/timeline${qs}`, signal),
    select: (data) => data.items,
    placeholderData: keepPreviousData,
  });
}

export function serialCheckQueryOptions(serial: string, maker: string) {
  const qs = new URLSearchParams({ serial, maker }).toString();
  return queryOptions({
    queryKey: registryKeys.serialCheck(serial, maker),
    queryFn: ({ signal }) => api.get<SerialCheck>(`/api/instruments/serial-check?${qs}`, signal),
    enabled: serial.trim().length > 0,
  });
}

export function customerSearchQueryOptions(q: string) {
  return queryOptions({
    queryKey: registryKeys.customerSearch(q),
    queryFn: ({ signal }) => api.get<{ customers: CustomerView[] }>(`/api/customers?q=${encodeURIComponent(q)}`, signal),
    select: (data) => data.customers,
    placeholderData: keepPreviousData,
  });
}

export const registryMutations = {
  intake: (input: IntakeInput) => api.post<IntakeResult>('/api/intake', input),
  createCustomer: (input: CustomerInput & { shopId: string }) => api.post<{ customer: CustomerView }>('/api/customers', input),
  importBatch: (input: ImportBatchInput) => api.post<ImportBatchResult>('/api/instruments/import', input),
  setHeavyCase: (id: string, heavyCase: boolean) => api.patch<InstrumentDetail>(`/api/instruments/${encodeURIComponent(id)}/heavy-case`, { heavyCase }),
};
