import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { CustomerDecisionInput, PublicJobView } from '@shared/customers/public-page';

/** The customer's page of one job, reached by the token in their link (no session). */
export const customerPageKeys = {
  all: ['customer-page'] as const,
  job: (token: string) => [...customerPageKeys.all, token] as const,
};

export function publicJobQueryOptions(token: string) {
  return queryOptions({
    queryKey: customerPageKeys.job(token),
    queryFn: ({ signal }) => api.get<PublicJobView>(`/api/public/jobs/${encodeURIComponent(token)}`, signal),
    // a link that does not open is not worth asking again and again
    retry: false,
  });
}

export function useCustomerDecision(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CustomerDecisionInput) => api.post<PublicJobView>(`/api/public/jobs/${encodeURIComponent(token)}/decision`, body),
    onSuccess: (view) => queryClient.setQueryData(customerPageKeys.job(token), view),
  });
}
