import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '@shared/domain';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { formatIsoDate } from '@shared/reports/format';
import { Card } from '@/components/ui/card';
import { figureLink } from './chart-figure';

/** The most overdue promises, with the way to the full list. */
export function OverduePreview({ report, shop }: { report: DashboardReport; shop?: string }) {
  const { total, oldest } = report.overdue;
  return (
    <Card as="section" aria-labelledby="overdue-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="overdue-heading" className="text-lg font-semibold text-ink-950">Overdue promises</h2>
        <Link className={figureLink} to={reportLinks.overdue(shop)}>
          {total === 0 ? 'Open the list' : `All ${total} overdue`}
        </Link>
      </div>
      {total === 0 ? (
        <p className="text-ink-600">Every promise is on time: nothing past its promised date that is not ready.</p>
      ) : (
        <ul className="divide-y divide-paper-200">
          {oldest.map((j) => (
            <li key={j.id} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2">
              <span className="text-ink-950">
                <Link className={figureLink} to={reportLinks.job(j.id)}>Job {j.number}</Link> · {INSTRUMENT_FAMILY_LABELS[j.family]} · {j.shopName}
              </span>
              <span className="text-sm text-ink-600">
                {JOB_STAGE_LABELS[j.stage]} · promised {formatIsoDate(j.promisedOn)} ·{' '}
                <span className="font-semibold text-danger-700">
                  {j.daysLate} day{j.daysLate === 1 ? '' : 's'} late
                </span>
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
