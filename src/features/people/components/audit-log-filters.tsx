import { useQuery } from '@tanstack/react-query';
import { Field, SelectInput, TextInput } from '@/components/ui/form-field';
import { Button } from '@/components/ui/button';
import { AUDIT_KIND_GROUPS, auditActionLabel, startOfLocalDay } from '../format';
import { peopleQueryOptions, type AuditFilters } from '../queries';

/** What the filter form holds: calendar days as typed, a kind as `entity:Shop` or `action:shop.updated`. */
export interface AuditFilterValues {
  personId: string;
  shopId: string;
  kind: string;
  fromDate: string;
  toDate: string;
}

export const emptyAuditFilters: AuditFilterValues = { personId: '', shopId: '', kind: '', fromDate: '', toDate: '' };

/** The form's values as the API's query: days become the viewer's midnights, the "to" day is included. */
export function toAuditQuery(v: AuditFilterValues): AuditFilters {
  const [kindOf, kindValue] = v.kind.split(':');
  return {
    personId: v.personId || undefined,
    shopId: v.shopId || undefined,
    entity: kindOf === 'entity' ? kindValue : undefined,
    action: kindOf === 'action' ? kindValue : undefined,
    from: v.fromDate ? startOfLocalDay(v.fromDate) : undefined,
    to: v.toDate ? startOfLocalDay(v.toDate, 1) : undefined,
  };
}

interface AuditLogFiltersProps {
  value: AuditFilterValues;
  onChange: (value: AuditFilterValues) => void;
  shops: Array<{ id: string; name: string }>;
}

/** Narrow the log to one person, one shop, one kind of change, or some days. */
export function AuditLogFilters({ value, onChange, shops }: AuditLogFiltersProps) {
  const people = useQuery(peopleQueryOptions({ status: 'all' }));
  const set = (key: keyof AuditFilterValues) => (event: { target: { value: string } }) => onChange({ ...value, [key]: event.target.value });
  const rangeError = value.fromDate && value.toDate && value.toDate < value.fromDate ? 'The last day comes before the first.' : undefined;
  const any = Object.values(value).some(Boolean);
  return (
    <form
      role="search"
      aria-label="Filter the log"
      className="grid grid-cols-1 gap-4 rounded-2xl border border-paper-200 bg-white p-4 sm:grid-cols-2 lg:grid-cols-[repeat(5,minmax(0,1fr))_auto] lg:items-end"
      onSubmit={(e) => e.preventDefault()}
    >
      <Field label="Person">
        <SelectInput value={value.personId} onChange={set('personId')}>
          <option value="">Anyone</option>
          {people.data?.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectInput>
      </Field>
      <Field label="Shop">
        <SelectInput value={value.shopId} onChange={set('shopId')}>
          <option value="">Any shop</option>
          {shops.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectInput>
      </Field>
      <Field label="Kind of change">
        <SelectInput value={value.kind} onChange={set('kind')}>
          <option value="">Any change</option>
          {AUDIT_KIND_GROUPS.map((g) => (
            <optgroup key={g.entity} label={g.label}>
              <option value={`entity:${g.entity}`}>All changes to {g.label.toLowerCase()}</option>
              {g.actions.map((a) => (
                <option key={a} value={`action:${a}`}>
                  {auditActionLabel(a)}
                </option>
              ))}
            </optgroup>
          ))}
        </SelectInput>
      </Field>
      <Field label="From (day)">
        <TextInput type="date" value={value.fromDate} onChange={set('fromDate')} />
      </Field>
      <Field label="To (day, included)" error={rangeError}>
        <TextInput type="date" value={value.toDate} min={value.fromDate || undefined} onChange={set('toDate')} />
      </Field>
      <Button variant="quiet" disabled={!any} onClick={() => onChange(emptyAuditFilters)}>
        Clear filters
      </Button>
    </form>
  );
}
