import { useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { INSTRUMENT_FAMILIES } from '@shared/domain';
import { hasAtMostTwoDecimals } from '@shared/jobs/estimate';
import type { CatalogItemDto, PersonRef } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { controlClasses, FormError } from '@/components/ui/form-controls';
import { HazardCheckboxes } from '@/components/ui/hazard-checkboxes';
import { Spinner } from '@/components/ui/spinner';
import type { Hazard } from '@shared/safety/hazards';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { catalogQueryOptions, jobApi, jobKeys } from '../queries';
import { familyLabel, amountProblem } from '../format';

interface Draft {
  name: string;
  family: string;
  standardHours: string;
  skillId: string;
  active: boolean;
  hazards: Hazard[];
}

const toDraft = (i?: CatalogItemDto): Draft => ({
  name: i?.name ?? '',
  family: i?.family ?? '',
  standardHours: i ? String(i.standardHours) : '',
  skillId: i?.skill?.id ?? '',
  active: i?.active ?? true,
  hazards: i?.hazards ?? [],
});

const toBody = (d: Draft) => ({
  name: d.name,
  family: d.family || null,
  standardHours: Number(d.standardHours),
  skillId: d.skillId || null,
  active: d.active,
  hazards: d.hazards,
});

const hoursOk = (text: string) => /^\d+([.]\d+)?$/.test(text) && hasAtMostTwoDecimals(Number(text));

/** The network's services with their standard hours: one row each, edited in place by the owner. */
export function ServiceCatalogEditor() {
  const catalog = useQuery(catalogQueryOptions(undefined, true));
  if (catalog.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Loading the catalog…" showLabel />
      </div>
    );
  }
  if (catalog.isError) {
    return <ErrorState title="The catalog could not be loaded" error={catalog.error} onRetry={() => void catalog.refetch()} />;
  }
  return (
    <div className="flex flex-col gap-6">
      <div className="overflow-x-auto rounded-2xl border border-paper-200 bg-white">
        <table className="w-full min-w-[56rem] table-fixed text-left text-sm">
          <caption className="sr-only">Service catalog</caption>
          <colgroup>
            <col className="w-[32%]" />
            <col className="w-[18%]" />
            <col className="w-[11%]" />
            <col className="w-[20%]" />
            <col className="w-[10%]" />
            <col className="w-[9%]" />
          </colgroup>
          <thead className="border-b border-paper-200 bg-paper-50 text-ink-600">
            <tr>
              <th scope="col" className="px-3 py-3 font-semibold">Service</th>
              <th scope="col" className="px-3 py-3 font-semibold">Family</th>
              <th scope="col" className="px-3 py-3 font-semibold">Standard hours</th>
              <th scope="col" className="px-3 py-3 font-semibold">Skill</th>
              <th scope="col" className="px-3 py-3 font-semibold">Offered</th>
              <th scope="col" className="px-3 py-3"><span className="sr-only">Save</span></th>
            </tr>
          </thead>
          <tbody>
            <CatalogRow key="new" skills={catalog.data.skills} />
            {catalog.data.items.map((item) => (
              <CatalogRow key={item.id} item={item} skills={catalog.data.skills} />
            ))}
          </tbody>
        </table>
      </div>
      {catalog.data.items.length === 0 ? (
        <EmptyState title="No services yet">Add the first service in the top row: its name, family and standard hours.</EmptyState>
      ) : null}
    </div>
  );
}

function CatalogRow({ item, skills }: { item?: CatalogItemDto; skills: PersonRef[] }) {
  const queryClient = useQueryClient();
  const [draft, setDraft] = useState<Draft>(() => toDraft(item));
  const save = useMutation({
    mutationFn: (d: Draft) => (item ? jobApi.updateCatalogItem(item.id, toBody(d)) : jobApi.createCatalogItem(toBody(d))),
    onSuccess: () => {
      if (!item) setDraft(toDraft());
      void queryClient.invalidateQueries({ queryKey: [...jobKeys.all, 'catalog'] });
    },
  });
  const errors = isApiError(save.error) ? save.error.fieldErrors : {};
  const changed = JSON.stringify(draft) !== JSON.stringify(toDraft(item));
  const label = item ? item.name : 'New service';
  const set = (patch: Partial<Draft>) => setDraft((d) => ({ ...d, ...patch }));
  const hoursError = errors.standardHours ?? (draft.standardHours && !hoursOk(draft.standardHours) ? (amountProblem(String(draft.standardHours)) ?? 'Hours with at most two decimals.') : undefined);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    save.mutate(draft);
  };
  const formId = `catalog-${item?.id ?? 'new'}`;
  const rowClass = cn(!item && 'bg-accent-50/40', item && !item.active && 'text-ink-600');
  return (
    <>
    <tr className={cn(rowClass, 'border-t border-paper-200')}>
      <td className="px-3 py-2 align-top">
        <form id={formId} onSubmit={submit} />
        <input
          form={formId}
          aria-label={`Name of ${label}`}
          className={controlClasses}
          value={draft.name}
          placeholder={item ? undefined : 'e.g. Neck cork replacement'}
          onChange={(e) => set({ name: e.target.value })}
          required
          maxLength={200}
        />
        {errors.name ? <p className="mt-1 text-danger-700">{errors.name}</p> : null}
      </td>
      <td className="px-3 py-2 align-top">
        <select form={formId} aria-label={`Family of ${label}`} className={controlClasses} value={draft.family} onChange={(e) => set({ family: e.target.value })}>
          <option value="">{familyLabel(null)}</option>
          {INSTRUMENT_FAMILIES.map((f) => (
            <option key={f} value={f}>
              {familyLabel(f)}
            </option>
          ))}
        </select>
      </td>
      <td className="px-3 py-2 align-top">
        <input
          form={formId}
          aria-label={`Standard hours of ${label}`}
          inputMode="decimal"
          className={controlClasses}
          value={draft.standardHours}
          onChange={(e) => set({ standardHours: e.target.value })}
          aria-invalid={hoursError ? true : undefined}
          required
        />
        {hoursError ? <p className="mt-1 text-danger-700">{hoursError}</p> : null}
      </td>
      <td className="px-3 py-2 align-top">
        <select form={formId} aria-label={`Skill for ${label}`} className={controlClasses} value={draft.skillId} onChange={(e) => set({ skillId: e.target.value })}>
          <option value="">None</option>
          {skills.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </select>
      </td>
      <td className="px-3 py-2 align-top">
        <label className="flex min-h-11 items-center gap-2">
          <input form={formId} type="checkbox" className="size-5 accent-accent-600" checked={draft.active} onChange={(e) => set({ active: e.target.checked })} />
          <span className="sr-only">{label} is </span>offered
        </label>
      </td>
      <td className="px-3 py-2 align-top">
        <Button type="submit" form={formId} variant={item ? 'secondary' : 'primary'} disabled={!changed || save.isPending || Boolean(hoursError)}>
          {save.isPending ? 'Saving…' : item ? 'Save' : 'Add'}
          <span className="sr-only"> {label}</span>
        </Button>
        <FormError message={save.error && !Object.keys(errors).length ? (isApiError(save.error) ? save.error.message : 'Not saved.') : null} />
      </td>
    </tr>
    <tr className={rowClass}>
      <td colSpan={6} className="px-3 pb-3">
        <HazardCheckboxes of={label} form={formId} value={draft.hazards} onChange={(hazards) => set({ hazards })} error={errors.hazards} />
      </td>
    </tr>
    </>
  );
}
