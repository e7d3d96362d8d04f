import { useState, type FormEvent } from 'react';
import { APPROVAL_MEANING, customerDecisionSchema, type PublicJobView, type PublicShop } from '@shared/customers/public-page';
import { formatBasisPoints } from '@shared/jobs/estimate';
import { formatCents } from '@shared/money';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { isApiError } from '@/lib/api-client';
import { useCustomerDecision } from '../queries';

function ShopCard({ title, shop }: { title: string; shop: PublicShop }) {
  return (
    <div className="rounded-xl border border-paper-200 p-4">
      <h3 className="text-sm font-semibold uppercase tracking-wide text-ink-600">{title}</h3>
      <p className="mt-1 font-semibold text-ink-950">{shop.name}</p>
      {shop.address ? <p className="text-ink-800">{shop.address}</p> : null}
      <p className="text-ink-800">Open {shop.openDays}</p>
      {shop.phone ? (
        <p>
          <a className="font-medium text-accent-700 underline underline-offset-2" href={`tel:${shop.phone.replace(/[^+\d]/g, '')}`}>
            {shop.phone}
          </a>
        </p>
      ) : null}
      {shop.email ? (
        <p>
          <a className="font-medium text-accent-700 underline underline-offset-2 [overflow-wrap:anywhere]" href={`mailto:${shop.email}`}>
            {shop.email}
          </a>
        </p>
      ) : null}
    </div>
  );
}

/** Approve or decline with the typed name; the answer is for the version on screen. */
function DecisionForm({ token, view }: { token: string; view: PublicJobView }) {
  const [name, setName] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const decide = useCustomerDecision(token);
  const estimate = view.estimate!;
  const serverFields = isApiError(decide.error) ? decide.error.fieldErrors : {};

  const send = (decision: 'approved' | 'declined') => (event?: FormEvent) => {
    event?.preventDefault();
    const parsed = customerDecisionSchema.safeParse({ decision, name, estimateVersion: estimate.version });
    if (!parsed.success) {
      setFieldError(parsed.error.issues.find((i) => i.path[0] === 'name')?.message ?? 'Type your name.');
      return;
    }
    setFieldError(undefined);
    decide.mutate(parsed.data);
  };

  return (
    <form onSubmit={send('approved')} className="flex flex-col gap-4" aria-label="Your answer to the estimate" noValidate>
      <p className="text-ink-800">{APPROVAL_MEANING}</p>
      <Field label="Your full name" hint="Typing your name signs your answer." error={fieldError ?? serverFields.name}>
        <input className={controlClasses} value={name} onChange={(e) => setName(e.target.value)} maxLength={200} autoComplete="name" />
      </Field>
      <FormError
        message={decide.error && !serverFields.name ? (isApiError(decide.error) ? decide.error.message : 'Your answer was not sent. Try again.') : null}
      />
      <div className="flex flex-col gap-3 sm:flex-row">
        <Button type="submit" size="lg" disabled={decide.isPending} className="w-full sm:w-auto">
          {decide.isPending ? 'Sending…' : `Approve ${formatCents(estimate.totalCents)}`}
        </Button>
        <Button type="button" variant="secondary" size="lg" disabled={decide.isPending} onClick={() => send('declined')()} className="w-full sm:w-auto">
          Decline
        </Button>
      </div>
    </form>
  );
}

function ApprovalStatus({ view }: { view: PublicJobView }) {
  const { approval, estimate } = view;
  if (!estimate) return null;
  const approved = approval.approved;
  return (
    <div className="flex flex-col gap-2" aria-live="polite">
      {approval.status === 'approved' && approved ? (
        <p className="rounded-lg bg-accent-50 px-3 py-2 text-accent-800" data-approval-status="approved">
          Approved: {formatCents(approved.totalCents)} (version {approved.version}), {approved.at}, {approved.method}.
        </p>
      ) : null}
      {approval.status === 'needs_reapproval' && approved ? (
        <p role="status" className="rounded-lg border border-danger-200 bg-danger-50 px-3 py-2 text-ink-950" data-approval-status="needs_reapproval">
          You approved <strong>{formatCents(approved.totalCents)}</strong> (version {approved.version}). The estimate is now{' '}
          <strong>{formatCents(estimate.totalCents)}</strong> (version {estimate.version}); the work above what you approved waits for your
          answer.
        </p>
      ) : null}
      {approval.status === 'declined' ? (
        <p className="rounded-lg border border-paper-300 bg-paper-100 px-3 py-2 text-ink-950" data-approval-status="declined">
          You declined this estimate{approval.declinedAt ? ` on ${approval.declinedAt}` : ''}. The shop will contact you; you can still approve
          it below.
        </p>
      ) : null}
      {approval.status === 'awaiting' ? <p className="text-ink-800">This estimate waits for your answer.</p> : null}
    </div>
  );
}

/** The customer's page: phone first, one column, nothing of the network but this job. */
export function CustomerJobPage({ token, view }: { token: string; view: PublicJobView }) {
  const { job, instrument, estimate } = view;
  const sameShop = view.shopNow.name === view.pickupShop.name;
  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-1">
        <p className="text-sm font-semibold uppercase tracking-wide text-ink-600">Job {job.number}</p>
        <h1 className="text-2xl font-bold text-ink-950">
          {instrument.family}
          <span className="block text-lg font-medium text-ink-800">
            {[instrument.maker, instrument.model].filter(Boolean).join(' ')} · serial ending {instrument.serialEnding.replace('…', '')}
          </span>
        </h1>
      </header>

      <section aria-labelledby="stage-title" className="rounded-xl bg-paper-100 p-4">
        <h2 id="stage-title" className="text-sm font-semibold uppercase tracking-wide text-ink-600">
          Where things stand
        </h2>
        <p className="mt-1 text-lg text-ink-950" data-stage={job.stage}>
          {job.stageText}
        </p>
        <p className="mt-2 text-ink-800">{job.promisedOn ? <>Promised for <strong>{job.promisedOn}</strong>.</> : 'No date promised yet.'}</p>
      </section>

      <section aria-labelledby="shops-title" className="flex flex-col gap-3">
        <h2 id="shops-title" className="text-lg font-semibold text-ink-950">
          Shops
        </h2>
        {sameShop ? (
          <ShopCard title="It is at, and you collect it from" shop={view.pickupShop} />
        ) : (
          <>
            <ShopCard title="It is now at" shop={view.shopNow} />
            <ShopCard title="You collect it from" shop={view.pickupShop} />
          </>
        )}
      </section>

      <section aria-labelledby="estimate-title" className="flex flex-col gap-3">
        <h2 id="estimate-title" className="text-lg font-semibold text-ink-950">
          Estimate{estimate ? ` (version ${estimate.version})` : ''}
        </h2>
        {estimate ? (
          <>
            <table className="w-full text-left">
              <caption className="sr-only">Estimate lines</caption>
              <thead>
                <tr className="border-b border-paper-300 text-sm text-ink-600">
                  <th scope="col" className="py-2 pr-2 font-semibold">
                    Work and parts
                  </th>
                  <th scope="col" className="py-2 text-right font-semibold">
                    Amount
                  </th>
                </tr>
              </thead>
              <tbody>
                {estimate.lines.map((line, i) => (
                  <tr key={i} className="border-b border-paper-200 align-top">
                    <td className="py-2 pr-2 text-ink-950">{line.description}</td>
                    <td className="py-2 text-right tabular-nums text-ink-950">{formatCents(line.totalCents)}</td>
                  </tr>
                ))}
              </tbody>
              <tfoot>
                <tr>
                  <th scope="row" className="pt-2 pr-2 text-left font-normal text-ink-800">
                    Subtotal
                  </th>
                  <td className="pt-2 text-right tabular-nums">{formatCents(estimate.subtotalCents)}</td>
                </tr>
                <tr>
                  <th scope="row" className="pr-2 text-left font-normal text-ink-800">
                    Tax ({formatBasisPoints(estimate.taxRateBasisPoints)})
                  </th>
                  <td className="text-right tabular-nums">{formatCents(estimate.taxCents)}</td>
                </tr>
                <tr className="text-lg">
                  <th scope="row" className="pt-1 pr-2 text-left font-bold text-ink-950">
                    Total
                  </th>
                  <td className="pt-1 text-right font-bold tabular-nums text-ink-950" data-estimate-total>
                    {formatCents(estimate.totalCents)}
                  </td>
                </tr>
              </tfoot>
            </table>
            {estimate.poNumber || estimate.taxExemptCertificate ? (
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-ink-800">
                {estimate.poNumber ? (
                  <>
                    <dt>Purchase order</dt>
                    <dd className="font-medium text-ink-950">{estimate.poNumber}</dd>
                  </>
                ) : null}
                {estimate.taxExemptCertificate ? (
                  <>
                    <dt>Tax-exempt certificate</dt>
                    <dd className="font-medium text-ink-950">{estimate.taxExemptCertificate}</dd>
                  </>
                ) : null}
              </dl>
            ) : null}
            <ApprovalStatus view={view} />
            {view.approval.canDecide ? <DecisionForm token={token} view={view} /> : null}
          </>
        ) : (
          <p className="text-ink-800">The shop has not written the estimate yet. You will get an e-mail when it is ready.</p>
        )}
      </section>
      <p className="text-sm text-ink-600">
        This page is private to you: anyone with the link can read it, so do not forward it. The shop can turn the link off at any time.
      </p>
    </div>
  );
}
