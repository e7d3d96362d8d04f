import { PageHeader } from '@/components/ui/page-header';
import { AuditLogList } from '@/features/people/components/audit-log-list';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';

/** `/audit-log` (owner): every change to people, roles, invitations and shops. */
export function AuditLogRoute() {
  const me = useSession();
  useDocumentTitle('Audit log');
  return (
    <>
      <PageHeader title="Audit log" description={`Who changed what in ${me.network.name}, and when, with the values before and after.`} />
      <AuditLogList />
    </>
  );
}
