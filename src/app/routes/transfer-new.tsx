import { useNavigate, useSearchParams } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { RequestTransfer } from '@/features/transfers/components/request-transfer';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

/** `/transfers/new?job=<id>`: the job page links here; without `job` the page offers the shop's open jobs. */
export function TransferNewRoute() {
  useDocumentTitle('Request a transfer');
  const { currentShop } = useCurrentShop();
  const [params, setParams] = useSearchParams();
  const navigate = useNavigate();
  const jobId = params.get('job');
  return (
    <>
      <PageHeader
        title="Request a transfer"
        description="Benchrelay ranks the shops that have the skill by when the job would be finished there, and says why."
      />
      <RequestTransfer
        shop={currentShop}
        jobId={jobId}
        onPickJob={(id) =>
          setParams((previous) => {
            const next = new URLSearchParams(previous);
            if (id) next.set('job', id);
            else next.delete('job');
            return next;
          })
        }
        onCreated={(id) => void navigate(withShop(`/transfers/${id}`, currentShop?.id))}
        hrefFor={(path) => withShop(path, currentShop?.id)}
      />
    </>
  );
}
