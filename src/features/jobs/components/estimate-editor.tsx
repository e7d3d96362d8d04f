import { useMemo, useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  estimateTotals,
  formatBasisPoints,
  hasAtMostTwoDecimals,
  lineTotalCents,
  type EstimateLine,
} from '@shared/jobs/estimate';
import type { JobDetail, LineItemDto } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { catalogQueryOptions, jobApi, useJobMutation } from '../queries';
import { centsToInput, formatCents, parseMoney } from '@shared/money';
import { amountProblem } from '../format';

const parseAmount = (text: string): number | null => {
  if (!/^\s*\d+([.,]\d+)?\s*$/.test(text)) return null;
  const n = Number(text.replace(',', '.'));
  return Number.isFinite(n) && hasAtMostTwoDecimals(n) ? n : null;
};

function asLine(item: LineItemDto, draft?: string): EstimateLine {
  const edited = draft !== undefined ? parseAmount(draft) : null;
  return item.kind === 'labor'
    ? { kind: 'labor', hours: edited ?? item.hours ?? 0, rateCents: item.rateCents ?? 0 }
    : { kind: 'part', quantity: edited ?? item.quantity ?? 0, unitPriceCents: item.unitPriceCents ?? 0 };
}

const errorText = (error: unknown) => (error ? (isApiError(error) ? error.message : 'That could not be saved. Try again.') : null);
const fieldErrors = (error: unknown) => (isApiError(error) ? error.fieldErrors : {});

/**
 * Line items and the estimate total. The totals are computed here with the same shared function the
 * server uses, so what a person sees while typing is exactly what will be stored and e-mailed.
 */
export function EstimateEditor({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const editable = detail.can.editEstimate;
  const [drafts, setDrafts] = useState<Record<string, string>>({});
  const update = useJobMutation(jobId, (v: { itemId: string; body: object }) => jobApi.updateLine(jobId, v.itemId, v.body));
  const remove = useJobMutation(jobId, (itemId: string) => jobApi.removeLine(jobId, itemId));

  const lines = detail.lineItems;
  const totals = useMemo(
    () => estimateTotals(lines.map((l) => asLine(l, drafts[l.id])), detail.shop.taxRateBasisPoints),
    [lines, drafts, detail.shop.taxRateBasisPoints],
  );
  const unsaved = Object.keys(drafts).length > 0;

  const saveLine = (item: LineItemDto) => {
    const draft = drafts[item.id];
    if (draft === undefined) return;
    const value = parseAmount(draft);
    if (value === null || value <= 0) return;
    update.mutate(
      { itemId: item.id, body: item.kind === 'labor' ? { hours: value } : { quantity: value } },
      {
        onSuccess: () =>
          setDrafts((d) => {
            const { [item.id]: _, ...rest } = d;
            return rest;
          }),
      },
    );
  };

  return (
    <div className="flex flex-col gap-5">
      {lines.length === 0 ? (
        <p className="text-ink-600">No lines yet. Add labor from the service catalog and the parts the work needs.</p>
      ) : (
        <ul aria-label="Estimate lines" className="divide-y divide-paper-200 rounded-xl border border-paper-200">
          {lines.map((item, i) => {
            const draft = drafts[item.id];
            const invalid = draft !== undefined && (parseAmount(draft) === null || parseAmount(draft) === 0);
            return (
              <li key={item.id} className="flex flex-col gap-2 p-3">
                <div className="flex items-start justify-between gap-3">
                  <div>
                    <p className="font-semibold text-ink-950">{item.description}</p>
                    <p className="text-sm text-ink-600">
                      {item.kind === 'labor'
                        ? `Labor at ${formatCents(item.rateCents ?? 0)} per hour`
                        : `Part at ${formatCents(item.unitPriceCents ?? 0)} each`}
                    </p>
                  </div>
                  <p className="font-semibold tabular-nums text-ink-950">{formatCents(totals.lineCents[i])}</p>
                </div>
                <div className="flex flex-wrap items-end gap-2">
                  {editable ? (
                    <>
                      <label className="flex items-center gap-2 text-sm text-ink-800">
                        {item.kind === 'labor' ? 'Hours' : 'Quantity'}
                        <input
                          inputMode="decimal"
                          className={cn(controlClasses, 'w-24')}
                          aria-invalid={invalid || undefined}
                          value={draft ?? String(item.kind === 'labor' ? item.hours : item.quantity)}
                          onChange={(e) => setDrafts((d) => ({ ...d, [item.id]: e.target.value }))}
                          onBlur={() => saveLine(item)}
                          onKeyDown={(e) => e.key === 'Enter' && saveLine(item)}
                        />
                      </label>
                      <Button variant="quiet" onClick={() => remove.mutate(item.id)} disabled={remove.isPending}>
                        Remove<span className="sr-only"> {item.description}</span>
                      </Button>
                    </>
                  ) : (
                    <p className="text-sm text-ink-800">
                      {item.kind === 'labor' ? `${item.hours} h` : `× ${item.quantity}`}
                    </p>
                  )}
                </div>
                {invalid ? <p className="text-sm text-danger-700">{amountProblem(draft ?? '') ?? 'Enter a number above zero.'}</p> : null}
                <HazardCautions cautions={item.cautions} label={`Safety cautions for ${item.description}`} />
              </li>
            );
          })}
        </ul>
      )}

      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 rounded-xl bg-paper-50 p-4 text-sm" aria-label="Estimate totals">
        <dt className="text-ink-600">Labor</dt>
        <dd className="text-right tabular-nums">{formatCents(totals.laborCents)}</dd>
        <dt className="text-ink-600">Parts</dt>
        <dd className="text-right tabular-nums">{formatCents(totals.partsCents)}</dd>
        <dt className="text-ink-600">Subtotal</dt>
        <dd className="text-right tabular-nums">{formatCents(totals.subtotalCents)}</dd>
        <dt className="text-ink-600">Tax ({formatBasisPoints(totals.taxRateBasisPoints)})</dt>
        <dd className="text-right tabular-nums">{formatCents(totals.taxCents)}</dd>
        <dt className="text-base font-bold text-ink-950">Total</dt>
        <dd className="text-right text-base font-bold tabular-nums text-ink-950" data-testid="estimate-total">
          {formatCents(totals.totalCents)}
        </dd>
      </dl>
      <p className="text-xs text-ink-600">
        Each line is rounded to the cent (half a cent rounds up); tax is worked out once on the subtotal.
        {unsaved ? ' Includes changes not saved yet.' : ''}
      </p>
      <FormError message={errorText(update.error) ?? errorText(remove.error)} />

      {editable ? (
        <div className="grid gap-4 lg:grid-cols-2">
          <AddLaborForm detail={detail} />
          <AddPartForm detail={detail} />
        </div>
      ) : (
        <p className="text-sm text-ink-600">The estimate is final: the work is done.</p>
      )}
    </div>
  );
}

function AddLaborForm({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const catalog = useQuery(catalogQueryOptions(detail.job.instrument.family));
  const [catalogItemId, setCatalogItemId] = useState('');
  const [hours, setHours] = useState('');
  const add = useJobMutation(jobId, (body: object) => jobApi.addLine(jobId, body));
  const chosen = catalog.data?.items.find((i) => i.id === catalogItemId);
  const hoursValue = hours.trim() ? parseAmount(hours) : (chosen?.standardHours ?? null);
  const preview =
    chosen && hoursValue !== null ? lineTotalCents({ kind: 'labor', hours: hoursValue, rateCents: detail.shop.laborRateCents }) : null;

  const submit = (event: FormEvent) => {
    event.preventDefault();
    if (!chosen) return;
    add.mutate(
      { kind: 'labor', catalogItemId, ...(hours.trim() ? { hours: parseAmount(hours) ?? hours } : {}) },
      {
        onSuccess: () => {
          setCatalogItemId('');
          setHours('');
        },
      },
    );
  };
  const errors = fieldErrors(add.error);
  return (
    <form onSubmit={submit} className="flex flex-col gap-3 rounded-xl border border-paper-200 p-4" aria-label="Add labor">
      <h3 className="font-semibold text-ink-950">Add labor</h3>
      <Field label="Service" error={errors.catalogItemId}>
        <select className={controlClasses} value={catalogItemId} onChange={(e) => setCatalogItemId(e.target.value)} required>
          <option value="">{catalog.isPending ? 'Loading the catalog…' : 'Choose a service'}</option>
          {catalog.data?.items.map((i) => (
            <option key={i.id} value={i.id}>
              {i.name} · {i.standardHours} h
            </option>
          ))}
        </select>
      </Field>
      <Field
        label="Hours"
        error={errors.hours ?? (parseAmount(hours) === null ? amountProblem(hours) : undefined)}
        hint={`At ${formatCents(detail.shop.laborRateCents)} per hour${chosen ? `; standard ${chosen.standardHours} h` : ''}.`}
      >
        <input inputMode="decimal" className={controlClasses} value={hours} placeholder={chosen ? String(chosen.standardHours) : ''} onChange={(e) => setHours(e.target.value)} />
      </Field>
      {chosen ? <HazardCautions cautions={chosen.cautions} label={`Safety cautions for ${chosen.name}`} /> : null}
      {preview !== null ? <p className="text-sm text-ink-800">This line: {formatCents(preview)}</p> : null}
      <FormError message={add.error && !Object.keys(errors).length ? errorText(add.error) : null} />
      <Button type="submit" disabled={!chosen || add.isPending}>
        {add.isPending ? 'Adding…' : 'Add labor'}
      </Button>
    </form>
  );
}

function AddPartForm({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const [description, setDescription] = useState('');
  const [quantity, setQuantity] = useState('1');
  const [price, setPrice] = useState('');
  const add = useJobMutation(jobId, (body: object) => jobApi.addLine(jobId, body));
  const q = parseAmount(quantity);
  const cents = parseMoney(price);
  const preview = q !== null && q > 0 && cents !== null ? lineTotalCents({ kind: 'part', quantity: q, unitPriceCents: cents }) : null;
  const errors = fieldErrors(add.error);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    add.mutate(
      { kind: 'part', description, quantity: q ?? quantity, unitPriceCents: cents ?? price },
      {
        onSuccess: () => {
          setDescription('');
          setQuantity('1');
          setPrice('');
        },
      },
    );
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3 rounded-xl border border-paper-200 p-4" aria-label="Add a part">
      <h3 className="font-semibold text-ink-950">Add a part</h3>
      <Field label="Part" error={errors.description}>
        <input className={controlClasses} value={description} onChange={(e) => setDescription(e.target.value)} required maxLength={300} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field label="Quantity" error={errors.quantity ?? (q === null ? amountProblem(quantity, '2') : undefined)}>
          <input inputMode="decimal" className={controlClasses} value={quantity} onChange={(e) => setQuantity(e.target.value)} required />
        </Field>
        <Field label="Unit price ($)" error={errors.unitPriceCents ?? (price && cents === null ? (/[^\d\s$.,]/.test(price) ? 'Enter a number, e.g. 12.50.' : 'An amount like 12.50.') : undefined)}>
          <input inputMode="decimal" className={controlClasses} value={price} onChange={(e) => setPrice(e.target.value)} placeholder={centsToInput(0)} required />
        </Field>
      </div>
      {preview !== null ? <p className="text-sm text-ink-800">This line: {formatCents(preview)}</p> : null}
      <FormError message={add.error && !Object.keys(errors).length ? errorText(add.error) : null} />
      <Button type="submit" disabled={add.isPending || !description.trim() || q === null || cents === null}>
        {add.isPending ? 'Adding…' : 'Add part'}
      </Button>
    </form>
  );
}
