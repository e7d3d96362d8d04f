import { PageHeader } from '@/components/ui/page-header';
import { RoleOverview } from '@/features/session/components/role-overview';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';

export function PeopleRoute() {
  const me = useSession();
  useDocumentTitle('People');
  return (
    <>
      <PageHeader title="People" description={`How roles work in ${me.network.name}, and the ones you hold.`} />
      <RoleOverview memberships={me.memberships} />
    </>
  );
}
