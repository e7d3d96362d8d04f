import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import { Link } from 'react-router-dom';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { formatHours, formatLoad } from '@shared/reports/format';
import { SERIES } from '../colors';
import { ChartFigure, FigureTable, figureLink, td, th, tdNum } from './chart-figure';

/**
 * Estimated hours of open work per skill beside the shop's weekly bench hours for that skill, one
 * small chart per shop: a dark bar longer than its grey neighbour is more than a week of work waiting.
 */
export function BenchLoadChart({ report }: { report: DashboardReport }) {
  const shops = report.shops.filter((s) => report.benchLoad.some((r) => r.shopId === s.id));
  return (
    <ChartFigure
      title="Bench load per skill"
      description="Estimated hours of open work (not yet ready) against each skill’s weekly bench hours. Jobs without an estimate yet are counted separately."
      chart={
        shops.length === 0 ? (
          <p className="text-ink-600">No skills or open work recorded for these shops.</p>
        ) : (
          <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
            {shops.map((shop) => {
              const rows = report.benchLoad
                .filter((r) => r.shopId === shop.id)
                .map((r) => ({ skill: r.skillName, open: r.openHours, weekly: r.weeklyBenchHours }));
              return (
                <div key={shop.id}>
                  <p className="mb-1 text-sm font-semibold text-ink-950">{shop.name}</p>
                  <BarChart
                    accessibilityLayer={false}
                    layout="vertical"
                    data={rows}
                    responsive
                    style={{ width: '100%', height: rows.length * 52 + 70 }}
                    margin={{ left: 8, right: 16 }}
                  >
                    <CartesianGrid horizontal={false} stroke="#e6e3dc" />
                    <XAxis type="number" unit=" h" tick={{ fill: '#3d444b', fontSize: 12 }} />
                    <YAxis type="category" dataKey="skill" width={140} tick={{ fill: '#3d444b', fontSize: 12 }} />
                    <Tooltip />
                    <Legend itemSorter={null} wrapperStyle={{ fontSize: 12, color: '#3d444b' }} />
                    <Bar dataKey="open" name="Open work (h)" fill={SERIES.primary} isAnimationActive={false} />
                    <Bar dataKey="weekly" name="Weekly bench hours" fill={SERIES.secondary} isAnimationActive={false} />
                  </BarChart>
                </div>
              );
            })}
          </div>
        )
      }
      table={<BenchLoadTable report={report} />}
    />
  );
}

/** The numbers of the chart, each with the link to its jobs. */
export function BenchLoadTable({ report }: { report: DashboardReport }) {
  return (
    <FigureTable caption="Bench load per skill, per shop">
      <thead className="border-b border-paper-200 bg-paper-50">
        <tr>
          <th scope="col" className={th}>Shop</th>
          <th scope="col" className={th}>Skill</th>
          <th scope="col" className={`${th} text-right`}>Open work</th>
          <th scope="col" className={`${th} text-right`}>Weekly bench hours</th>
          <th scope="col" className={`${th} text-right`}>Load</th>
          <th scope="col" className={`${th} text-right`}>Open jobs</th>
          <th scope="col" className={`${th} text-right`}>Not yet estimated</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-200">
        {report.benchLoad.map((r) => {
          const shop = report.shops.find((s) => s.id === r.shopId);
          return (
            <tr key={`${r.shopId}:${r.skillId}`}>
              <td className={td}>{shop?.name}</td>
              <th scope="row" className={`${td} font-semibold text-ink-950`}>{r.skillName}</th>
              <td className={tdNum}>{formatHours(r.openHours)}</td>
              <td className={tdNum}>{formatHours(r.weeklyBenchHours)}</td>
              <td className={r.weeksOfWork == null || r.weeksOfWork > 1 ? `${tdNum} font-semibold text-danger-700` : tdNum}>
                {formatLoad(r.weeksOfWork)}
              </td>
              <td className={tdNum}>
                {r.openJobs > 0 ? (
                  <Link className={figureLink} to={reportLinks.jobs({ shop: r.shopId, skill: r.skillId })} aria-label={`${r.openJobs} open ${r.skillName} jobs at ${shop?.name}`}>
                    {r.openJobs}
                  </Link>
                ) : (
                  0
                )}
              </td>
              <td className={tdNum}>{r.unestimatedJobs}</td>
            </tr>
          );
        })}
      </tbody>
    </FigureTable>
  );
}
