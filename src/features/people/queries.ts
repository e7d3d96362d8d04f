import { infiniteQueryOptions, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationCreate, MembershipUpdate, PersonUpdate, RoleAssignment } from '@shared/schemas/people';
import { api } from '@/lib/api-client';
import type { AuditPage, InvitationPreview, InvitationSummary, Person } from './types';

export interface PeopleFilters {
  q?: string;
  status?: 'active' | 'inactive' | 'all';
}

export interface AuditFilters {
  entity?: string;
  entityId?: string;
  action?: string;
  personId?: string;
  shopId?: string;
  /** Instants (ISO), the viewer's midnights: from inclusive, to exclusive. */
  from?: string;
  to?: string;
}

export const peopleKeys = {
  all: ['people'] as const,
  lists: () => [...peopleKeys.all, 'list'] as const,
  list: (filters: PeopleFilters) => [...peopleKeys.lists(), filters] as const,
  detail: (id: string) => [...peopleKeys.all, 'detail', id] as const,
  invitations: () => [...peopleKeys.all, 'invitations'] as const,
  preview: (token: string) => [...peopleKeys.all, 'invitation-preview', token] as const,
  audit: (filters: AuditFilters) => [...peopleKeys.all, 'audit', filters] as const,
};

const query = (params: Record<string, string | undefined>) => {
  const search = new URLSearchParams(Object.entries(params).filter((e): e is [string, string] => !!e[1]));
  const text = search.toString();
  return text ? `?${text}` : '';
};

export function peopleQueryOptions(filters: PeopleFilters = {}) {
  return queryOptions({
    queryKey: peopleKeys.list(filters),
    queryFn: ({ signal }) => api.get<{ people: Person[] }>(`/api/people${query({ q: filters.q, status: filters.status })}`, signal),
    select: (data) => data.people,
  });
}

export function personQueryOptions(id: string) {
  return queryOptions({
    queryKey: peopleKeys.detail(id),
    queryFn: ({ signal }) => api.get<{ person: Person }>(`/api/people/${encodeURIComponent(id)}`, signal),
    select: (data) => data.person,
  });
}

export function invitationsQueryOptions() {
  return queryOptions({
    queryKey: peopleKeys.invitations(),
    queryFn: ({ signal }) => api.get<{ invitations: InvitationSummary[] }>('/api/invitations', signal),
    select: (data) => data.invitations,
  });
}

export function invitationPreviewQueryOptions(token: string) {
  return queryOptions({
    queryKey: peopleKeys.preview(token),
    queryFn: ({ signal }) => api.get<{ invitation: InvitationPreview }>(`/api/invitations/preview/${encodeURIComponent(token)}`, signal),
    select: (data) => data.invitation,
    retry: false,
  });
}

export function auditLogQueryOptions(filters: AuditFilters = {}) {
  return infiniteQueryOptions({
    queryKey: peopleKeys.audit(filters),
    queryFn: ({ signal, pageParam }) =>
      api.get<AuditPage>(
        `/api/audit-log${query({
          entity: filters.entity, entityId: filters.entityId, action: filters.action, personId: filters.personId,
          shopId: filters.shopId, from: filters.from, to: filters.to, cursor: pageParam || undefined,
        })}`,
        signal,
      ),
    initialPageParam: '',
    getNextPageParam: (last) => last.nextCursor ?? undefined,
  });
}

/** After any change to people or roles, every people view (and the audit log) may be stale. */
function useInvalidatePeople() {
  const client = useQueryClient();
  return () => client.invalidateQueries({ queryKey: peopleKeys.all });
}

export function useUpdatePerson(id: string) {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (input: PersonUpdate) => api.patch<{ person: Person }>(`/api/people/${id}`, input),
    onSuccess: invalidate,
  });
}

export function useAssignRole(personId: string) {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (input: RoleAssignment) => api.post<{ person: Person }>(`/api/people/${personId}/memberships`, input),
    onSuccess: invalidate,
  });
}

export function useChangeRole() {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: ({ membershipId, ...input }: MembershipUpdate & { membershipId: string }) =>
      api.patch<{ person: Person }>(`/api/memberships/${membershipId}`, input),
    onSuccess: invalidate,
  });
}

export function useRemoveRole() {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (membershipId: string) => api.delete<{ person: Person }>(`/api/memberships/${membershipId}`),
    onSuccess: invalidate,
  });
}

export function useSetActive(personId: string) {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (active: boolean) => api.post<unknown>(`/api/people/${personId}/${active ? 'reactivate' : 'deactivate'}`),
    onSuccess: invalidate,
  });
}

export function useInvite() {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (input: InvitationCreate) => api.post<{ invitation: InvitationSummary; mailed: boolean }>('/api/invitations', input),
    onSuccess: invalidate,
  });
}

export function useRevokeInvitation() {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (id: string) => api.delete<{ invitation: InvitationSummary }>(`/api/invitations/${id}`),
    onSuccess: invalidate,
  });
}

export function useResendInvitation() {
  const invalidate = useInvalidatePeople();
  return useMutation({
    mutationFn: (id: string) => api.post<{ invitation: InvitationSummary; mailed: boolean }>(`/api/invitations/${id}/resend`),
    onSuccess: invalidate,
  });
}

/** Accepting changes who is signed in, so every cached answer belongs to someone else now. */
export function useAcceptInvitation() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (token: string) => api.post<{ accepted: boolean }>('/api/invitations/accept', { token }),
    onSuccess: () => client.clear(),
  });
}
