import { useId, useState, type FormEvent } from 'react';
import { shopInputSchema, type ShopInput } from '@shared/schemas/shops';
import { Button } from '@/components/ui/button';
import { CheckboxGroup, Field, FormMessage, TextInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { zodFieldErrors } from '@/lib/form-errors';
import type { Shop } from '../queries';
import { basisPointsToPercent, centsToInput, parseMoney, percentToBasisPoints } from '@shared/money';
import { timeZoneNames, WEEKDAYS } from '../weekdays';

interface ShopFormProps {
  shop?: Shop;
  submitLabel: string;
  pending: boolean;
  /** Field errors and a message from the server's answer, if the last save was refused. */
  serverErrors?: FieldErrors;
  message?: { tone: 'success' | 'error'; text: string } | null;
  onSubmit: (input: ShopInput) => void;
}

const text = (v: string | null | undefined) => v ?? '';
const numberOrNull = (v: string) => (v.trim() === '' ? null : Number(v));

/** A shop's name, place, clock, opening days and rates. Money is typed in dollars and sent in cents. */
export function ShopForm({ shop, submitLabel, pending, serverErrors = {}, message, onSubmit }: ShopFormProps) {
  const zonesId = useId();
  const [v, setV] = useState(() => ({
    name: text(shop?.name),
    code: text(shop?.code),
    addressLine: text(shop?.addressLine),
    city: text(shop?.city),
    region: text(shop?.region),
    postalCode: text(shop?.postalCode),
    country: shop?.country ?? 'US',
    latitude: shop?.latitude != null ? String(shop.latitude) : '',
    longitude: shop?.longitude != null ? String(shop.longitude) : '',
    timeZone: shop?.timeZone ?? '',
    openingDays: shop?.openingDays ?? [1, 2, 3, 4, 5],
    laborRate: shop ? centsToInput(shop.laborRateCents) : '',
    taxRate: shop ? basisPointsToPercent(shop.taxRateBasisPoints) : '0',
    phone: text(shop?.phone),
    email: text(shop?.email),
    active: shop?.active ?? true,
  }));
  const [errors, setErrors] = useState<FieldErrors>({});
  const shown = { ...errors, ...serverErrors };
  const set = (key: keyof typeof v) => (e: { target: { value: string } }) => setV({ ...v, [key]: e.target.value });

  function submit(event: FormEvent) {
    event.preventDefault();
    const laborRateCents = parseMoney(v.laborRate) ?? undefined;
    const taxRateBasisPoints = percentToBasisPoints(v.taxRate);
    const input = {
      name: v.name, code: v.code, addressLine: v.addressLine, city: v.city, region: v.region, postalCode: v.postalCode,
      country: v.country, latitude: numberOrNull(v.latitude), longitude: numberOrNull(v.longitude), timeZone: v.timeZone,
      openingDays: v.openingDays, laborRateCents, taxRateBasisPoints, phone: v.phone, email: v.email, active: v.active,
    };
    const parsed = shopInputSchema.safeParse(input);
    const found = parsed.success ? {} : zodFieldErrors(parsed.error);
    if (laborRateCents === undefined) found.laborRateCents = 'Enter dollars and cents, e.g. 92.50.';
    if (taxRateBasisPoints === undefined) found.taxRateBasisPoints = 'Enter a percentage, e.g. 8.25.';
    setErrors(found);
    if (Object.keys(found).length === 0) onSubmit(input as ShopInput);
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-5">
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-[3fr_1fr]">
        <Field label="Shop name" error={shown.name}>
          <TextInput value={v.name} onChange={set('name')} autoComplete="off" />
        </Field>
        <Field label="Code" hint="On labels, e.g. SEA" error={shown.code}>
          <TextInput value={v.code} onChange={set('code')} autoComplete="off" maxLength={8} className="uppercase" />
        </Field>
      </div>
      <Field label="Street address" error={shown.addressLine}>
        <TextInput value={v.addressLine} onChange={set('addressLine')} autoComplete="off" />
      </Field>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-4">
        <Field label="City" error={shown.city} className="sm:col-span-2">
          <TextInput value={v.city} onChange={set('city')} autoComplete="off" />
        </Field>
        <Field label="Region" error={shown.region}>
          <TextInput value={v.region} onChange={set('region')} autoComplete="off" />
        </Field>
        <Field label="Postal code" error={shown.postalCode}>
          <TextInput value={v.postalCode} onChange={set('postalCode')} autoComplete="off" />
        </Field>
      </div>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-3">
        <Field label="Country" hint="Two letters, e.g. US" error={shown.country}>
          <TextInput value={v.country} onChange={set('country')} maxLength={2} className="uppercase" />
        </Field>
        <Field label="Latitude" hint="Decimal degrees, e.g. 47.6062" error={shown.latitude}>
          <TextInput value={v.latitude} onChange={set('latitude')} inputMode="decimal" />
        </Field>
        <Field label="Longitude" hint="e.g. -122.3321" error={shown.longitude}>
          <TextInput value={v.longitude} onChange={set('longitude')} inputMode="text" />
        </Field>
      </div>
      <Field label="Time zone" hint="Dates are shown in the shop’s own time zone, e.g. America/Denver." error={shown.timeZone}>
        <TextInput value={v.timeZone} onChange={set('timeZone')} list={zonesId} autoComplete="off" />
      </Field>
      <datalist id={zonesId}>
        {timeZoneNames().map((z) => (
          <option key={z} value={z} />
        ))}
      </datalist>
      <CheckboxGroup
        legend="Opening days"
        options={WEEKDAYS}
        value={v.openingDays}
        onChange={(openingDays) => setV({ ...v, openingDays })}
        error={shown.openingDays}
      />
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
        <Field label="Labor rate (dollars per hour)" error={shown.laborRateCents}>
          <TextInput value={v.laborRate} onChange={set('laborRate')} inputMode="decimal" />
        </Field>
        <Field label="Sales tax (%)" error={shown.taxRateBasisPoints}>
          <TextInput value={v.taxRate} onChange={set('taxRate')} inputMode="decimal" />
        </Field>
      </div>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
        <Field label="Phone" error={shown.phone}>
          <TextInput value={v.phone} onChange={set('phone')} type="tel" autoComplete="off" />
        </Field>
        <Field label="Shop e-mail" error={shown.email}>
          <TextInput value={v.email} onChange={set('email')} type="email" autoComplete="off" />
        </Field>
      </div>
      <label className="flex min-h-11 items-center gap-3 text-sm text-ink-800">
        <input type="checkbox" className="size-5 accent-accent-600" checked={v.active} onChange={(e) => setV({ ...v, active: e.target.checked })} />
        Open for work (a closed shop keeps its history but takes no new jobs)
      </label>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      <div>
        <Button type="submit" disabled={pending}>
          {pending ? 'Saving…' : submitLabel}
        </Button>
      </div>
    </form>
  );
}
