import { Link } from 'react-router-dom';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { InviteForm } from '@/features/people/components/invite-form';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** `/people/invite` (owner): invite by e-mail with a role per shop. */
export function InviteRoute() {
  const me = useSession();
  const { currentShop } = useCurrentShop();
  useDocumentTitle('Invite someone');
  return (
    <>
      <Link to={withShop('/people', currentShop?.id)} className="inline-flex min-h-11 items-center font-semibold text-accent-700 underline underline-offset-2">
        All people
      </Link>
      <PageHeader
        title="Invite someone"
        description={`They get an e-mail with a link to join ${me.network.name}. They sign in with that address, and the roles are theirs.`}
      />
      <Card className="max-w-3xl">
        <InviteForm shops={me.shops} />
      </Card>
    </>
  );
}
