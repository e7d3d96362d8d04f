import { useInfiniteQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { auditActionLabel, describeChanges, formatDateTime } from '../format';
import { auditLogQueryOptions, type AuditFilters } from '../queries';

/** Who changed what and when, newest first, with the values before and after, in words. */
export function AuditLogList({ filters = {}, filtered = false }: { filters?: AuditFilters; filtered?: boolean }) {
  const log = useInfiniteQuery(auditLogQueryOptions(filters));

  if (log.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-12">
        <Spinner label="Loading the log…" showLabel />
      </div>
    );
  }
  if (log.isError) return <ErrorState title="The log could not be loaded" error={log.error} onRetry={() => void log.refetch()} />;
  const entries = log.data.pages.flatMap((p) => p.entries);
  const names = Object.assign({}, ...log.data.pages.map((p) => p.names ?? {})) as Record<string, string>;
  if (entries.length === 0) {
    return filtered ? (
      <EmptyState title="No change matches these filters">Widen the dates or clear a filter.</EmptyState>
    ) : (
      <EmptyState title="Nothing logged yet">Changes to people, roles and shops appear here.</EmptyState>
    );
  }

  return (
    <div className="flex flex-col gap-4">
      <ol className="flex flex-col divide-y divide-paper-200 rounded-2xl border border-paper-200 bg-white">
        {entries.map((entry) => {
          const changes = describeChanges(entry.before, entry.after, names);
          return (
            <li key={entry.id} className="flex flex-col gap-1 px-4 py-4 sm:px-6">
              <p className="flex flex-wrap items-baseline justify-between gap-x-4">
                <span className="font-semibold text-ink-950">{auditActionLabel(entry.action)}</span>
                <time dateTime={entry.at} className="text-sm text-ink-600">
                  {formatDateTime(entry.at)}
                </time>
              </p>
              <p className="text-ink-950">{entry.subject}</p>
              <p className="text-sm text-ink-600">
                by {entry.actor ? <span title={entry.actor.email}>{entry.actor.name}</span> : 'Benchrelay'}
              </p>
              {changes.length ? (
                <ul className="mt-1 flex flex-col gap-0.5 text-sm break-words text-ink-800" aria-label="Changes">
                  {changes.map((c) => (
                    <li key={c}>{c}</li>
                  ))}
                </ul>
              ) : null}
            </li>
          );
        })}
      </ol>
      {log.hasNextPage ? (
        <div>
          <Button variant="secondary" onClick={() => void log.fetchNextPage()} disabled={log.isFetchingNextPage}>
            {log.isFetchingNextPage ? 'Loading…' : 'Show older changes'}
          </Button>
        </div>
      ) : null}
    </div>
  );
}
