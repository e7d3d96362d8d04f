import { useQuery } from '@tanstack/react-query';
import { useMemo, useState, type FormEvent } from 'react';
import { closingDayInputSchema } from '@shared/schemas/shops';
import { formatCalendarDate, localDate, upcomingPublicHolidays } from '@shared/jobs/promised-date';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { Field, FormMessage, TextInput } from '@/components/ui/form-field';
import { Spinner } from '@/components/ui/spinner';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useAddClosingDay, useRemoveClosingDay } from '../mutations';
import { closingDaysQueryOptions, type ShopDetail } from '../queries';

/**
 * The days the owner closes this shop (a stocktake, a move), which promised dates and turnaround skip, and
 * beside them, read-only, the public holidays of the shop's country and region for the coming 12 months,
 * which are skipped already.
 */
export function ClosingDaysEditor({ shop, canEdit }: { shop: ShopDetail; canEdit: boolean }) {
  const days = useQuery(closingDaysQueryOptions(shop.id));
  const add = useAddClosingDay(shop.id);
  const remove = useRemoveClosingDay(shop.id);
  const [date, setDate] = useState('');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const today = localDate(new Date(), shop.timeZone);
  const holidays = useMemo(() => upcomingPublicHolidays(shop.country, shop.region, today, 365), [shop.country, shop.region, today]);

  function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const parsed = closingDayInputSchema.safeParse({ date, reason });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    add.mutate(parsed.data, {
      onSuccess: () => {
        setMessage({ tone: 'success', text: `Closed on ${formatCalendarDate(parsed.data.date)}.` });
        setDate('');
        setReason('');
      },
      onError: (e) => {
        setErrors(serverFieldErrors(e));
        setMessage({ tone: 'error', text: errorMessage(e) });
      },
    });
  }

  function removeDay(day: string) {
    if (!window.confirm(`Open ${shop.name} again on ${formatCalendarDate(day)}? Promises made from now on count that day.`)) return;
    setMessage(null);
    remove.mutate(day, {
      onSuccess: () => setMessage({ tone: 'success', text: `${formatCalendarDate(day)} is an opening day again.` }),
      onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
    });
  }

  return (
    <Card as="section" aria-labelledby="closing-days-heading" className="flex flex-col gap-4">
      <CardTitle id="closing-days-heading">Closing days</CardTitle>
      <p className="text-sm text-ink-800">
        Days {shop.name} is closed besides its weekly days off. Promised dates and turnaround in business days skip them.
      </p>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      <div className="grid grid-cols-1 gap-6 md:grid-cols-2">
        <div className="flex min-w-0 flex-col gap-3">
          <h3 className="font-semibold text-ink-950">Set by you</h3>
          {days.isPending ? (
            <Spinner label="Loading the closing days…" showLabel />
          ) : days.isError ? (
            <ErrorState title="The closing days could not be loaded" error={days.error} onRetry={() => void days.refetch()} />
          ) : days.data.length === 0 ? (
            <p className="text-ink-600">No closing days set.</p>
          ) : (
            <ul className="flex flex-col divide-y divide-paper-200" aria-label="Closing days set by the owner">
              {days.data.map((d) => (
                <li key={d.date} className="flex flex-wrap items-center justify-between gap-2 py-2">
                  <div className="min-w-0">
                    <p className="font-semibold text-ink-950">
                      {formatCalendarDate(d.date)}
                      {d.date < today ? <span className="ml-2 text-sm font-normal text-ink-600">(past)</span> : null}
                    </p>
                    <p className="break-words text-sm text-ink-800">{d.reason}</p>
                  </div>
                  {canEdit ? (
                    <Button variant="quiet" disabled={remove.isPending} onClick={() => removeDay(d.date)}>
                      Remove<span className="sr-only"> the closing day {formatCalendarDate(d.date)}</span>
                    </Button>
                  ) : null}
                </li>
              ))}
            </ul>
          )}
          {canEdit ? (
            <form onSubmit={submit} noValidate className="flex flex-col gap-3 border-t border-paper-200 pt-3" aria-label="Add a closing day">
              <Field label="Day" error={errors.date}>
                <TextInput type="date" value={date} onChange={(e) => setDate(e.target.value)} />
              </Field>
              <Field label="Reason" error={errors.reason} hint="e.g. Stocktake, bench move">
                <TextInput value={reason} maxLength={200} onChange={(e) => setReason(e.target.value)} />
              </Field>
              <div>
                <Button type="submit" disabled={add.isPending}>
                  {add.isPending ? 'Adding…' : 'Add closing day'}
                </Button>
              </div>
            </form>
          ) : null}
        </div>
        <div className="flex min-w-0 flex-col gap-3">
          <h3 className="font-semibold text-ink-950">Public holidays, next 12 months</h3>
          <p className="text-sm text-ink-600">
            {shop.country}
            {shop.region ? ` · ${shop.region}` : ''} — counted already; change the country or region in Details.
          </p>
          {holidays.length === 0 ? (
            <p className="text-ink-600">No public holidays known for this country.</p>
          ) : (
            <ul className="flex flex-col divide-y divide-paper-200" aria-label="Public holidays">
              {holidays.map((h) => (
                <li key={`${h.date}-${h.name}`} className="flex flex-wrap justify-between gap-x-3 py-1.5 text-sm">
                  <span className="text-ink-950">{formatCalendarDate(h.date)}</span>
                  <span className="min-w-0 break-words text-ink-800">{h.name}</span>
                </li>
              ))}
            </ul>
          )}
        </div>
      </div>
    </Card>
  );
}
