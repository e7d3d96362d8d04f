import { useState, type FormEvent } from 'react';
import { ESTIMATE_APPROVAL_METHOD_LABELS, ESTIMATE_APPROVAL_METHODS, type EstimateApprovalMethod } from '@shared/jobs/schemas';
import type { JobDetail } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { isApiError } from '@/lib/api-client';
import { jobApi, useJobMutation } from '../queries';
import { formatInShop } from '../format';
import { formatCents } from '@shared/money';

/** Who approved the estimate, when and how. At Assessed, recording it moves the job to Approved. */
export function ApprovalForm({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const approval = detail.job.estimateApproval;
  const [name, setName] = useState(detail.customer?.name ?? '');
  const [method, setMethod] = useState<EstimateApprovalMethod>('phone');
  const [when, setWhen] = useState('');
  const save = useJobMutation(jobId, (body: object) => jobApi.approve(jobId, body));
  const errors = isApiError(save.error) ? save.error.fieldErrors : {};

  const submit = (event: FormEvent) => {
    event.preventDefault();
    save.mutate({ approvedByName: name, method, ...(when ? { approvedAt: new Date(when).toISOString() } : {}) });
  };

  return (
    <div className="flex flex-col gap-4">
      {approval ? (
        <p className="rounded-lg bg-accent-50 px-3 py-2 text-accent-800">
          Approved {approval.byName ? <>by <strong>{approval.byName}</strong> </> : null}({ESTIMATE_APPROVAL_METHOD_LABELS[approval.method].toLowerCase()}),{' '}
          {formatInShop(approval.at, detail.shop.timeZone)}
          {approval.totalCents != null ? `: ${formatCents(approval.totalCents)} (v${approval.version ?? 0})` : ''}.
        </p>
      ) : null}
      {approval && detail.job.needsReapproval && approval.totalCents != null ? (
        <p role="alert" className="rounded-lg border border-danger-200 bg-danger-50 px-3 py-2 text-danger-700" data-reapproval>
          Approved {formatCents(approval.totalCents)} (v{approval.version ?? 0}); now {formatCents(detail.totals.totalCents)} (v
          {detail.job.estimateVersion}) — needs a new approval. Work does not move on to the bench, quality check, ready or release until
          the front desk records it.
        </p>
      ) : null}
      {approval ? null : (
        <p className="text-ink-600">The customer has not approved the estimate yet.</p>
      )}
      {detail.can.recordApproval ? (
        <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Record approval">
          <Field label="Approved by" error={errors.approvedByName}>
            <input className={controlClasses} value={name} onChange={(e) => setName(e.target.value)} required maxLength={200} autoComplete="off" />
          </Field>
          <fieldset className="flex flex-col gap-2">
            <legend className="text-sm font-semibold text-ink-800">How</legend>
            <div className="flex flex-wrap gap-2">
              {ESTIMATE_APPROVAL_METHODS.map((m) => (
                <label key={m} className="flex min-h-11 items-center gap-2 rounded-lg border border-paper-300 px-3 has-[:checked]:border-accent-600 has-[:checked]:bg-accent-50">
                  <input type="radio" name="approval-method" value={m} checked={method === m} onChange={() => setMethod(m)} className="accent-accent-600" />
                  {ESTIMATE_APPROVAL_METHOD_LABELS[m]}
                </label>
              ))}
            </div>
            {errors.method ? <p className="text-sm text-danger-700">{errors.method}</p> : null}
          </fieldset>
          <Field label="When" hint="Leave empty for now." error={errors.approvedAt}>
            <input type="datetime-local" className={controlClasses} value={when} onChange={(e) => setWhen(e.target.value)} />
          </Field>
          <FormError message={save.error && !Object.keys(errors).length ? (isApiError(save.error) ? save.error.message : 'Not saved. Try again.') : null} />
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : approval ? 'Record a new approval' : 'Record approval'}
          </Button>
        </form>
      ) : null}
    </div>
  );
}
