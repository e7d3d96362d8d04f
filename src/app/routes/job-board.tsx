import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { JobBoard } from '@/features/jobs/components/job-board';
import type { BoardParams } from '@/features/jobs/queries';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

const FILTER_KEYS = ['stage', 'technician', 'skill', 'family', 'overdue', 'sort', 'dir', 'page', 'pageSize'] as const;

/** The current shop's job board; its filters live in the address bar so a view can be shared. */
export function JobBoardRoute() {
  const { currentShop } = useCurrentShop();
  const [searchParams, setSearchParams] = useSearchParams();
  useDocumentTitle(currentShop ? `Job board · ${currentShop.name}` : 'Job board');

  const params = useMemo(() => {
    const p: BoardParams = { shop: currentShop?.id ?? '' };
    for (const key of FILTER_KEYS) {
      const value = searchParams.get(key);
      if (value) p[key] = value;
    }
    return p;
  }, [searchParams, currentShop?.id]);

  const onChange = useCallback(
    (patch: Partial<BoardParams>) =>
      setSearchParams((previous) => {
        const next = new URLSearchParams(previous);
        for (const [key, value] of Object.entries(patch)) {
          if (value) next.set(key, value);
          else next.delete(key);
        }
        return next;
      }),
    [setSearchParams],
  );

  if (!currentShop) return <EmptyState title="No shop yet">You hold no role at a shop yet.</EmptyState>;
  return (
    <>
      <PageHeader title="Job board" description={`Every job at ${currentShop.name}, by stage.`} />
      <JobBoard params={params} onChange={onChange} linkTo={(job) => withShop(`/jobs/${job.id}`, currentShop.id)} />
    </>
  );
}
