import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import { TIMELINE_FILTERS, TIMELINE_FILTER_LABELS, type TimelineFilter } from '@shared/schemas/registry';
import { formatInZone } from '../format';
import { timelineQueryOptions } from '../queries';
import type { TimelineItem } from '../types';

const FILTER_MARK: Record<TimelineFilter, string> = {
  intake: 'bg-accent-600',
  job: 'bg-ink-800',
  transfer: 'bg-accent-200',
  photo: 'bg-paper-300',
  document: 'bg-paper-300',
  pad_map: 'bg-accent-100',
  note: 'bg-ink-400',
};

interface InstrumentTimelineProps {
  instrumentId: string;
  /** The viewer's shop time zone: every entry is shown in it, whichever shop wrote it. */
  timeZone: string | undefined;
  timeZoneLabel?: string;
  jobPath?: (id: string) => string;
}

/** Everything done to this instrument at any shop, newest first, filterable by kind. */
export function InstrumentTimeline({ instrumentId, timeZone, timeZoneLabel, jobPath }: InstrumentTimelineProps) {
  const [kinds, setKinds] = useState<TimelineFilter[]>([]);
  const timeline = useQuery(timelineQueryOptions(instrumentId, kinds));
  const toggle = (kind: TimelineFilter) =>
    setKinds((current) => (current.includes(kind) ? current.filter((k) => k !== kind) : [...current, kind]));

  return (
    <section aria-labelledby="timeline-heading" className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <h2 id="timeline-heading" className="text-xl font-bold text-ink-950">
          History across all shops
        </h2>
        <p className="text-sm text-ink-600">Times in {timeZoneLabel ?? timeZone ?? 'your time zone'}.</p>
      </div>
      <div role="group" aria-label="Show only" className="flex flex-wrap gap-2">
        <button
          type="button"
          aria-pressed={kinds.length === 0}
          onClick={() => setKinds([])}
          className={chip(kinds.length === 0)}
        >
          Everything
        </button>
        {TIMELINE_FILTERS.map((kind) => (
          <button key={kind} type="button" aria-pressed={kinds.includes(kind)} onClick={() => toggle(kind)} className={chip(kinds.includes(kind))}>
            {TIMELINE_FILTER_LABELS[kind]}
          </button>
        ))}
      </div>

      {timeline.isPending ? (
        <Spinner label="Loading the history…" showLabel />
      ) : timeline.isError ? (
        <ErrorState title="The history could not be loaded" error={timeline.error} onRetry={() => void timeline.refetch()} />
      ) : timeline.data.length === 0 ? (
        <EmptyState title={kinds.length ? 'Nothing of this kind yet' : 'No history yet'}>
          {kinds.length ? 'Choose other kinds, or Everything.' : 'Intakes, jobs and transfers of this instrument will show here.'}
        </EmptyState>
      ) : (
        <ol aria-label="Timeline" className={cn('relative flex flex-col gap-0 border-l-2 border-paper-200 pl-5', timeline.isFetching && 'opacity-70')}>
          {timeline.data.map((item) => (
            <TimelineEntry key={`${item.source}:${item.id}`} item={item} timeZone={timeZone} jobPath={jobPath} />
          ))}
        </ol>
      )}
    </section>
  );
}

const chip = (on: boolean) =>
  cn(
    'min-h-11 rounded-full border px-4 text-sm font-semibold',
    on ? 'border-accent-600 bg-accent-50 text-accent-800' : 'border-paper-300 bg-white text-ink-800 hover:border-ink-400',
  );

function TimelineEntry({ item, timeZone, jobPath }: { item: TimelineItem; timeZone: string | undefined; jobPath?: (id: string) => string }) {
  return (
    <li className="relative pb-5" data-kind={item.filter}>
      <span aria-hidden="true" className={cn('absolute top-1.5 -left-[1.6rem] size-3 rounded-full ring-4 ring-paper-100', FILTER_MARK[item.filter])} />
      <p className="text-sm text-ink-600">
        <time dateTime={item.at}>{formatInZone(item.at, timeZone)}</time>
        <span className="mx-1">·</span>
        <span className="font-semibold text-ink-800">{item.shop?.name ?? 'Network'}</span>
        {item.person ? (
          <>
            <span className="mx-1">·</span>
            {item.person}
          </>
        ) : null}
      </p>
      <p className="mt-0.5 text-ink-950">
        <span className="mr-2 rounded bg-paper-200 px-1.5 py-0.5 text-xs font-semibold text-ink-800">{TIMELINE_FILTER_LABELS[item.filter]}</span>
        {item.summary}
        {item.job ? (
          <span className="text-ink-600">
            {' '}
            ({jobPath ? <Link className="underline" to={jobPath(item.job.id)}>job {item.job.number}</Link> : `job ${item.job.number}`})
          </span>
        ) : null}
      </p>
    </li>
  );
}
