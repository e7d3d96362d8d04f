import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import { Link, useNavigate } from 'react-router-dom';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { formatIsoDate } from '@shared/reports/format';
import { SERIES } from '../colors';
import { ChartFigure, FigureTable, figureLink, td, th, tdNum } from './chart-figure';

const short = (iso: string) => formatIsoDate(iso).replace(/^\w{3} /, '').replace(/ \d{4}$/, ''); // "1 Mar"

/** Jobs taken in per week over the last 52 weeks: the late-summer school-rental rush shows as a ridge. */
export function WeeklyIntakeChart({ report, shop }: { report: DashboardReport; shop?: string }) {
  const navigate = useNavigate();
  const weeks = report.weeklyIntake;
  const peak = weeks.reduce((best, w) => (w.total > best.total ? w : best), weeks[0] ?? { weekStart: '', total: 0, byShop: {} });
  return (
    <ChartFigure
      title="Weekly intake, last 52 weeks"
      description={
        peak.total > 0
          ? `Jobs taken in per week (weeks start on Monday). Busiest: the week of ${formatIsoDate(peak.weekStart)}, ${peak.total} jobs.`
          : 'Jobs taken in per week (weeks start on Monday).'
      }
      chart={
        <BarChart
          accessibilityLayer={false}
          data={weeks.map((w) => ({ week: w.weekStart, label: short(w.weekStart), jobs: w.total }))}
          responsive
          style={{ width: '100%', height: 240 }}
          margin={{ left: 0, right: 8 }}
        >
          <CartesianGrid vertical={false} stroke="#e6e3dc" />
          <XAxis dataKey="label" interval={7} tick={{ fill: '#3d444b', fontSize: 12 }} />
          <YAxis allowDecimals={false} width={36} tick={{ fill: '#3d444b', fontSize: 12 }} />
          <Tooltip />
          <Bar
            dataKey="jobs"
            name="Jobs taken in"
            fill={SERIES.primary}
            isAnimationActive={false}
            cursor="pointer"
            onClick={(data) => {
              const week = (data as { payload?: { week?: string } }).payload?.week;
              if (week) void navigate(reportLinks.jobs({ shop, week }));
            }}
          />
        </BarChart>
      }
      table={<WeeklyIntakeTable report={report} shop={shop} />}
    />
  );
}

/** The numbers of the chart, each with the link to its jobs. */
export function WeeklyIntakeTable({ report, shop }: { report: DashboardReport; shop?: string }) {
  const weeks = report.weeklyIntake;
  return (
    <FigureTable caption="Jobs taken in per week, last 52 weeks">
      <thead className="border-b border-paper-200 bg-paper-50">
        <tr>
          <th scope="col" className={th}>Week of</th>
          <th scope="col" className={`${th} text-right`}>Jobs taken in</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-200">
        {weeks.map((w) => (
          <tr key={w.weekStart}>
            <th scope="row" className={`${td} font-semibold text-ink-950`}>{formatIsoDate(w.weekStart)}</th>
            <td className={tdNum}>
              {w.total > 0 ? (
                <Link className={figureLink} to={reportLinks.jobs({ shop, week: w.weekStart })} aria-label={`${w.total} taken in the week of ${formatIsoDate(w.weekStart)}`}>
                  {w.total}
                </Link>
              ) : (
                0
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </FigureTable>
  );
}
