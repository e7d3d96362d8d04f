import { useEffect, useRef } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { NavLink } from 'react-router-dom';
import { cn } from '@/lib/cn';
import { notificationKeys, unreadCountQueryOptions } from '../queries';

/** The header's way into the inbox: a bell with the unread count, kept fresh by polling. */
export function InboxLink({ to, className }: { to: string; className?: string }) {
  const queryClient = useQueryClient();
  const { data: unread = 0 } = useQuery(unreadCountQueryOptions());
  const previous = useRef(unread);

  // a new notice arrived: an open inbox shows it at once rather than at its own next poll
  useEffect(() => {
    if (unread > previous.current) void queryClient.invalidateQueries({ queryKey: notificationKeys.lists() });
    previous.current = unread;
  }, [unread, queryClient]);

  const shown = unread > 99 ? '99+' : String(unread);
  return (
    <NavLink
      to={to}
      className={({ isActive }) =>
        cn(
          'relative inline-flex min-h-11 min-w-11 items-center justify-center gap-2 rounded-lg px-3 text-sm font-semibold',
          isActive ? 'bg-accent-50 text-accent-800' : 'text-ink-800 hover:bg-paper-100 hover:text-ink-950',
          className,
        )
      }
      data-testid="inbox-link"
    >
      <svg className="size-5 shrink-0" viewBox="0 0 20 20" fill="none" aria-hidden="true">
        <path
          d="M10 2.5a5 5 0 0 0-5 5v2.7c0 .6-.2 1.2-.6 1.7L3.3 13.4c-.4.5 0 1.1.6 1.1h12.2c.6 0 1-.6.6-1.1l-1.1-1.5c-.4-.5-.6-1.1-.6-1.7V7.5a5 5 0 0 0-5-5Z"
          stroke="currentColor"
          strokeWidth="1.6"
          strokeLinejoin="round"
        />
        <path d="M8 16.5a2 2 0 0 0 4 0" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
      <span className="sr-only sm:not-sr-only">Inbox</span>
      {unread > 0 ? (
        <span className="inline-flex min-w-6 items-center justify-center rounded-full bg-accent-700 px-1.5 py-0.5 text-xs font-bold leading-none text-white">
          {shown}
          <span className="sr-only"> unread</span>
        </span>
      ) : (
        <span className="sr-only">, nothing unread</span>
      )}
    </NavLink>
  );
}
