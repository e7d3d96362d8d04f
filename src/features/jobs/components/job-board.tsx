import { useQuery } from '@tanstack/react-query';
import { ALL_JOB_STAGES, INSTRUMENT_FAMILIES, type JobStage } from '@shared/domain';
import { BOARD_PAGE_SIZES, BOARD_SORT_LABELS, BOARD_SORTS } from '@shared/jobs/schemas';
import { isHold } from '@shared/jobs/stage-machine';
import type { JobSummary } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { controlClasses, Field } from '@/components/ui/form-controls';
import { Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import { boardQueryOptions, type BoardParams } from '../queries';
import { familyLabel, stageLabel } from '../format';
import { JobList } from './job-list';

interface JobBoardProps {
  params: BoardParams;
  /** Changes some filters; the route keeps them in the address bar. */
  onChange: (patch: Partial<BoardParams>) => void;
  linkTo: (job: JobSummary) => string;
}

const MAIN_STAGES = ALL_JOB_STAGES.filter((s) => !isHold(s));
const HOLDS = ALL_JOB_STAGES.filter((s) => isHold(s));

/** One shop's board: stage tabs with counts, filters, sorting and pages. */
export function JobBoard({ params, onChange, linkTo }: JobBoardProps) {
  const board = useQuery(boardQueryOptions(params));
  const stage = params.stage ?? 'open';
  const page = Number(params.page ?? 1);
  const pageSize = Number(params.pageSize ?? 25);
  const counts = board.data?.counts ?? {};
  const openCount = Object.entries(counts).reduce((sum, [s, n]) => (s === 'released' ? sum : sum + (n ?? 0)), 0);
  const filtersActive = Boolean(params.technician || params.skill || params.family || params.overdue === 'true');

  const tab = (value: string, label: string, count: number | undefined, hold = false) => (
    <li key={value}>
      <button
        type="button"
        aria-pressed={stage === value}
        onClick={() => onChange({ stage: value === 'open' ? undefined : value, page: undefined })}
        className={cn(
          'flex min-h-11 items-center gap-2 rounded-full border px-4 text-sm font-semibold whitespace-nowrap',
          stage === value ? 'border-accent-600 bg-accent-600 text-white' : 'border-paper-300 bg-white text-ink-800 hover:border-ink-400',
          hold && stage !== value && 'border-dashed',
        )}
      >
        {label}
        <span className={cn('tabular-nums', stage === value ? 'text-white' : 'text-ink-600')}>{count ?? 0}</span>
      </button>
    </li>
  );

  return (
    <div className="flex flex-col gap-5">
      <nav aria-label="Stages">
        <ul className="-mx-4 flex gap-2 overflow-x-auto px-4 pb-1 sm:mx-0 sm:flex-wrap sm:px-0">
          {tab('open', 'All open', openCount)}
          {MAIN_STAGES.map((s) => tab(s, stageLabel(s), counts[s]))}
          {HOLDS.map((s) => tab(s, stageLabel(s), counts[s], true))}
        </ul>
      </nav>

      <details className="rounded-2xl border border-paper-200 bg-white p-4 lg:open:pb-4" open={filtersActive || undefined}>
        <summary className="min-h-11 cursor-pointer content-center font-semibold text-ink-950">
          Filters and order{filtersActive ? ' (filtered)' : ''}
        </summary>
        <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          <Field label="Technician">
            <select
              className={controlClasses}
              value={params.technician ?? ''}
              onChange={(e) => onChange({ technician: e.target.value || undefined, page: undefined })}
            >
              <option value="">Anyone</option>
              <option value="unassigned">Unassigned</option>
              {board.data?.filters.technicians.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Skill">
            <select
              className={controlClasses}
              value={params.skill ?? ''}
              onChange={(e) => onChange({ skill: e.target.value || undefined, page: undefined })}
            >
              <option value="">Any skill</option>
              {board.data?.filters.skills.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Instrument family">
            <select
              className={controlClasses}
              value={params.family ?? ''}
              onChange={(e) => onChange({ family: e.target.value || undefined, page: undefined })}
            >
              <option value="">Every family</option>
              {INSTRUMENT_FAMILIES.map((f) => (
                <option key={f} value={f}>
                  {familyLabel(f)}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Order by">
            <select
              className={controlClasses}
              value={params.sort ?? 'promised'}
              onChange={(e) => onChange({ sort: e.target.value === 'promised' ? undefined : e.target.value, dir: undefined, page: undefined })}
            >
              {BOARD_SORTS.map((s) => (
                <option key={s} value={s}>
                  {BOARD_SORT_LABELS[s]}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Direction">
            <select
              className={controlClasses}
              value={params.dir ?? ''}
              onChange={(e) => onChange({ dir: e.target.value || undefined, page: undefined })}
            >
              <option value="">Usual (soonest promise, newest change)</option>
              <option value="asc">Ascending</option>
              <option value="desc">Descending</option>
            </select>
          </Field>
          <label className="flex min-h-11 items-center gap-3 self-end font-semibold text-ink-800">
            <input
              type="checkbox"
              className="size-5 accent-accent-600"
              checked={params.overdue === 'true'}
              onChange={(e) => onChange({ overdue: e.target.checked ? 'true' : undefined, page: undefined })}
            />
            Overdue only
          </label>
        </div>
        {filtersActive ? (
          <Button
            variant="quiet"
            className="mt-3"
            onClick={() => onChange({ technician: undefined, skill: undefined, family: undefined, overdue: undefined, page: undefined })}
          >
            Clear filters
          </Button>
        ) : null}
      </details>

      {board.isPending ? (
        <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
          <Spinner label="Loading the board…" showLabel />
        </div>
      ) : board.isError ? (
        <ErrorState title="The board could not be loaded" error={board.error} onRetry={() => void board.refetch()} retrying={board.isFetching} />
      ) : board.data.jobs.length === 0 ? (
        <EmptyState title={filtersActive || stage !== 'open' ? 'No jobs match' : 'The board is clear'}>
          {filtersActive || stage !== 'open'
            ? 'Try another stage or clear the filters.'
            : 'No open jobs at this shop. New intakes appear here.'}
        </EmptyState>
      ) : (
        <>
          <p className="text-sm text-ink-600" aria-live="polite">
            {board.data.total} {board.data.total === 1 ? 'job' : 'jobs'}
            {stage !== 'open' && stage !== 'all' ? ` at ${stageLabel(stage as JobStage)}` : ''}
            {board.isFetching ? ' · updating…' : ''}
          </p>
          <JobList jobs={board.data.jobs} linkTo={linkTo} label="Jobs on the board" />
          <Pager
            page={page}
            pageSize={pageSize}
            total={board.data.total}
            onPage={(p) => onChange({ page: p === 1 ? undefined : String(p) })}
            onPageSize={(size) => onChange({ pageSize: size === 25 ? undefined : String(size), page: undefined })}
          />
        </>
      )}
    </div>
  );
}

function Pager(props: { page: number; pageSize: number; total: number; onPage: (page: number) => void; onPageSize: (size: number) => void }) {
  const pages = Math.max(1, Math.ceil(props.total / props.pageSize));
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3">
      <div className="flex items-center gap-2">
        <Button variant="secondary" disabled={props.page <= 1} onClick={() => props.onPage(props.page - 1)}>
          Previous
        </Button>
        <span className="px-2 text-sm text-ink-800 tabular-nums">
          Page {props.page} of {pages}
        </span>
        <Button variant="secondary" disabled={props.page >= pages} onClick={() => props.onPage(props.page + 1)}>
          Next
        </Button>
      </div>
      <label className="flex items-center gap-2 text-sm whitespace-nowrap text-ink-800">
        Per page
        <select className={cn(controlClasses, 'w-auto')} value={props.pageSize} onChange={(e) => props.onPageSize(Number(e.target.value))}>
          {BOARD_PAGE_SIZES.map((n) => (
            <option key={n} value={n}>
              {n}
            </option>
          ))}
        </select>
      </label>
    </nav>
  );
}
