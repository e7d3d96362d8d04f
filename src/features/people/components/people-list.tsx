import { useQuery } from '@tanstack/react-query';
import { useDeferredValue, useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorState } from '@/components/ui/error-state';
import { Field, SelectInput, TextInput } from '@/components/ui/form-field';
import { Spinner } from '@/components/ui/spinner';
import { cn } from '@/lib/cn';
import { describeRole } from '../format';
import { peopleQueryOptions, type PeopleFilters } from '../queries';

interface PeopleListProps {
  /** Where a person's row leads, e.g. `/people/<id>` (keeps the current shop in the address). */
  hrefFor: (personId: string) => string;
}

/** Everyone in the network with their role at each shop; searchable, filterable by status. */
export function PeopleList({ hrefFor }: PeopleListProps) {
  const [search, setSearch] = useState('');
  const [status, setStatus] = useState<NonNullable<PeopleFilters['status']>>('active');
  const q = useDeferredValue(search.trim());
  const people = useQuery(peopleQueryOptions({ q: q || undefined, status }));

  return (
    <section aria-labelledby="people-heading" className="flex flex-col gap-4">
      <h2 id="people-heading" className="text-xl font-semibold text-ink-950">
        People
      </h2>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-[2fr_1fr]">
        <Field label="Search by name or e-mail">
          <TextInput type="search" value={search} onChange={(e) => setSearch(e.target.value)} autoComplete="off" />
        </Field>
        <Field label="Show">
          <SelectInput value={status} onChange={(e) => setStatus(e.target.value as typeof status)}>
            <option value="active">Active people</option>
            <option value="inactive">Deactivated people</option>
            <option value="all">Everyone</option>
          </SelectInput>
        </Field>
      </div>

      {people.isPending ? (
        <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-12">
          <Spinner label="Loading people…" showLabel />
        </div>
      ) : people.isError ? (
        <ErrorState title="People could not be loaded" error={people.error} onRetry={() => void people.refetch()} retrying={people.isFetching} />
      ) : people.data.length === 0 ? (
        <EmptyState title={q ? 'Nobody matches' : 'Nobody here yet'}>
          {q ? 'Try another name or e-mail address.' : 'Invite people by e-mail and give them a role at each shop.'}
        </EmptyState>
      ) : (
        <ul className="flex flex-col divide-y divide-paper-200 rounded-2xl border border-paper-200 bg-white">
          {people.data.map((person) => (
            <li key={person.id}>
              <Link
                to={hrefFor(person.id)}
                className="grid grid-cols-1 gap-2 px-4 py-4 hover:bg-paper-50 sm:grid-cols-[minmax(0,2fr)_minmax(0,3fr)] sm:gap-6 sm:px-6"
                aria-label={`${person.name}, ${person.email}${person.active ? '' : ', deactivated'}`}
              >
                <div className="min-w-0">
                  <p className="font-semibold text-ink-950">
                    {person.name}
                    {!person.active ? (
                      <span className="ml-2 rounded-full bg-paper-200 px-2 py-0.5 text-xs font-semibold text-ink-800">Deactivated</span>
                    ) : null}
                  </p>
                  <p className="truncate text-sm text-ink-600">{person.email}</p>
                </div>
                <ul className="flex flex-wrap gap-2 text-sm" aria-label="Roles">
                  {person.memberships.length === 0 ? (
                    <li className="text-ink-600">No role</li>
                  ) : (
                    person.memberships.map((m) => (
                      <li
                        key={m.id}
                        className={cn(
                          'rounded-full border px-2.5 py-1',
                          m.role === 'owner' ? 'border-accent-200 bg-accent-50 text-accent-800' : 'border-paper-300 bg-paper-50 text-ink-800',
                        )}
                      >
                        {describeRole(m.role, m.shopName)}
                      </li>
                    ))
                  )}
                </ul>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
