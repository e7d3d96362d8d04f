import { useEffect, useRef, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { FormError } from '@/components/ui/form-controls';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { NoticeList } from '@/features/notifications/components/notice-list';
import { inboxQueryOptions, useMarkAllRead, useMarkRead, type InboxFilter } from '@/features/notifications/queries';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { SHOP_SEARCH_PARAM, useCurrentShop, withShop } from '../current-shop';

const FILTERS: Array<{ value: InboxFilter; label: string }> = [
  { value: 'all', label: 'All' },
  { value: 'unread', label: 'Unread' },
];

export function InboxRoute() {
  const [params, setParams] = useSearchParams();
  const filter: InboxFilter = params.get('show') === 'unread' ? 'unread' : 'all';
  const { currentShop } = useCurrentShop();
  const inbox = useQuery(inboxQueryOptions(filter));
  const markRead = useMarkRead();
  const markAll = useMarkAllRead();
  const [announcement, setAnnouncement] = useState('');
  const unread = inbox.data?.unread ?? 0;
  useDocumentTitle(unread ? `Inbox (${unread} unread)` : 'Inbox');

  // say so when new notices come in while the screen is open (the list itself updates by polling)
  const newest = inbox.data?.notifications[0]?.createdAt;
  const seenNewest = useRef<string | undefined>(undefined);
  useEffect(() => {
    if (!newest) return;
    if (seenNewest.current && newest > seenNewest.current) setAnnouncement('New notices arrived.');
    seenNewest.current = newest;
  }, [newest]);

  // a stored link already naming a shop (the stock screen of the short shop) keeps it
  const hrefFor = (link: string) => (new URLSearchParams(link.split('?')[1] ?? '').has(SHOP_SEARCH_PARAM) ? link : withShop(link, currentShop?.id));
  const showFilter = (value: InboxFilter) => {
    const next = new URLSearchParams(params);
    if (value === 'unread') next.set('show', 'unread');
    else next.delete('show');
    setParams(next, { replace: true });
  };
  const failure = markRead.error ?? markAll.error;

  return (
    <>
      <PageHeader
        title="Inbox"
        description="Notices about your shops’ transfers, jobs, stock and people. New ones appear here without reloading the page."
        actions={
          <>
            <Button
              variant="secondary"
              disabled={!unread || markAll.isPending}
              onClick={() => markAll.mutate(inbox.data?.notifications[0]?.createdAt)}
            >
              {markAll.isPending ? 'Marking…' : 'Mark all read'}
            </Button>
            <Link className="inline-flex min-h-11 items-center px-2 text-sm font-semibold text-accent-700 underline underline-offset-4" to={withShop('/inbox/settings', currentShop?.id)}>
              E-mail settings
            </Link>
          </>
        }
      />

      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <div role="group" aria-label="Show" className="inline-flex rounded-lg border border-paper-300 bg-white p-1">
          {FILTERS.map((f) => (
            <button
              key={f.value}
              type="button"
              aria-pressed={filter === f.value}
              onClick={() => showFilter(f.value)}
              className={cn(
                'min-h-9 rounded-md px-4 text-sm font-semibold',
                filter === f.value ? 'bg-accent-600 text-white' : 'text-ink-800 hover:bg-paper-100',
              )}
            >
              {f.label}
            </button>
          ))}
        </div>
        <p className="text-sm text-ink-600" data-testid="inbox-unread">
          {unread === 0 ? 'Nothing unread' : `${unread} unread`}
        </p>
      </div>

      <p role="status" aria-live="polite" className="sr-only">
        {announcement}
      </p>
      {failure ? (
        <div className="mb-4">
          <FormError message={isApiError(failure) ? failure.message : 'That did not go through. Try again.'} />
        </div>
      ) : null}

      {inbox.isPending ? (
        <PageSpinner label="Loading your notices…" />
      ) : inbox.isError ? (
        <ErrorState title="Your notices could not be loaded" error={inbox.error} onRetry={() => void inbox.refetch()} retrying={inbox.isFetching} />
      ) : inbox.data.notifications.length === 0 ? (
        <EmptyState title={filter === 'unread' ? 'Nothing unread' : 'No notices yet'}>
          {filter === 'unread'
            ? 'You have read everything. Older notices are under “All”.'
            : 'Transfers, jobs ready to collect, estimates waiting for approval, stock shortages and accepted invitations will show up here.'}
        </EmptyState>
      ) : (
        <>
          <NoticeList
            notices={inbox.data.notifications}
            hrefFor={hrefFor}
            onRead={(id) => markRead.mutate(id)}
            pendingId={markRead.isPending ? markRead.variables : undefined}
          />
          {inbox.data.total > inbox.data.notifications.length ? (
            <p className="mt-4 text-sm text-ink-600">
              Showing the newest {inbox.data.notifications.length} of {inbox.data.total}.
            </p>
          ) : null}
        </>
      )}
    </>
  );
}
