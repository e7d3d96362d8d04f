import { PRIVATE_CUSTOMER_LABEL } from '@shared/registry';
import { useQuery } from '@tanstack/react-query';
import { reportLinks } from '@shared/reports/links';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '@shared/domain';
import { formatIsoDate } from '@shared/reports/format';
import { overdueQueryOptions } from '../queries';
import { ListStates, ShownOf, tableShell, td, tdNum, th } from './list-states';

/** Every job past its promised date that is not ready yet, most days late first. */
export function OverdueTable({ shop }: { shop?: string }) {
  const query = useQuery(overdueQueryOptions(shop));
  return (
    <ListStates
      query={query}
      what="overdue jobs"
      emptyTitle="Nothing overdue"
      empty="Every job with a promised date is ready or still within its promise."
    >
      {(data) => (
        <div className="flex flex-col gap-3">
          <ShownOf shown={data.items.length} total={data.total} />
          <div className={tableShell}>
            <table className="w-full min-w-[52rem] text-left text-sm">
              <caption className="sr-only">Overdue promises</caption>
              <thead className="border-b border-paper-200 bg-paper-50">
                <tr>
                  <th scope="col" className={th}>Job</th>
                  <th scope="col" className={th}>Shop</th>
                  <th scope="col" className={th}>Instrument</th>
                  <th scope="col" className={th}>Customer</th>
                  <th scope="col" className={th}>Stage</th>
                  <th scope="col" className={th}>Promised</th>
                  <th scope="col" className={`${th} text-right`}>Days late</th>
                  <th scope="col" className={th}>Technician</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-200">
                {data.items.map((j) => (
                  <tr key={j.id}>
                    <th scope="row" className={`${td} font-semibold text-ink-950`}>
                      <Link className="text-accent-700 underline underline-offset-2" to={reportLinks.job(j.id)}>{j.number}</Link>
                    </th>
                    <td className={td}>{j.shopName}</td>
                    <td className={td}>
                      {INSTRUMENT_FAMILY_LABELS[j.family]} · {j.maker} {j.model ?? ''}
                      <span className="block text-xs text-ink-600">Serial {j.serial}</span>
                    </td>
                    <td className={td}>{j.customerName ?? (j.customerHidden ? PRIVATE_CUSTOMER_LABEL : 'Rental fleet')}</td>
                    <td className={td}>{JOB_STAGE_LABELS[j.stage]}</td>
                    <td className={td}>{formatIsoDate(j.promisedOn)}</td>
                    <td className={`${tdNum} font-semibold text-danger-700`}>{j.daysLate}</td>
                    <td className={td}>{j.assigneeName ?? 'Not assigned'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
      )}
    </ListStates>
  );
}
