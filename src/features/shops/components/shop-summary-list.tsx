import { useQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { shopsSummaryQueryOptions } from '../queries';
import { ShopCard } from './shop-card';

interface ShopSummaryListProps {
  currentShopId?: string;
  onSelectShop?: (shopId: string) => void;
}

export function ShopSummaryList({ currentShopId, onSelectShop }: ShopSummaryListProps) {
  const summary = useQuery(shopsSummaryQueryOptions());

  if (summary.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Loading your shops…" showLabel />
      </div>
    );
  }

  if (summary.isError) {
    return (
      <ErrorState
        title="Your shops could not be loaded"
        error={summary.error}
        onRetry={() => void summary.refetch()}
        retrying={summary.isFetching}
      />
    );
  }

  if (summary.data.length === 0) {
    return (
      <EmptyState title="No shops yet">
        When the network&rsquo;s owner opens a shop and gives you a role there, it shows up here with its job board.
      </EmptyState>
    );
  }

  return (
    <ul className="grid grid-cols-1 gap-4 sm:grid-cols-2 sm:gap-6 xl:grid-cols-3">
      {summary.data.map((shop) => {
        const current = shop.id === currentShopId;
        return (
          <li key={shop.id} className="flex">
            <ShopCard
              shop={shop}
              current={current}
              footer={
                onSelectShop && !current ? (
                  <Button variant="secondary" className="w-full sm:w-auto" onClick={() => onSelectShop(shop.id)}>
                    Switch to {shop.name}
                  </Button>
                ) : undefined
              }
            />
          </li>
        );
      })}
    </ul>
  );
}
