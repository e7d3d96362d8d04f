import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';

interface ListStatesProps<T extends { total: number }> {
  query: UseQueryResult<T>;
  what: string;
  emptyTitle: string;
  empty: ReactNode;
  children: (data: T) => ReactNode;
}

/** Loading, error and empty states every report list shares. */
export function ListStates<T extends { total: number }>({ query, what, emptyTitle, empty, children }: ListStatesProps<T>) {
  if (query.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label={`Loading ${what}…`} showLabel />
      </div>
    );
  }
  if (query.isError) {
    return (
      <ErrorState
        title={`The ${what} could not be loaded`}
        error={query.error}
        onRetry={() => void query.refetch()}
        retrying={query.isFetching}
      />
    );
  }
  if (query.data.total === 0) return <EmptyState title={emptyTitle}>{empty}</EmptyState>;
  return <>{children(query.data)}</>;
}

export function ShownOf({ shown, total }: { shown: number; total: number }) {
  if (shown >= total) return <p className="text-sm text-ink-600">{total} in all.</p>;
  return (
    <p className="text-sm text-ink-600">
      Showing the first {shown} of {total}; the CSV has every row.
    </p>
  );
}

export const tableShell = 'overflow-x-auto rounded-2xl border border-paper-200 bg-white';
export const th = 'px-4 py-3 font-semibold text-ink-600';
export const td = 'px-4 py-3 text-ink-800';
export const tdNum = 'px-4 py-3 text-right tabular-nums text-ink-950';
