import { useSearchParams } from 'react-router-dom';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { IntakeFlow } from '@/features/registry/components/intake-flow';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { subject } from '@casl/ability';
import { useCurrentShop, withShop } from '../current-shop';

export function IntakeRoute() {
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  const [params] = useSearchParams();
  useDocumentTitle('Intake');

  if (!currentShop || !ability.can('create', subject('Job', { shopId: currentShop.id }))) {
    return (
      <>
        <PageHeader title="Intake" />
        <EmptyState title="You do not take instruments in at this shop">
          Switch to a shop where you work the front desk, or ask the shop’s manager.
        </EmptyState>
      </>
    );
  }
  return (
    <>
      <PageHeader title="Intake" description={`Take an instrument in at ${currentShop.name}: find it by serial, find the customer, open the job.`} />
      <IntakeFlow
        key={`${currentShop.id}:${params.get('instrument') ?? ''}`}
        shop={currentShop}
        initialInstrumentId={params.get('instrument') ?? undefined}
        canRegister={ability.can('create', 'Instrument')}
        canAddCustomer={ability.can('create', subject('Customer', { homeShopId: currentShop.id }))}
        instrumentPath={(id) => withShop(`/registry/instruments/${id}`, currentShop.id)}
        labelPath={(id) => withShop(`/registry/instruments/${id}/label`, currentShop.id)}
        jobPath={(id) => withShop(`/jobs/${id}`, currentShop.id)}
      />
    </>
  );
}
