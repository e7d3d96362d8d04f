import { useQuery, type UseQueryResult } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { MailList } from '@/features/dev-mail/components/mail-list';
import { MailReader } from '@/features/dev-mail/components/mail-reader';
import { devMailQueryOptions, type CaughtMessage } from '@/features/dev-mail/queries';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useDocumentTitle } from '@/lib/use-document-title';
import { PublicLayout } from '../layout/public-layout';

/**
 * `/dev/mail`: the e-mail the local mail catcher received (invitations, transfer notices, …).
 * It sits outside the session gate because the person reading an invitation has no access yet.
 */
export function DevMailRoute() {
  useDocumentTitle('Caught e-mail');
  const [searchParams] = useSearchParams();
  const selectedId = searchParams.get('message') ?? undefined;
  const mail = useQuery({ ...devMailQueryOptions(), refetchInterval: 5000 });

  return (
    <PublicLayout width="wide">
      <PageHeader
        title="Caught e-mail"
        description="Everything Benchrelay sent while running locally. Nothing here left this machine."
        actions={
          <Button variant="secondary" onClick={() => void mail.refetch()} disabled={mail.isFetching}>
            {mail.isFetching ? 'Refreshing…' : 'Refresh'}
          </Button>
        }
      />
      <DevMailBody mail={mail} selectedId={selectedId} />
    </PublicLayout>
  );
}

function DevMailBody({ mail, selectedId }: { mail: UseQueryResult<CaughtMessage[]>; selectedId?: string }) {
  if (mail.isPending) {
    return (
      <div className="flex justify-center py-16">
        <Spinner label="Loading caught e-mail…" showLabel />
      </div>
    );
  }
  if (mail.isError) {
    if (isApiError(mail.error) && mail.error.status === 404) {
      return (
        <EmptyState title="No mail catcher here">
          This Benchrelay runs in production mode, where e-mail goes out through the real mail server.
        </EmptyState>
      );
    }
    return <ErrorState title="Caught e-mail could not be loaded" error={mail.error} onRetry={() => void mail.refetch()} />;
  }
  if (mail.data.length === 0) {
    return (
      <EmptyState title="No e-mail caught yet">
        Invitations, transfer notices and other messages will appear here as Benchrelay sends them.
      </EmptyState>
    );
  }

  const selected = mail.data.find((message) => message.id === selectedId);
  return (
    <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      {/* On a phone one column shows at a time: the list, or the open message with a way back. */}
      <div className={cn(selected && 'hidden lg:block')}>
        <h2 className="sr-only">Messages</h2>
        <MailList messages={mail.data} selectedId={selected?.id} hrefFor={(id) => `/dev/mail?message=${encodeURIComponent(id)}`} />
      </div>
      <div className={cn(!selected && 'hidden lg:block')}>
        {selected ? (
          <div className="flex flex-col gap-4">
            <Link
              to="/dev/mail"
              className="inline-flex min-h-11 items-center self-start rounded-lg font-semibold text-accent-700 underline underline-offset-2 lg:hidden"
            >
              Back to all messages
            </Link>
            <MailReader key={selected.id} message={selected} />
          </div>
        ) : (
          <EmptyState title={selectedId ? 'That message is gone' : 'Pick a message'}>
            {selectedId ? 'The mail catcher no longer holds it.' : 'Choose one from the list to read it.'}
          </EmptyState>
        )}
      </div>
    </div>
  );
}
