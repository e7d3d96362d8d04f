import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { InvitationList } from '@/features/people/components/invitation-list';
import { PeopleList } from '@/features/people/components/people-list';
import { useAppAbility } from '@/lib/ability';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';
import { useSession } from '../session-context';

/** `/people` (owner): everyone with their role per shop, open invitations, and the way to invite. */
export function PeopleRoute() {
  const me = useSession();
  const ability = useAppAbility();
  const { currentShop } = useCurrentShop();
  useDocumentTitle('People');
  return (
    <>
      <PageHeader
        title="People"
        description={`Who works in ${me.network.name} and their role at each shop. One person can hold different roles at different shops.`}
        actions={
          <>
            {ability.can('create', 'Invitation') ? <ButtonLink to={withShop('/people/invite', currentShop?.id)}>Invite someone</ButtonLink> : null}
            {ability.can('read', 'AuditLog') ? (
              <ButtonLink to={withShop('/audit-log', currentShop?.id)} variant="secondary">
                Audit log
              </ButtonLink>
            ) : null}
          </>
        }
      />
      <div className="flex flex-col gap-10">
        <InvitationList />
        <PeopleList hrefFor={(id) => withShop(`/people/${id}`, currentShop?.id)} />
      </div>
    </>
  );
}
