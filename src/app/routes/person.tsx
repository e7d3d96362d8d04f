import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { PersonRoles } from '@/features/people/components/person-roles';
import { PersonStatus } from '@/features/people/components/person-status';
import { personQueryOptions } from '@/features/people/queries';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** `/people/:id` (owner): one person's roles per shop, their access, and their bench hours. */
export function PersonRoute() {
  const { id = '' } = useParams();
  const me = useSession();
  const { currentShop } = useCurrentShop();
  const person = useQuery(personQueryOptions(id));
  useDocumentTitle(person.data?.name ?? 'Person');

  const back = (
    <Link to={withShop('/people', currentShop?.id)} className="inline-flex min-h-11 items-center font-semibold text-accent-700 underline underline-offset-2">
      All people
    </Link>
  );
  if (person.isPending) return <PageSpinner label="Loading…" />;
  if (person.isError) {
    return (
      <div className="flex flex-col gap-4">
        {back}
        <ErrorState title="This person could not be loaded" error={person.error} onRetry={() => void person.refetch()} />
      </div>
    );
  }
  const p = person.data;
  return (
    <>
      {back}
      <PageHeader title={p.name} description={p.email} />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-[3fr_2fr]">
        <PersonRoles person={p} shops={me.shops} />
        <div className="flex flex-col gap-6">
          <PersonStatus person={p} isSelf={p.id === me.user.id} />
          <Card as="section" aria-labelledby="skills-heading">
            <CardTitle id="skills-heading">Bench hours</CardTitle>
            {p.skills?.length ? (
              <ul className="mt-3 flex flex-col gap-1 text-ink-800">
                {p.skills.map((s) => (
                  <li key={`${s.shopId}-${s.skillId}`}>
                    {s.skillName} at {s.shopName}: {s.weeklyHours} h a week
                  </li>
                ))}
              </ul>
            ) : (
              <p className="mt-3 text-ink-600">No skills recorded.</p>
            )}
            <p className="mt-3 text-sm text-ink-600">Skills and weekly hours are set on each shop’s page.</p>
          </Card>
        </div>
      </div>
    </>
  );
}
