import { reportLinks } from '@shared/reports/links';
import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { DashboardView } from '@/features/dashboard/components/dashboard-view';
import { ScopePicker } from '@/features/dashboard/components/scope-picker';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';
import { useReportScope } from './report-scope';

export function DashboardRoute() {
  const me = useSession();
  const { shops, shop, setShop, shopName } = useReportScope();
  useDocumentTitle('Dashboard');
  const owner = me.memberships.some((m) => m.role === 'owner');
  return (
    <>
      <PageHeader
        title="Dashboard"
        description={
          shopName
            ? `${shopName} at a glance. Every number leads to the jobs behind it.`
            : `${owner ? `All of ${me.network.name}` : 'Your shops'} at a glance. Every number leads to the jobs behind it.`
        }
        actions={
          <div className="flex flex-wrap items-end gap-3">
            <ScopePicker shops={shops} value={shop} onChange={setShop} />
            <ButtonLink variant="secondary" to={reportLinks.reports(shop)}>
              Reports and CSV
            </ButtonLink>
          </div>
        }
      />
      <DashboardView shop={shop} />
    </>
  );
}
