import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { ClosingDaysEditor } from '@/features/shops/components/closing-days-editor';
import { RelayRunsEditor } from '@/features/shops/components/relay-runs-editor';
import { ShopForm } from '@/features/shops/components/shop-form';
import { ShopSkillsEditor } from '@/features/shops/components/shop-skills-editor';
import { TechnicianHoursEditor } from '@/features/shops/components/technician-hours-editor';
import { useUpdateShop } from '@/features/shops/mutations';
import { shopQueryOptions, skillsQueryOptions } from '@/features/shops/queries';
import { sessionKeys } from '@/features/session/queries';
import { errorMessage, serverFieldErrors } from '@/lib/form-errors';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** `/shops/:id` (owner): edit a shop, its skills and bench hours, its technicians' hours and its relay runs. */
export function ShopRoute() {
  const { id = '' } = useParams();
  const me = useSession();
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  const shop = useQuery(shopQueryOptions(id));
  const skills = useQuery(skillsQueryOptions());
  const update = useUpdateShop(id);
  const queryClient = useQueryClient();
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  useDocumentTitle(shop.data?.name ?? 'Shop');

  const back = (
    <Link to={withShop('/shops', currentShop?.id)} className="inline-flex min-h-11 items-center font-semibold text-accent-700 underline underline-offset-2">
      All shops
    </Link>
  );
  if (shop.isPending || skills.isPending) return <PageSpinner label="Loading the shop…" />;
  if (shop.isError || skills.isError) {
    return (
      <div className="flex flex-col gap-4">
        {back}
        <ErrorState title="This shop could not be loaded" error={shop.error ?? skills.error} onRetry={() => { void shop.refetch(); void skills.refetch(); }} />
      </div>
    );
  }
  const s = shop.data;
  return (
    <>
      {back}
      <PageHeader title={s.name} description={[s.city, s.region].filter(Boolean).join(', ') || undefined} />
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
        <Card as="section" aria-labelledby="details-heading">
          <CardTitle id="details-heading">Details</CardTitle>
          <div className="mt-4">
            <ShopForm
              key={s.id}
              shop={s}
              submitLabel="Save details"
              pending={update.isPending}
              serverErrors={serverFieldErrors(update.error)}
              message={message}
              onSubmit={(input) =>
                update.mutate(input, {
                  onSuccess: () => {
                    setMessage({ tone: 'success', text: 'Details saved.' });
                    void queryClient.invalidateQueries({ queryKey: sessionKeys.me() });
                  },
                  onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
                })
              }
            />
          </div>
        </Card>
        <div className="flex flex-col gap-6">
          <ShopSkillsEditor key={`skills-${s.id}`} shop={s} skills={skills.data} />
          <TechnicianHoursEditor shop={s} skills={skills.data} />
          <RelayRunsEditor shop={s} shops={me.shops} />
        </div>
        <div className="xl:col-span-2">
          <ClosingDaysEditor shop={s} canEdit={ability.can('update', 'Shop')} />
        </div>
      </div>
    </>
  );
}
