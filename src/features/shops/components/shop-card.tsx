import type { ReactNode } from 'react';
import { Card } from '@/components/ui/card';
import { cn } from '@/lib/cn';
import { formatTimeZone } from '../format';
import type { ShopSummary } from '../queries';
import { stageBreakdown } from '../stages';

interface ShopCardProps {
  shop: ShopSummary;
  current?: boolean;
  /** Rendered at the foot of the card, e.g. a control to make this the current shop. */
  footer?: ReactNode;
}

export function ShopCard({ shop, current = false, footer }: ShopCardProps) {
  const headingId = `shop-${shop.id}-name`;
  const stages = stageBreakdown(shop.jobsByStage);
  const largest = Math.max(1, ...stages.map((s) => s.count));
  return (
    <Card as="article" aria-labelledby={headingId} className={cn('flex w-full flex-col gap-5', current && 'border-accent-200 ring-2 ring-accent-100')}>
      <div className="flex items-start justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-lg font-semibold text-ink-950">
            {shop.name}
          </h2>
          <p className="mt-1 text-sm text-ink-600">
            {shop.city} <span aria-hidden="true">·</span> <span className="sr-only">time zone </span>
            {formatTimeZone(shop.timeZone)}
          </p>
        </div>
        {current ? (
          <span className="shrink-0 rounded-full bg-accent-50 px-3 py-1 text-xs font-semibold text-accent-800">Current shop</span>
        ) : null}
      </div>

      <p className="flex items-baseline gap-2">
        <span className="text-4xl font-bold tabular-nums text-ink-950" data-testid="open-jobs">
          {shop.openJobs}
        </span>
        <span className="font-medium text-ink-800">{shop.openJobs === 1 ? 'open job' : 'open jobs'}</span>
      </p>

      {stages.length > 0 ? (
        <dl className="flex flex-col gap-2" aria-label={`Jobs by stage at ${shop.name}`}>
          {stages.map((stage) => (
            <div key={stage.stage} className="grid grid-cols-[1fr_auto] items-center gap-x-3 gap-y-1">
              <dt className="text-sm text-ink-800">{stage.label}</dt>
              <dd className="text-sm font-semibold tabular-nums text-ink-950">{stage.count}</dd>
              <div className="col-span-2 h-1.5 rounded-full bg-paper-100" aria-hidden="true">
                <div
                  className={cn('h-full rounded-full', stage.hold ? 'bg-ink-400' : 'bg-accent-600')}
                  style={{ width: `${Math.round((stage.count / largest) * 100)}%` }}
                />
              </div>
            </div>
          ))}
        </dl>
      ) : (
        <p className="text-sm text-ink-600">Nothing on the board right now.</p>
      )}

      {footer ? <div className="mt-auto border-t border-paper-200 pt-4">{footer}</div> : null}
    </Card>
  );
}
