import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { ErrorState } from '@/components/ui/error-state';
import { PageSpinner } from '@/components/ui/spinner';
import { CustomerJobPage } from '@/features/customer-page/components/customer-job-page';
import { publicJobQueryOptions } from '@/features/customer-page/queries';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { PublicLayout } from '../layout/public-layout';

/**
 * `/c/:token`, the page a customer's e-mail links to. No account and no session: the token is the key,
 * and the page shows one job. Outside the session gate, like an invitation.
 */
export function CustomerJobRoute() {
  const { token = '' } = useParams();
  const view = useQuery(publicJobQueryOptions(token));
  useDocumentTitle(view.data ? `Job ${view.data.job.number}` : 'Your instrument');

  return (
    <PublicLayout>
      {view.isPending ? (
        <PageSpinner label="Opening your job…" />
      ) : view.isError ? (
        <ErrorState
          title="This link cannot be opened"
          error={view.error}
          onRetry={isApiError(view.error) && view.error.status === 404 ? undefined : () => void view.refetch()}
        />
      ) : (
        <CustomerJobPage token={token} view={view.data} />
      )}
    </PublicLayout>
  );
}
