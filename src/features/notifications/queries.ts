import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { NotificationKind } from '@shared/domain';
import type { Inbox, NotificationPreferences } from './types';

/**
 * Live updates by polling: the header asks for the unread count (one indexed count) every few seconds
 * while the tab is visible, and the open inbox asks for its list as often. Polling needs no long-lived
 * connection, so it works the same behind any proxy and with several app servers; TanStack Query stops
 * while the tab is hidden and asks again the moment it is shown.
 */
export const INBOX_POLL_MS = 10_000;

export type InboxFilter = 'all' | 'unread';

export const notificationKeys = {
  all: ['notifications'] as const,
  unread: () => [...notificationKeys.all, 'unread-count'] as const,
  lists: () => [...notificationKeys.all, 'list'] as const,
  list: (filter: InboxFilter) => [...notificationKeys.lists(), filter] as const,
  preferences: () => [...notificationKeys.all, 'preferences'] as const,
};

export function unreadCountQueryOptions() {
  return queryOptions({
    queryKey: notificationKeys.unread(),
    queryFn: ({ signal }) => api.get<{ unread: number }>('/api/notifications/unread-count', signal),
    select: (data) => data.unread,
    refetchInterval: INBOX_POLL_MS,
  });
}

export function inboxQueryOptions(filter: InboxFilter) {
  return queryOptions({
    queryKey: notificationKeys.list(filter),
    queryFn: ({ signal }) => api.get<Inbox>(`/api/notifications?limit=100${filter === 'unread' ? '&unread=true' : ''}`, signal),
    refetchInterval: INBOX_POLL_MS,
  });
}

export function preferencesQueryOptions() {
  return queryOptions({
    queryKey: notificationKeys.preferences(),
    queryFn: ({ signal }) => api.get<NotificationPreferences>('/api/notification-preferences', signal),
  });
}

export function useMarkRead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post<{ id: string; readAt: string }>(`/api/notifications/${id}/read`),
    onSettled: () => queryClient.invalidateQueries({ queryKey: notificationKeys.all }),
  });
}

/** `upTo`: the newest notice on screen, so one that arrives meanwhile stays unread. */
export function useMarkAllRead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (upTo: string | undefined) => api.post<{ marked: number; unread: number }>('/api/notifications/read-all', upTo ? { upTo } : {}),
    onSettled: () => queryClient.invalidateQueries({ queryKey: notificationKeys.all }),
  });
}

export function useSavePreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (preferences: Array<{ kind: NotificationKind; email: boolean }>) =>
      api.put<NotificationPreferences>('/api/notification-preferences', { preferences }),
    onSuccess: (data) => queryClient.setQueryData(notificationKeys.preferences(), data),
  });
}
