import { useState, type FormEvent } from 'react';
import { useMutation } from '@tanstack/react-query';
import type { JobDetail } from '@shared/jobs/dto';
import { ESTIMATE_APPROVAL_METHOD_LABELS } from '@shared/jobs/schemas';
import { formatCents } from '@shared/money';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { isApiError } from '@/lib/api-client';
import { jobApi, useJobMutation } from '../queries';
import { formatInShop } from '../format';

function CustomerPaperwork({ detail }: { detail: JobDetail }) {
  const customer = detail.customer!;
  const jobId = detail.job.id;
  const [po, setPo] = useState(customer.poNumber ?? '');
  const [certificate, setCertificate] = useState(customer.taxExemptCertificate ?? '');
  const [optOut, setOptOut] = useState(customer.noticesOptOut);
  const save = useJobMutation(jobId, (body: object) => jobApi.updateCustomer(jobId, body));
  const fields = isApiError(save.error) ? save.error.fieldErrors : {};
  const submit = (event: FormEvent) => {
    event.preventDefault();
    save.mutate({ poNumber: po.trim() || null, taxExemptCertificate: certificate.trim() || null, noticesOptOut: optOut });
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Customer paperwork and notices">
      {customer.kind !== 'person' ? (
        <>
          <Field label="Purchase order" hint="Printed on the estimate and the invoice." error={fields.poNumber}>
            <input className={controlClasses} value={po} onChange={(e) => setPo(e.target.value)} maxLength={100} autoComplete="off" />
          </Field>
          <Field label="Tax-exempt certificate" error={fields.taxExemptCertificate}>
            <input className={controlClasses} value={certificate} onChange={(e) => setCertificate(e.target.value)} maxLength={100} autoComplete="off" />
          </Field>
        </>
      ) : null}
      <label className="flex min-h-11 items-center gap-2">
        <input type="checkbox" checked={optOut} onChange={(e) => setOptOut(e.target.checked)} className="size-5 accent-accent-600" />
        No notices by e-mail (estimates that need approval still go out)
      </label>
      <FormError message={save.error && !Object.keys(fields).length ? errorText(save.error) : null} />
      <Button type="submit" variant="secondary" disabled={save.isPending}>
        {save.isPending ? 'Saving…' : 'Save customer details'}
      </Button>
    </form>
  );
}

const errorText = (error: unknown) => (error ? (isApiError(error) ? error.message : 'That did not work. Try again.') : null);

/**
 * The customer's side of the job for the front desk: every approval and decline, the estimate e-mail (with
 * its PDF and a fresh private link), a link to copy once, and revoking every link the customer holds.
 */
export function CustomerLinkPanel({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const tz = detail.shop.timeZone;
  const [copyUrl, setCopyUrl] = useState<string | null>(null);
  const send = useJobMutation(jobId, () => jobApi.sendEstimate(jobId));
  const revoke = useJobMutation(jobId, () => jobApi.revokeCustomerLinks(jobId));
  const issue = useMutation({ mutationFn: () => jobApi.issueCustomerLink(jobId), onSuccess: (r) => setCopyUrl(r.url) });
  const link = detail.customerLink;

  return (
    <div className="flex flex-col gap-4">
      {detail.estimateDecisions.length ? (
        <div>
          <h3 className="text-sm font-semibold text-ink-800">Answers to the estimate</h3>
          <ul className="mt-1 flex flex-col gap-1" data-estimate-decisions>
            {detail.estimateDecisions.map((d) => (
              <li key={d.id} className="text-ink-950">
                <strong>{d.decision === 'approved' ? 'Approved' : 'Declined'}</strong> {formatCents(d.totalCents)} (v{d.version})
                {d.name ? ` by ${d.name}` : ''}, {ESTIMATE_APPROVAL_METHOD_LABELS[d.method].toLowerCase()}, {formatInShop(d.at, tz)}
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {detail.customer?.poNumber || detail.customer?.taxExemptCertificate ? (
        <p className="text-ink-800">
          {detail.customer.poNumber ? <>Purchase order <strong>{detail.customer.poNumber}</strong>. </> : null}
          {detail.customer.taxExemptCertificate ? <>Tax-exempt certificate <strong>{detail.customer.taxExemptCertificate}</strong>.</> : null}
        </p>
      ) : null}
      <p className="text-ink-700">
        {link.live ? `${link.live} customer ${link.live === 1 ? 'link is' : 'links are'} open` : 'No customer link is open'}
        {link.lastOpenedAt ? `; last opened ${formatInShop(link.lastOpenedAt, tz)}` : ''}.
      </p>
      {detail.can.customerLink ? (
        <div className="flex flex-col gap-2">
          <div className="flex flex-wrap gap-2">
            {detail.job.stage !== 'intake' ? (
              <Button onClick={() => send.mutate(undefined)} disabled={send.isPending}>
                {send.isPending ? 'Sending…' : 'Send estimate'}
              </Button>
            ) : null}
            <Button variant="secondary" onClick={() => issue.mutate()} disabled={issue.isPending}>
              New link to copy
            </Button>
            {link.live ? (
              <Button variant="quiet" onClick={() => revoke.mutate(undefined)} disabled={revoke.isPending}>
                Revoke customer links
              </Button>
            ) : null}
          </div>
          {send.isSuccess ? <p role="status" className="text-accent-800">The estimate is on its way to the customer.</p> : null}
          {copyUrl ? (
            <div role="status" className="rounded-lg bg-paper-100 p-3">
              <p className="text-sm text-ink-800">Shown once. Give it only to the customer:</p>
              <input readOnly aria-label="Customer link" value={copyUrl} className="mt-1 w-full rounded border border-paper-300 bg-white px-2 py-1 font-mono text-sm" onFocus={(e) => e.currentTarget.select()} />
            </div>
          ) : null}
          <FormError message={errorText(send.error) ?? errorText(issue.error) ?? errorText(revoke.error)} />
        </div>
      ) : null}
      {detail.can.customerLink && detail.customer?.contactShown ? <CustomerPaperwork detail={detail} /> : null}
    </div>
  );
}
