import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface CaughtMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  /** The catcher stores `null` for a part the message does not have (most notices are text only). */
  text: string | null;
  html: string | null;
}

export const devMailKeys = {
  all: ['dev-mail'] as const,
  list: () => [...devMailKeys.all, 'list'] as const,
};

/** Messages caught by the local mail catcher, newest first. The endpoint answers 404 in production. */
export function devMailQueryOptions() {
  return queryOptions({
    queryKey: devMailKeys.list(),
    queryFn: ({ signal }) => api.get<{ messages: CaughtMessage[] }>('/api/dev/mail', signal),
    select: (data) => sortNewestFirst(data.messages),
  });
}

export function sortNewestFirst(messages: CaughtMessage[]): CaughtMessage[] {
  return [...messages].sort((a, b) => Date.parse(b.receivedAt) - Date.parse(a.receivedAt));
}
