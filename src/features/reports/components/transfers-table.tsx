import { useQuery } from '@tanstack/react-query';
import { reportLinks } from '@shared/reports/links';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS } from '@shared/domain';
import { formatInstantIn } from '@shared/reports/format';
import { transfersQueryOptions } from '../queries';
import { ListStates, ShownOf, tableShell, td, th } from './list-states';

/** Instruments on a relay run right now, soonest arrival first. */
export function TransfersTable({ shop }: { shop?: string }) {
  const query = useQuery(transfersQueryOptions(shop));
  return (
    <ListStates query={query} what="transfers" emptyTitle="Nothing on the road" empty="No instrument is between shops right now.">
      {(data) => (
        <div className="flex flex-col gap-3">
          <ShownOf shown={data.items.length} total={data.total} />
          <div className={tableShell}>
            <table className="w-full min-w-[44rem] text-left text-sm">
              <caption className="sr-only">Transfers in flight</caption>
              <thead className="border-b border-paper-200 bg-paper-50">
                <tr>
                  <th scope="col" className={th}>Job</th>
                  <th scope="col" className={th}>Instrument</th>
                  <th scope="col" className={th}>From</th>
                  <th scope="col" className={th}>To</th>
                  <th scope="col" className={th}>Left</th>
                  <th scope="col" className={th}>Expected arrival</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-paper-200">
                {data.items.map((t) => (
                  <tr key={t.id}>
                    <th scope="row" className={`${td} font-semibold text-ink-950`}>
                      <Link className="text-accent-700 underline underline-offset-2" to={reportLinks.job(t.jobId)}>{t.jobNumber}</Link>
                    </th>
                    <td className={td}>
                      {INSTRUMENT_FAMILY_LABELS[t.family]}
                      <span className="block text-xs text-ink-600">Serial {t.serial}</span>
                    </td>
                    <td className={td}>{t.fromShopName}</td>
                    <td className={td}>{t.toShopName}</td>
                    <td className={td}>{t.departedAt ? formatInstantIn(t.departedAt, t.toShopTimeZone) : '—'}</td>
                    <td className={t.late ? `${td} font-semibold text-danger-700` : td}>
                      {t.expectedArrivalAt ? formatInstantIn(t.expectedArrivalAt, t.toShopTimeZone) : 'Not set'}
                      {t.late ? <span className="block text-xs">Past expected arrival</span> : null}
                    </td>
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
