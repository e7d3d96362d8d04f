import { subject } from '@casl/ability';
import { useSearchParams } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { TransfersBoard } from '@/features/transfers/components/transfers-board';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import type { TransferView } from '@shared/transfers';
import { useCurrentShop, withShop } from '../current-shop';

export function TransfersRoute() {
  useDocumentTitle('Transfers');
  const { currentShop } = useCurrentShop();
  const ability = useAppAbility();
  const [params] = useSearchParams();
  const view = params.get('view') as TransferView | null;
  const canRequest = !!currentShop && ability.can('request', subject('Transfer', { fromShopId: currentShop.id }));
  return (
    <>
      <PageHeader
        title="Transfers"
        description={currentShop ? `Instruments on their way to and from ${currentShop.name}, and the approvals waiting for you.` : undefined}
        actions={canRequest ? <ButtonLink to={withShop('/transfers/new', currentShop?.id)}>Request a transfer</ButtonLink> : undefined}
      />
      <TransfersBoard
        key={currentShop?.id}
        shop={currentShop}
        initialView={view ?? 'incoming'}
        hrefFor={(id) => withShop(`/transfers/${id}`, currentShop?.id)}
      />
    </>
  );
}
