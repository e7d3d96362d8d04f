import { PageHeader } from '@/components/ui/page-header';
import { ServiceCatalogEditor } from '@/features/jobs/components/service-catalog-editor';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';

export function ServiceCatalogRoute() {
  const me = useSession();
  useDocumentTitle('Service catalog');
  return (
    <>
      <PageHeader
        title="Service catalog"
        description={`The services ${me.network.name} offers, with their standard hours. Estimates take labor lines from here at each shop's rate.`}
      />
      <ServiceCatalogEditor />
    </>
  );
}
