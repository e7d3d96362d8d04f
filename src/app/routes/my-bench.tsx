import { PageHeader } from '@/components/ui/page-header';
import { MyBench } from '@/features/jobs/components/my-bench';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

export function MyBenchRoute() {
  const { currentShop } = useCurrentShop();
  useDocumentTitle('My bench');
  return (
    <>
      <PageHeader title="My bench" description="The jobs assigned to you, soonest promise first." />
      <MyBench linkTo={(job) => withShop(`/jobs/${job.id}`, currentShop?.id)} />
    </>
  );
}
