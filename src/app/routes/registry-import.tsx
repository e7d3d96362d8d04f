import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { FleetImport } from '@/features/registry/components/fleet-import';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { subject } from '@casl/ability';
import { useCurrentShop } from '../current-shop';

export function RegistryImportRoute() {
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  useDocumentTitle('Import a fleet');
  const allowed = currentShop && ability.can('create', 'Instrument') && ability.can('create', subject('Job', { shopId: currentShop.id }));
  return (
    <>
      <PageHeader title="Import a fleet" description="A school’s or the rental fleet’s instruments from a spreadsheet saved as CSV." />
      {allowed ? (
        <FleetImport shop={currentShop} />
      ) : (
        <EmptyState title="You do not register instruments at this shop">Switch to a shop where you work the front desk.</EmptyState>
      )}
    </>
  );
}
