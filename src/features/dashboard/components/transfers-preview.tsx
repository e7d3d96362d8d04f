import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS } from '@shared/domain';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { formatInstantIn } from '@shared/reports/format';
import { Card } from '@/components/ui/card';
import { figureLink } from './chart-figure';

/** Instruments on the road between shops, soonest arrival first, on the destination's clock. */
export function TransfersPreview({ report, shop }: { report: DashboardReport; shop?: string }) {
  const { total, items } = report.transfersInFlight;
  return (
    <Card as="section" aria-labelledby="transfers-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="transfers-heading" className="text-lg font-semibold text-ink-950">Transfers in flight</h2>
        <Link className={figureLink} to={reportLinks.transfers(shop)}>
          {total === 0 ? 'Open the list' : `All ${total} in flight`}
        </Link>
      </div>
      {total === 0 ? (
        <p className="text-ink-600">Nothing on the road right now.</p>
      ) : (
        <ul className="divide-y divide-paper-200">
          {items.slice(0, 5).map((t) => (
            <li key={t.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2">
              <span className="text-ink-950">
                <Link className={figureLink} to={reportLinks.job(t.jobId)}>Job {t.jobNumber}</Link> · {INSTRUMENT_FAMILY_LABELS[t.family]} · {t.fromShopName} → {t.toShopName}
              </span>
              <span className={t.late ? 'text-sm font-semibold text-danger-700' : 'text-sm text-ink-600'}>
                {t.expectedArrivalAt ? `${t.late ? 'Was expected' : 'Expected'} ${formatInstantIn(t.expectedArrivalAt, t.toShopTimeZone)}` : 'No arrival time set'}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
