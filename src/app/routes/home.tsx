import { PageHeader } from '@/components/ui/page-header';
import { ShopAbilities } from '@/features/shops/components/shop-abilities';
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
      <div className="flex flex-col gap-8">
        {currentShop ? <ShopAbilities shopId={currentShop.id} shopName={currentShop.name} /> : null}
        <ShopSummaryList currentShopId={currentShop?.id} onSelectShop={me.shops.length > 1 ? setCurrentShop : undefined} />
      </div>
    </>
  );
}
