import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { describeInstrument, formatInShop } from '../format';
import type { TransferSummary } from '../types';
import { TransferStateBadge } from './transfer-state-badge';

interface TransferListProps {
  transfers: TransferSummary[] | undefined;
  isPending: boolean;
  error: unknown;
  onRetry: () => void;
  emptyTitle: string;
  emptyText?: ReactNode;
  /** Link to a transfer, keeping the shop of this tab. */
  hrefFor: (id: string) => string;
  /** Extra controls per row (the approvals queue puts its quick approve here). */
  rowActions?: (t: TransferSummary) => ReactNode;
}

/** Transfers as cards: they read well on a phone at the bench and on a desk screen alike. */
export function TransferList({ transfers, isPending, error, onRetry, emptyTitle, emptyText, hrefFor, rowActions }: TransferListProps) {
  if (isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-12">
        <Spinner label="Loading transfers…" showLabel />
      </div>
    );
  }
  if (error) return <ErrorState title="The transfers could not be loaded" error={error} onRetry={onRetry} />;
  if (!transfers?.length) return <EmptyState title={emptyTitle}>{emptyText}</EmptyState>;

  return (
    <ul className="flex flex-col gap-3" aria-label="Transfers">
      {transfers.map((t) => (
        <li key={t.id} className="rounded-2xl border border-paper-200 bg-white p-4 sm:p-5">
          <div className="flex flex-wrap items-start justify-between gap-3">
            <div className="min-w-0">
              <Link to={hrefFor(t.id)} className="text-base font-semibold text-ink-950 underline-offset-2 hover:underline">
                {describeInstrument(t.instrument)}
              </Link>
              <p className="mt-0.5 text-sm text-ink-600">
                Serial <span className="font-mono text-ink-800">{t.instrument.serial}</span> · Job {t.job.number}
              </p>
            </div>
            <TransferStateBadge state={t.state} overdue={t.overdue} />
          </div>
          <p className="mt-3 text-sm font-medium text-ink-800">
            {t.fromShop.name} <span aria-hidden="true">→</span>
            <span className="sr-only">to</span> {t.toShop.name}
          </p>
          <dl className="mt-2 grid grid-cols-1 gap-x-6 gap-y-1 text-sm text-ink-600 sm:grid-cols-2">
            <div>
              <dt className="inline">Requested </dt>
              <dd className="inline text-ink-800">{formatInShop(t.requestedAt, t.fromShop.timeZone)}</dd>
            </div>
            {t.state === 'in_transit' ? (
              <div>
                <dt className="inline">Expected </dt>
                <dd className="inline text-ink-800">{formatInShop(t.expectedArrivalAt, t.toShop.timeZone)}</dd>
              </div>
            ) : null}
            {t.receivedAt ? (
              <div>
                <dt className="inline">Received </dt>
                <dd className="inline text-ink-800">{formatInShop(t.receivedAt, t.toShop.timeZone)}</dd>
              </div>
            ) : null}
          </dl>
          {rowActions ? <div className="mt-3 flex flex-wrap gap-2">{rowActions(t)}</div> : null}
        </li>
      ))}
    </ul>
  );
}
