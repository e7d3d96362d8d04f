import { useState } from 'react';
import { subject } from '@casl/ability';
import { useQuery } from '@tanstack/react-query';
import type { TransferView } from '@shared/transfers';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useAppAbility } from '@/lib/ability';
import { cn } from '@/lib/cn';
import { transferListQueryOptions, useTransferAction, type TransferStatusFilter } from '../queries';
import type { TransferSummary } from '../types';
import { TransferList } from './transfer-list';

interface TransfersBoardProps {
  shop: { id: string; name: string } | undefined;
  hrefFor: (id: string) => string;
  initialView?: TransferView;
}

const TABS: Array<{ view: TransferView; label: string }> = [
  { view: 'incoming', label: 'Incoming' },
  { view: 'outgoing', label: 'Outgoing' },
  { view: 'approvals', label: 'Approvals' },
];

/** Incoming and outgoing transfers of the current shop, and the approvals waiting for this person. */
export function TransfersBoard({ shop, hrefFor, initialView = 'incoming' }: TransfersBoardProps) {
  const ability = useAppAbility();
  const canApproveAny = ability.can('approve', 'Transfer');
  const tabs = TABS.filter((t) => t.view !== 'approvals' || canApproveAny);
  const [view, setView] = useState<TransferView>(tabs.some((t) => t.view === initialView) ? initialView : 'incoming');
  const [status, setStatus] = useState<TransferStatusFilter>('open');
  const list = useQuery(transferListQueryOptions(view, view === 'approvals' ? undefined : shop?.id, view === 'approvals' ? 'open' : status));

  const empty: Record<TransferView, string> = {
    incoming: status === 'open' ? `Nothing on its way to ${shop?.name ?? 'this shop'}` : `No transfers to ${shop?.name ?? 'this shop'} yet`,
    outgoing: status === 'open' ? `Nothing leaving ${shop?.name ?? 'this shop'}` : `No transfers from ${shop?.name ?? 'this shop'} yet`,
    approvals: 'No transfers wait for your approval',
    all: 'No transfers',
  };

  return (
    <section aria-label="Transfers of this shop">
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <div className="inline-flex rounded-xl border border-paper-300 bg-white p-1" role="group" aria-label="Which transfers">
          {tabs.map((t) => (
            <button
              key={t.view}
              type="button"
              aria-pressed={view === t.view}
              onClick={() => setView(t.view)}
              className={cn(
                'min-h-10 rounded-lg px-4 text-sm font-semibold',
                view === t.view ? 'bg-accent-600 text-white' : 'text-ink-800 hover:bg-paper-100',
              )}
            >
              {t.label}
            </button>
          ))}
        </div>
        {view !== 'approvals' ? (
          <label className="inline-flex min-h-11 items-center gap-2 text-sm font-medium text-ink-800">
            <input
              type="checkbox"
              className="size-4 accent-accent-600"
              checked={status === 'any'}
              onChange={(e) => setStatus(e.target.checked ? 'any' : 'open')}
            />
            Show finished transfers too
          </label>
        ) : null}
      </div>
      <TransferList
        transfers={list.data}
        isPending={list.isPending && list.fetchStatus !== 'idle'}
        error={list.error}
        onRetry={() => void list.refetch()}
        emptyTitle={empty[view]}
        hrefFor={hrefFor}
        rowActions={view === 'approvals' ? (t) => <QuickApprove transfer={t} /> : undefined}
      />
    </section>
  );
}

/** Approve from the queue without opening the transfer; rejecting needs a reason, so it lives on the transfer. */
function QuickApprove({ transfer }: { transfer: TransferSummary }) {
  const ability = useAppAbility();
  const action = useTransferAction(transfer.id);
  if (!ability.can('approve', subject('Transfer', { fromShopId: transfer.fromShop.id, toShopId: transfer.toShop.id }))) return null;
  return (
    <>
      <Button
        onClick={() => action.mutate({ action: 'approve' })}
        disabled={action.isPending || action.isSuccess}
        aria-label={`Approve transfer of job ${transfer.job.number}`}
      >
        {action.isSuccess ? 'Approval queued' : action.isPending ? 'Approving…' : 'Approve'}
      </Button>
      {action.isError ? (
        <p role="alert" className="self-center text-sm text-danger-700">
          {isApiError(action.error) ? action.error.message : 'The approval could not be sent.'}
        </p>
      ) : null}
    </>
  );
}
