import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { StockScreen } from '@/features/stock/components/stock-screen';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop } from '../current-shop';

/** /stock — the current shop's parts: shortages first, and parts coming and going between shops. */
export function StockRoute() {
  const { currentShop } = useCurrentShop();
  useDocumentTitle(currentShop ? `Stock · ${currentShop.name}` : 'Stock');
  if (!currentShop) return <EmptyState title="No shop selected">Choose a shop to see its stock.</EmptyState>;
  return (
    <>
      <PageHeader
        title={`Stock at ${currentShop.name}`}
        description="Parts on the shelf, reserved by jobs, and short. A shortage shows the nearest shop that can spare the parts; asking sends them on the next relay run."
      />
      <StockScreen key={currentShop.id} shopId={currentShop.id} />
    </>
  );
}
