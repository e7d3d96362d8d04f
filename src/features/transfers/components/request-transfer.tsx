import { useId, useState, type FormEvent } from 'react';
import { subject } from '@casl/ability';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '@shared/domain';
import { createTransferSchema } from '@shared/transfers';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import { useAppAbility } from '@/lib/ability';
import { formatLocalDate } from '../format';
import { recommendationQueryOptions, requestableJobsQueryOptions, useRequestTransfer } from '../queries';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { RankingList } from './ranking-list';

interface RequestTransferProps {
  shop: { id: string; name: string } | undefined;
  jobId: string | null;
  onPickJob: (jobId: string | null) => void;
  onCreated: (transferId: string) => void;
  hrefFor: (path: string) => string;
}

/** Request a transfer: pick a job (or arrive with one), see the ranked shops and why, name the reason. */
export function RequestTransfer({ shop, jobId, onPickJob, onCreated, hrefFor }: RequestTransferProps) {
  if (!jobId) return <JobPicker shop={shop} onPick={onPickJob} />;
  return <RecommendationForm jobId={jobId} onChangeJob={() => onPickJob(null)} onCreated={onCreated} hrefFor={hrefFor} />;
}

function JobPicker({ shop, onPick }: { shop: { id: string; name: string } | undefined; onPick: (jobId: string) => void }) {
  const ability = useAppAbility();
  const allowed = !!shop && ability.can('request', subject('Transfer', { fromShopId: shop.id }));
  const jobs = useQuery({ ...requestableJobsQueryOptions(shop?.id ?? ''), enabled: allowed });
  const selectId = useId();
  const [choice, setChoice] = useState('');

  if (!shop) return <EmptyState title="Choose a shop first">Pick the shop the job is at in the shop menu.</EmptyState>;
  if (!allowed) {
    return <EmptyState title={`You cannot send transfers from ${shop.name}`}>Switch to a shop where you may request transfers.</EmptyState>;
  }
  if (jobs.isPending) return <Spinner label="Loading open jobs…" showLabel />;
  if (jobs.isError) return <ErrorState title="The open jobs could not be loaded" error={jobs.error} onRetry={() => void jobs.refetch()} />;
  if (!jobs.data.length) {
    return <EmptyState title={`No job at ${shop.name} can travel now`}>Jobs that are ready, released, on the road or already being transferred are not listed.</EmptyState>;
  }
  return (
    <Card as="section">
      <CardTitle>Which job?</CardTitle>
      <p className="mt-1 text-sm text-ink-600">Open jobs at {shop.name} that could go to another shop.</p>
      <form
        className="mt-4 flex flex-col gap-3 sm:flex-row sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          if (choice) onPick(choice);
        }}
      >
        <div className="flex flex-1 flex-col gap-1">
          <label htmlFor={selectId} className="text-sm font-medium text-ink-800">
            Job
          </label>
          <select
            id={selectId}
            value={choice}
            onChange={(e) => setChoice(e.target.value)}
            className="min-h-11 w-full rounded-lg border border-paper-300 bg-white px-3 text-sm text-ink-950"
          >
            <option value="">Choose a job…</option>
            {jobs.data.map((j) => (
              <option key={j.id} value={j.id}>
                Job {j.number} · {INSTRUMENT_FAMILY_LABELS[j.instrument.family]} {j.instrument.serial} · {JOB_STAGE_LABELS[j.stage]}
                {j.requiredSkill ? ` · ${j.requiredSkill.name}` : ''}
              </option>
            ))}
          </select>
        </div>
        <Button type="submit" disabled={!choice}>
          Show where it could go
        </Button>
      </form>
    </Card>
  );
}

function RecommendationForm({
  jobId,
  onChangeJob,
  onCreated,
  hrefFor,
}: {
  jobId: string;
  onChangeJob: () => void;
  onCreated: (id: string) => void;
  hrefFor: (path: string) => string;
}) {
  const [skillId, setSkillId] = useState<string | undefined>(undefined);
  const rec = useQuery(recommendationQueryOptions(jobId, skillId));
  const create = useRequestTransfer();
  const [pickedShopId, setToShopId] = useState<string | null>(null);
  const [typedReason, setReason] = useState('');
  const [reasonTouched, setReasonTouched] = useState(false);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const reasonId = useId();
  const skillSelectId = useId();

  const data = rec.data;
  const recommended = data?.ranked.find((r) => r.shopId === data.recommendedShopId);
  // preselect the recommendation and suggest a reason from it, until the person writes their own
  const pickedIsOffered = !!pickedShopId && !!data?.ranked.some((r) => r.shopId === pickedShopId && !r.isOrigin);
  const toShopId = data && !pickedIsOffered ? data.recommendedShopId : pickedShopId;
  const suggested = data?.ranked.find((r) => r.shopId === toShopId);
  const reason =
    reasonTouched || !data?.skill
      ? typedReason
      : suggested?.finishDate
        ? `Needs ${data.skill.name.toLowerCase()} work: ${suggested.shopName} would finish it soonest, by ${formatLocalDate(suggested.finishDate)}.`
        : '';

  if (rec.isPending) return <Spinner label="Ranking the shops…" showLabel />;
  if (rec.isError) {
    return (
      <ErrorState
        title={isApiError(rec.error) && rec.error.status === 404 ? 'That job was not found' : 'The recommendation could not be made'}
        error={rec.error}
        onRetry={() => void rec.refetch()}
      />
    );
  }
  const job = data!.job;

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    const parsed = createTransferSchema.safeParse({ jobId, toShopId: toShopId ?? undefined, reason });
    if (!parsed.success) {
      const errors: FieldErrors = {};
      for (const issue of parsed.error.issues) errors[issue.path.join('.')] ??= issue.message;
      setFieldErrors(errors);
      return;
    }
    setFieldErrors({});
    try {
      const created = await create.mutateAsync(parsed.data);
      onCreated(created.id);
    } catch (err) {
      if (isApiError(err)) setFieldErrors(err.fieldErrors);
    }
  };

  return (
    <div className="flex flex-col gap-6">
      <Card as="section" aria-label="The job">
        <div className="flex flex-wrap items-start justify-between gap-3">
          <div>
            <CardTitle>
              Job {job.number}: {INSTRUMENT_FAMILY_LABELS[job.instrument.family]}
            </CardTitle>
            <p className="mt-1 text-sm text-ink-600">
              {[job.instrument.maker, job.instrument.model].filter(Boolean).join(' ')} · serial{' '}
              <span className="font-mono text-ink-800">{job.instrument.serial}</span> · at {job.shop.name} · {JOB_STAGE_LABELS[job.stage]}
              {job.estimatedHours != null ? ` · ${job.estimatedHours} h estimated` : ' · no estimate yet'}
            </p>
            <p className="mt-2 text-ink-800">{job.complaint}</p>
          </div>
          <Button variant="secondary" onClick={onChangeJob}>
            Choose another job
          </Button>
        </div>
        <div className="mt-4 flex flex-col gap-1 sm:max-w-sm">
          <label htmlFor={skillSelectId} className="text-sm font-medium text-ink-800">
            Skill it needs
          </label>
          <select
            id={skillSelectId}
            value={data!.skill?.id ?? ''}
            onChange={(e) => setSkillId(e.target.value || undefined)}
            className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 text-sm text-ink-950"
          >
            {!data!.skill ? <option value="">Choose a skill…</option> : null}
            {data!.skills.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </div>
      </Card>

      {!job.transferable ? (
        <div role="status" className="rounded-2xl border border-paper-300 bg-paper-50 p-5 text-ink-800">
          {job.openTransferId ? (
            <>
              This job already has a transfer under way.{' '}
              <Link className="font-semibold text-accent-700 underline" to={hrefFor(`/transfers/${job.openTransferId}`)}>
                Open that transfer
              </Link>
            </>
          ) : (
            `A job that is ${JOB_STAGE_LABELS[job.stage].toLowerCase()} cannot be transferred.`
          )}
        </div>
      ) : null}

      {!data!.skill ? (
        <EmptyState title="Which skill does this job need?">Choose the skill above to rank the shops that have it.</EmptyState>
      ) : data!.ranked.length === 0 ? (
        <EmptyState title={`No shop offers ${data!.skill.name.toLowerCase()}`}>Add the skill to a shop, or choose another skill.</EmptyState>
      ) : (
        <form onSubmit={(event) => void submit(event)} noValidate className="flex flex-col gap-6">
          <RankingList
            ranked={data!.ranked}
            recommendedShopId={data!.recommendedShopId}
            selectedShopId={toShopId}
            onSelect={setToShopId}
            name="destination"
          />
          {fieldErrors.toShopId ? (
            <p role="alert" className="text-sm font-medium text-danger-700">
              {fieldErrors.toShopId}
            </p>
          ) : null}
          {!recommended ? <p className="text-ink-600">No other shop can take this job.</p> : null}
          {toShopId && data!.withoutReceiver?.includes(toShopId) ? (
            <p role="alert" className="rounded-lg border border-danger-200 bg-danger-50 px-3 py-2 text-sm text-danger-700">
              Nobody at {data!.ranked.find((r) => r.shopId === toShopId)?.shopName ?? 'that shop'} may receive transfers (no front desk or
              regional manager there): only the owner could confirm receipt. Give someone there that role before the instrument arrives.
            </p>
          ) : null}
          {job.instrument.heavyCase ? (
            <HazardCautions hazards={['heavy_lift']} />
          ) : null}
          <div className="flex flex-col gap-1">
            <label htmlFor={reasonId} className="text-sm font-medium text-ink-800">
              Reason
            </label>
            <textarea
              id={reasonId}
              rows={3}
              value={reason}
              onChange={(e) => {
                setReasonTouched(true);
                setReason(e.target.value);
              }}
              aria-invalid={!!fieldErrors.reason}
              aria-describedby={fieldErrors.reason ? `${reasonId}-error` : undefined}
              className="rounded-lg border border-paper-300 bg-white px-3 py-2 text-ink-950"
            />
            {fieldErrors.reason ? (
              <p id={`${reasonId}-error`} className="text-sm font-medium text-danger-700">
                {fieldErrors.reason}
              </p>
            ) : null}
          </div>
          {create.isError && isApiError(create.error) && !Object.keys(create.error.fieldErrors).length ? (
            <p role="alert" className="text-sm font-medium text-danger-700">
              {create.error.message}
            </p>
          ) : null}
          <div>
            <Button type="submit" size="lg" disabled={create.isPending || !job.transferable || !toShopId}>
              {create.isPending ? 'Requesting…' : 'Request transfer'}
            </Button>
          </div>
        </form>
      )}
    </div>
  );
}
