import { PageHeader } from '@/components/ui/page-header';
import { ShopTable } from '@/features/shops/components/shop-table';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';

export function ShopsRoute() {
  const me = useSession();
  useDocumentTitle('Shops');
  return (
    <>
      <PageHeader title="Shops" description={`Every shop in ${me.network.name}, with the load on its job board.`} />
      <ShopTable />
    </>
  );
}
