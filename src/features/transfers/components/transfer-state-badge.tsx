import type { TransferState } from '@shared/domain';
import { TRANSFER_STATE_LABELS } from '@shared/transfers';
import { cn } from '@/lib/cn';
import { STATE_TONE } from '../format';

export function TransferStateBadge({ state, overdue, className }: { state: TransferState; overdue?: boolean; className?: string }) {
  return (
    <span className={cn('inline-flex flex-wrap items-center gap-1.5', className)}>
      <span data-state={state} className={cn('inline-flex items-center rounded-full px-2.5 py-0.5 text-xs font-semibold', STATE_TONE[state])}>
        {TRANSFER_STATE_LABELS[state]}
      </span>
      {overdue ? (
        <span className="inline-flex items-center rounded-full border border-danger-200 bg-danger-50 px-2.5 py-0.5 text-xs font-semibold text-danger-700">
          Overdue
        </span>
      ) : null}
    </span>
  );
}
