import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { formatTimeZone } from '../format';
import { shopsSummaryQueryOptions } from '../queries';
import { stageBreakdown } from '../stages';

/** Every shop of the network side by side: where it is, its clock, and how loaded its board is. */
export function ShopTable({ hrefFor }: { hrefFor?: (shopId: string) => string } = {}) {
  const summary = useQuery(shopsSummaryQueryOptions());

  if (summary.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Loading shops…" showLabel />
      </div>
    );
  }
  if (summary.isError) {
    return (
      <ErrorState
        title="The shops could not be loaded"
        error={summary.error}
        onRetry={() => void summary.refetch()}
        retrying={summary.isFetching}
      />
    );
  }
  if (summary.data.length === 0) {
    return <EmptyState title="No shops yet">This network has no shops yet.</EmptyState>;
  }

  const holdsOf = (jobsByStage: Record<string, number>) =>
    stageBreakdown(jobsByStage)
      .filter((stage) => stage.hold)
      .reduce((sum, stage) => sum + stage.count, 0);

  return (
    <div className="overflow-x-auto rounded-2xl border border-paper-200 bg-white">
      <table className="w-full min-w-[36rem] text-left text-sm">
        <caption className="sr-only">Shops of the network</caption>
        <thead className="border-b border-paper-200 bg-paper-50 text-ink-600">
          <tr>
            <th scope="col" className="px-4 py-3 font-semibold">Shop</th>
            <th scope="col" className="px-4 py-3 font-semibold">City</th>
            <th scope="col" className="px-4 py-3 font-semibold">Time zone</th>
            <th scope="col" className="px-4 py-3 text-right font-semibold">Open jobs</th>
            <th scope="col" className="px-4 py-3 text-right font-semibold">On hold</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-200">
          {summary.data.map((shop) => (
            <tr key={shop.id}>
              <th scope="row" className="px-4 py-3 font-semibold text-ink-950">
                {hrefFor ? (
                  <Link to={hrefFor(shop.id)} className="text-accent-700 underline underline-offset-2">
                    {shop.name}
                  </Link>
                ) : (
                  shop.name
                )}
              </th>
              <td className="px-4 py-3 text-ink-800">{shop.city}</td>
              <td className="px-4 py-3 text-ink-800">{formatTimeZone(shop.timeZone)}</td>
              <td className="px-4 py-3 text-right font-semibold tabular-nums text-ink-950">{shop.openJobs}</td>
              <td className="px-4 py-3 text-right tabular-nums text-ink-800">{holdsOf(shop.jobsByStage)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
