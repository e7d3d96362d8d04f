import { useState, type FormEvent } from 'react';
import { relayRunInputSchema } from '@shared/schemas/shops';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { CheckboxGroup, Field, FormMessage, SelectInput, TextInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCreateRelayRun, useRemoveRelayRun, useUpdateRelayRun } from '../mutations';
import type { ShopDetail } from '../queries';
import { WEEKDAYS, weekdayNames } from '../weekdays';

/** Courier trips from this shop to the others (and those arriving), with days, departure and hours on the road. */
export function RelayRunsEditor({ shop, shops }: { shop: ShopDetail; shops: Array<{ id: string; name: string }> }) {
  const create = useCreateRelayRun();
  const update = useUpdateRelayRun();
  const remove = useRemoveRelayRun();
  const others = shops.filter((s) => s.id !== shop.id);
  const [toShopId, setToShopId] = useState('');
  const [weekdays, setWeekdays] = useState<number[]>([]);
  const [departureTime, setDepartureTime] = useState('07:30');
  const [transitHours, setTransitHours] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const fail = (e: unknown) => setMessage({ tone: 'error', text: errorMessage(e) });

  function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const parsed = relayRunInputSchema.safeParse({
      fromShopId: shop.id, toShopId, weekdays, departureTime, transitHours: transitHours.trim() === '' ? undefined : Number(transitHours),
    });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: () => {
        setMessage({ tone: 'success', text: 'Relay run added.' });
        setToShopId('');
        setWeekdays([]);
        setTransitHours('');
      },
      onError: (e) => {
        setErrors(serverFieldErrors(e));
        fail(e);
      },
    });
  }

  return (
    <Card as="section" aria-labelledby="runs-heading" className="flex flex-col gap-4">
      <CardTitle id="runs-heading">Relay runs</CardTitle>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      {shop.relayRuns.length === 0 ? (
        <p className="text-ink-600">No courier trips from or to this shop yet.</p>
      ) : (
        <ul className="flex flex-col divide-y divide-paper-200">
          {shop.relayRuns.map((run) => (
            <li key={run.id} className="flex flex-col gap-2 py-3 sm:flex-row sm:items-center sm:justify-between">
              <div>
                <p className="font-semibold text-ink-950">
                  {run.fromShopName} → {run.toShopName}
                  {!run.active ? <span className="ml-2 text-sm font-normal text-ink-600">(off)</span> : null}
                </p>
                <p className="text-sm text-ink-800">
                  {weekdayNames(run.weekdays)} at {run.departureTime} (origin’s local time) · {run.transitHours} h on the road
                </p>
              </div>
              <div className="flex gap-2">
                <Button variant="secondary" disabled={update.isPending} onClick={() => update.mutate({ id: run.id, active: !run.active }, { onError: fail })}>
                  {run.active ? 'Switch off' : 'Switch on'}
                </Button>
                <Button variant="quiet" disabled={remove.isPending}
                  onClick={() => remove.mutate(run.id, { onSuccess: (r) => setMessage({ tone: 'success', text: r.removed ? 'Relay run removed.' : 'It carried transfers, so it was switched off and kept.' }), onError: fail })}>
                  Remove<span className="sr-only"> the run {run.fromShopName} to {run.toShopName}</span>
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}

      {others.length ? (
        <form onSubmit={submit} noValidate className="flex flex-col gap-4 border-t border-paper-200 pt-4">
          <h3 className="font-semibold text-ink-950">Add a run from {shop.name}</h3>
          <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
            <Field label="To" error={errors.toShopId}>
              <SelectInput value={toShopId} onChange={(e) => setToShopId(e.target.value)}>
                <option value="">Choose a shop</option>
                {others.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </SelectInput>
            </Field>
            <Field label="Departs (24-hour)" error={errors.departureTime}>
              <TextInput type="time" value={departureTime} onChange={(e) => setDepartureTime(e.target.value)} />
            </Field>
            <Field label="Hours on the road" error={errors.transitHours}>
              <TextInput inputMode="decimal" value={transitHours} onChange={(e) => setTransitHours(e.target.value)} />
            </Field>
          </div>
          <CheckboxGroup legend="Days" options={WEEKDAYS} value={weekdays} onChange={setWeekdays} error={errors.weekdays} />
          <div>
            <Button type="submit" disabled={create.isPending}>
              {create.isPending ? 'Adding…' : 'Add relay run'}
            </Button>
          </div>
        </form>
      ) : null}
    </Card>
  );
}
