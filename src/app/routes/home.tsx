import { PageHeader } from '@/components/ui/page-header';
import { ShopSummaryList } from '@/features/shops/components/shop-summary-list';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop } from '../current-shop';
import { useSession } from '../session-context';

export function HomeRoute() {
  const me = useSession();
  const { currentShop, setCurrentShop } = useCurrentShop();
  useDocumentTitle('Your shops');
  const firstName = me.user.name.split(/\s+/)[0];
  return (
    <>
      <PageHeader
        title="Your shops"
        description={
          <>
            {firstName ? `Hello, ${firstName}. ` : ''}Open jobs on each bench you work with in {me.network.name}.
          </>
        }
      />
      <ShopSummaryList currentShopId={currentShop?.id} onSelectShop={me.shops.length > 1 ? setCurrentShop : undefined} />
    </>
  );
}
