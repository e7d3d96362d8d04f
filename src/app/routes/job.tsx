import { PRIVATE_CUSTOMER_LABEL } from '@shared/registry';
import { useState, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { subject } from '@casl/ability';
import { useAppAbility } from '@/lib/ability';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { PageSpinner } from '@/components/ui/spinner';
import { ApprovalForm } from '@/features/jobs/components/approval-form';
import { CustomerLinkPanel } from '@/features/jobs/components/customer-link-panel';
import { EstimateEditor } from '@/features/jobs/components/estimate-editor';
import { JobDetailsForm } from '@/features/jobs/components/job-details-form';
import { JobHistory } from '@/features/jobs/components/job-history';
import { OverdueBadge, StageBadge } from '@/features/jobs/components/stage-badge';
import { StageActions } from '@/features/jobs/components/stage-actions';
import { TimeLog } from '@/features/jobs/components/time-log';
import { familyLabel, formatPromise } from '@/features/jobs/format';
import { jobQueryOptions } from '@/features/jobs/queries';
import { DocumentsPanel } from '@/features/files/components/documents-panel';
import { PhotosPanel } from '@/features/files/components/photos-panel';
import { formatCents } from '@shared/money';
import { formatDateTime } from '@shared/time/format';
import type { JobDetail } from '@shared/jobs/dto';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

function Section({ id, title, children, className }: { id: string; title: string; children: ReactNode; className?: string }) {
  return (
    <Card as="section" aria-labelledby={id} className={className}>
      <CardTitle id={id} className="mb-4">
        {title}
      </CardTitle>
      {children}
    </Card>
  );
}

/** One job at the bench: what to do next first, then photos, the estimate and the rest. */
export function JobRoute() {
  const { jobId = '' } = useParams();
  const { currentShop } = useCurrentShop();
  const job = useQuery(jobQueryOptions(jobId));
  const ability = useAppAbility();
  useDocumentTitle(job.data ? `Job ${job.data.job.number}` : 'Job');

  if (job.isPending) return <PageSpinner label="Loading the job…" />;
  if (job.isError) {
    if (isApiError(job.error) && job.error.status === 404) {
      return (
        <EmptyState title="Job not found" action={<ButtonLink to={withShop('/jobs', currentShop?.id)}>Back to the board</ButtonLink>}>
          This job does not exist, or it is not one you can see.
        </EmptyState>
      );
    }
    return <ErrorState title="The job could not be loaded" error={job.error} onRetry={() => void job.refetch()} retrying={job.isFetching} />;
  }

  const d = job.data;
  const { instrument } = d.job;
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-3">
        <Link to={withShop('/jobs', currentShop?.id)} className="text-sm font-semibold text-accent-800 hover:underline">
          ← Job board
        </Link>
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">Job {d.job.number}</h1>
          <StageBadge stage={d.job.stage} className="text-sm" />
          {d.job.overdue ? <OverdueBadge /> : null}
        </div>
        <p className="text-lg font-semibold text-ink-950">
          {familyLabel(instrument.family)} · {instrument.maker}
          {instrument.model ? ` ${instrument.model}` : ''} · serial <span className="font-mono">{instrument.serial}</span>
        </p>
        <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
          <div>
            <dt className="text-ink-600">Promised</dt>
            <dd className={d.job.overdue ? 'font-semibold text-danger-700' : 'font-semibold'}>{formatPromise(d.job.promisedOn)}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Technician</dt>
            <dd className="font-semibold">{d.job.assignee?.name ?? 'Unassigned'}</dd>
          </div>
          <div>
            <dt className="text-ink-600">Customer</dt>
            <dd className="font-semibold">
              {d.customer ? (d.customer.name ?? PRIVATE_CUSTOMER_LABEL) : 'Rental fleet'}
              {d.customer?.contactShown && (d.customer.phone || d.customer.email) ? (
                <span className="block font-normal text-ink-800">{[d.customer.phone, d.customer.email].filter(Boolean).join(' · ')}</span>
              ) : null}
            </dd>
          </div>
          <div>
            <dt className="text-ink-600">Estimate</dt>
            <dd className="font-semibold">{formatCents(d.totals.totalCents)}</dd>
          </div>
        </dl>
        {d.job.openTransfer ? <OpenTransferNote t={d.job.openTransfer} href={withShop(`/transfers/${d.job.openTransfer.id}`, currentShop?.id)} /> : null}
        {d.job.complaint ? <p className="max-w-prose text-ink-800">“{d.job.complaint}”</p> : null}
        <nav aria-label="This job elsewhere" className="flex flex-wrap gap-x-5 gap-y-2 text-sm">
          <Link className="font-semibold text-accent-800 hover:underline" to={withShop(`/registry/instruments/${instrument.id}`, currentShop?.id)}>
            Instrument history
          </Link>
          {ability.can('read', subject('PadMap', { shopId: d.shop.id })) ? (
            <Link className="font-semibold text-accent-800 hover:underline" to={withShop(`/jobs/${d.job.id}/pad-map`, currentShop?.id)}>
              Pad map
            </Link>
          ) : null}
          {d.job.stage !== 'released' && !d.job.openTransfer && ability.can('request', subject('Transfer', { fromShopId: d.shop.id })) ? (
            <Link className="font-semibold text-accent-800 hover:underline" to={withShop(`/transfers/new?job=${d.job.id}`, currentShop?.id)}>
              Request transfer to another shop
            </Link>
          ) : null}
        </nav>
      </div>

      <Section id="job-next" title="Next step">
        <StageActions detail={d} />
      </Section>

      <div className="grid gap-6 lg:grid-cols-2">
        <Section id="job-photos" title="Photos" className="lg:col-span-2">
          <PhotosPanel jobId={d.job.id} canAdd={d.can.addAttachment && d.job.stage !== 'released'} />
          <p className="mt-4 text-sm">
            <Link className="font-semibold text-accent-800 hover:underline" to={withShop(`/instruments/${instrument.id}/photos`, currentShop?.id)}>
              Photos of this instrument from every visit
            </Link>
          </p>
        </Section>
        <Section id="job-estimate" title="Estimate" className="lg:col-span-2">
          <EstimateEditor detail={d} />
        </Section>
        <Section id="job-approval" title="Customer approval">
          <ApprovalForm detail={d} />
          <div className="mt-4 border-t border-paper-200 pt-4">
            <CustomerLinkPanel detail={d} />
          </div>
        </Section>
        <Section id="job-details" title="Details">
          <JobDetailsForm key={d.job.updatedAt} detail={d} />
        </Section>
        <Section id="job-time" title="Time log">
          <TimeLog detail={d} />
        </Section>
        <Section id="job-documents" title="Documents">
          <DocumentsPanel jobId={d.job.id} canAdd={d.can.addAttachment && d.job.stage !== 'released'} />
        </Section>
        <Section id="job-history" title="History" className="lg:col-span-2">
          <JobHistory detail={d} />
        </Section>
      </div>
    </div>
  );
}

const TRANSFER_STEP_WORDS: Record<NonNullable<JobDetail['job']['openTransfer']>['state'], string> = {
  requested: 'waits for a manager’s approval',
  approved: 'is approved; it waits to be packed',
  packed: 'is packed; it waits for the hand-over',
  in_transit: 'is on the road',
};

/** A transfer under way, said where the job is read, with a link to follow it. */
function OpenTransferNote({ t, href }: { t: NonNullable<JobDetail['job']['openTransfer']>; href: string }) {
  // the clock as the note first showed; rendering again must not change what it says
  const [shownAt] = useState(Date.now);
  const waiting = t.state === 'in_transit' && t.onRelayRun && t.departedAt && Date.parse(t.departedAt) > shownAt;
  return (
    <p role="status" aria-label="Open transfer" className="max-w-prose rounded-lg border border-accent-200 bg-accent-50 px-3 py-2 text-accent-800">
      {t.state === 'in_transit' && t.onRelayRun ? (
        <>
          On the relay run from {t.fromShop.name} to {t.toShop.name}
          {t.departedAt ? `, ${waiting ? 'leaving' : 'left'} ${formatDateTime(t.departedAt, t.fromShop.timeZone)}` : ''}
          {t.expectedArrivalAt ? `, expected ${formatDateTime(t.expectedArrivalAt, t.toShop.timeZone)}` : ''}.
        </>
      ) : (
        <>
          A transfer from {t.fromShop.name} to {t.toShop.name} {TRANSFER_STEP_WORDS[t.state]}
          {t.expectedArrivalAt ? `, expected ${formatDateTime(t.expectedArrivalAt, t.toShop.timeZone)}` : ''}.
        </>
      )}{' '}
      <Link to={href} className="font-semibold underline underline-offset-2">
        Open the transfer
      </Link>
    </p>
  );
}
