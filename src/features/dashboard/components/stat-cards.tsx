import { Link } from 'react-router-dom';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { formatDays } from '@shared/reports/format';

interface StatCardsProps {
  report: DashboardReport;
  shop?: string;
}

/** The four numbers people look for first; each card is the link to the list behind it. */
export function StatCards({ report, shop }: StatCardsProps) {
  const open = report.openJobsByStage.reduce((sum, r) => sum + r.count, 0);
  const quarter = report.turnaround.find((t) => t.days === 90)?.overall;
  const cards = [
    { label: 'Open jobs', value: String(open), note: 'every stage but released', to: reportLinks.jobs({ shop, stage: 'open' }) },
    {
      label: 'Overdue promises',
      value: String(report.overdue.total),
      note: 'promised date passed, not ready yet',
      to: reportLinks.overdue(shop),
      alert: report.overdue.total > 0,
    },
    {
      label: 'Transfers in flight',
      value: String(report.transfersInFlight.total),
      note: report.transfersInFlight.late ? `${report.transfersInFlight.late} past expected arrival` : 'all on time',
      to: reportLinks.transfers(shop),
      alert: report.transfersInFlight.late > 0,
    },
    {
      label: 'Turnaround, last 90 days',
      value: quarter?.medianBusinessDays == null ? '—' : formatDays(quarter.medianBusinessDays),
      note: quarter?.jobs ? `median intake → ready; 90th percentile ${formatDays(quarter.p90BusinessDays)}` : 'no job reached Ready in 90 days',
      to: reportLinks.jobs({ shop, readyWithin: 90 }),
    },
  ];
  return (
    <ul className="grid grid-cols-1 gap-4 sm:grid-cols-2 xl:grid-cols-4">
      {cards.map((c) => (
        <li key={c.label} className="flex">
          <Link
            to={c.to}
            className="flex w-full flex-col gap-1 rounded-2xl border border-paper-200 bg-white p-5 shadow-[0_1px_2px_rgb(28_32_36/0.05)] hover:border-accent-600"
          >
            <span className="text-sm font-semibold text-ink-600">{c.label}</span>
            <span className={c.alert ? 'text-3xl font-bold tabular-nums text-danger-700' : 'text-3xl font-bold tabular-nums text-ink-950'}>
              {c.value}
            </span>
            <span className="text-sm text-ink-600">{c.note}</span>
          </Link>
        </li>
      ))}
    </ul>
  );
}
