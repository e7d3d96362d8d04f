import { PRIVATE_CUSTOMER_LABEL } from '@shared/registry';
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { JobSummary } from '@shared/jobs/dto';
import { familyLabel, formatPromise } from '../format';
import { OverdueBadge, StageBadge } from './stage-badge';

interface JobListProps {
  jobs: JobSummary[];
  /** Builds the link to a job (the route adds the current shop). */
  linkTo: (job: JobSummary) => string;
  /** Show which shop each job is at (my bench across several shops). */
  showShop?: boolean;
  label: string;
  /** Shown under a job's card, outside its link (My bench puts the job's safety cautions there). */
  below?: (job: JobSummary) => ReactNode;
}

/** Jobs as cards: one column on a phone, readable at arm's length at the bench. */
export function JobList({ jobs, linkTo, showShop = false, label, below }: JobListProps) {
  return (
    <ul aria-label={label} className="grid gap-3 md:grid-cols-2 xl:grid-cols-3">
      {jobs.map((job) => (
        <li key={job.id} className="flex flex-col gap-2">
          <Link
            to={linkTo(job)}
            className="flex h-full flex-col gap-2 rounded-2xl border border-paper-200 bg-white p-4 hover:border-accent-200 hover:bg-accent-50/40"
          >
            <div className="flex flex-wrap items-center gap-2">
              <span className="font-bold tabular-nums text-ink-950">Job {job.number}</span>
              <StageBadge stage={job.stage} />
              {job.overdue ? <OverdueBadge /> : null}
            </div>
            <p className="font-semibold text-ink-950">
              {familyLabel(job.instrument.family)} · {job.instrument.maker}
              {job.instrument.model ? ` ${job.instrument.model}` : ''}
            </p>
            <p className="text-sm text-ink-600">
              Serial <span className="font-mono">{job.instrument.serial}</span>
              {job.customerName ? ` · ${job.customerName}` : job.customerHidden ? ` · ${PRIVATE_CUSTOMER_LABEL}` : ''}
            </p>
            {job.complaint ? <p className="line-clamp-2 text-sm text-ink-800">{job.complaint}</p> : null}
            <dl className="mt-auto grid grid-cols-2 gap-x-3 gap-y-1 pt-2 text-sm">
              <dt className="text-ink-600">Promised</dt>
              <dd className={job.overdue ? 'font-semibold text-danger-700' : 'text-ink-950'}>{formatPromise(job.promisedOn)}</dd>
              <dt className="text-ink-600">Technician</dt>
              <dd className="text-ink-950">{job.assignee?.name ?? 'Unassigned'}</dd>
              {job.requiredSkill ? (
                <>
                  <dt className="text-ink-600">Skill</dt>
                  <dd className="text-ink-950">{job.requiredSkill.name}</dd>
                </>
              ) : null}
              {showShop ? (
                <>
                  <dt className="text-ink-600">Shop</dt>
                  <dd className="text-ink-950">{job.shop.name}</dd>
                </>
              ) : null}
            </dl>
          </Link>
          {below?.(job)}
        </li>
      ))}
    </ul>
  );
}
