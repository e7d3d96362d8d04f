import { useParams } from 'react-router-dom';
import { TransferDetailView } from '@/features/transfers/components/transfer-detail-view';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

export function TransferDetailRoute() {
  useDocumentTitle('Transfer');
  const { id = '' } = useParams();
  const me = useSession();
  const { currentShop } = useCurrentShop();
  return <TransferDetailView key={id} id={id} currentUserId={me.user.id} hrefFor={(path) => withShop(path, currentShop?.id)} />;
}
