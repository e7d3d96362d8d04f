import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { AuditLogFilters, emptyAuditFilters, toAuditQuery, type AuditFilterValues } from '@/features/people/components/audit-log-filters';
import { AuditLogList } from '@/features/people/components/audit-log-list';
import { viewerTimeZone } from '@/features/people/format';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useSession } from '../session-context';

const KEYS = Object.keys(emptyAuditFilters) as Array<keyof AuditFilterValues>;

/** `/audit-log` (owner): every change to people, roles, invitations and shops; filters live in the address. */
export function AuditLogRoute() {
  const me = useSession();
  useDocumentTitle('Audit log');
  const [params, setParams] = useSearchParams();
  // the form's state is the truth; the address follows it so a filtered log can be shared or reloaded
  const [values, setValues] = useState<AuditFilterValues>(
    () => Object.fromEntries(KEYS.map((k) => [k, params.get(k) ?? ''])) as unknown as AuditFilterValues,
  );
  const onChange = (next: AuditFilterValues) => {
    setValues(next);
    setParams(
      (current) => {
        const out = new URLSearchParams(current);
        for (const key of KEYS) {
          if (next[key]) out.set(key, next[key]);
          else out.delete(key);
        }
        return out;
      },
      { replace: true },
    );
  };
  const rangeOk = !values.fromDate || !values.toDate || values.toDate >= values.fromDate;
  return (
    <>
      <PageHeader
        title="Audit log"
        description={`Who changed what in ${me.network.name}, and when, with the values before and after. Times are in your time zone (${viewerTimeZone()}).`}
      />
      <div className="flex flex-col gap-4">
        <AuditLogFilters value={values} onChange={onChange} shops={me.shops} />
        {rangeOk ? <AuditLogList filters={toAuditQuery(values)} filtered={KEYS.some((k) => values[k])} /> : null}
      </div>
    </>
  );
}
