import { useQuery } from '@tanstack/react-query';
import { reportLinks } from '@shared/reports/links';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '@shared/domain';
import type { JobListFilters } from '@shared/reports/links';
import { formatIsoDate } from '@shared/reports/format';
import { localDateIn } from '@shared/time/calendar-date';
import { jobsQueryOptions } from '../queries';
import { ListStates, ShownOf, tableShell, td, tdNum, th } from './list-states';

/** The jobs behind a figure. */
export function JobsTable({ filters }: { filters: JobListFilters }) {
  const query = useQuery(jobsQueryOptions(filters));
  return (
    <ListStates query={query} what="jobs" emptyTitle="No jobs match" empty="No job of these shops matches this figure right now.">
      {(data) => {
        // dates on the shop's own calendar
        const zoneOf = (shopId: string) => data.shops.find((s) => s.id === shopId)?.timeZone ?? 'UTC';
        return (
        <div className="flex flex-col gap-3">
          <ShownOf shown={data.items.length} total={data.total} />
          <div className={tableShell}>
            <table className="w-full min-w-[52rem] text-left text-sm">
              <caption className="sr-only">Jobs</caption>
              <thead className="border-b border-paper-200 bg-paper-50">
                <tr>
                  <th scope="col" className={th}>Job</th>
                  <th scope="col" className={th}>Shop</th>
                  <th scope="col" className={th}>Instrument</th>
                  <th scope="col" className={th}>Stage</th>
                  <th scope="col" className={th}>Skill</th>
                  <th scope="col" className={`${th} text-right`}>Estimate</th>
                  <th scope="col" className={th}>Taken in</th>
                  <th scope="col" className={th}>Promised</th>
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
                    <td className={td}>{JOB_STAGE_LABELS[j.stage]}</td>
                    <td className={td}>{j.skillName ?? '—'}</td>
                    <td className={tdNum}>{j.estimatedHours == null ? 'Not yet' : `${j.estimatedHours} h`}</td>
                    <td className={td}>{formatIsoDate(localDateIn(new Date(j.openedAt), zoneOf(j.shopId)))}</td>
                    <td className={td}>{j.promisedOn ? formatIsoDate(j.promisedOn) : '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
        );
      }}
    </ListStates>
  );
}
