import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import { Link, useNavigate } from 'react-router-dom';
import { ALL_JOB_STAGES, JOB_STAGE_LABELS, type JobStage } from '@shared/domain';
import type { DashboardReport } from '@shared/reports/schemas';
import { reportLinks } from '@shared/reports/links';
import { STAGE_COLORS } from '../colors';
import { ChartFigure, FigureTable, figureLink, td, th, tdNum } from './chart-figure';

const OPEN_STAGES = ALL_JOB_STAGES.filter((s): s is Exclude<JobStage, 'released'> => s !== 'released');

function stageRows(report: DashboardReport) {
  return report.shops.map((shop) => {
    const row: Record<string, string | number> = { shopId: shop.id, shop: shop.name };
    for (const s of OPEN_STAGES) row[s] = 0;
    for (const r of report.openJobsByStage) if (r.shopId === shop.id) row[r.stage] = r.count;
    row.total = OPEN_STAGES.reduce((sum, s) => sum + Number(row[s]), 0);
    return row;
  });
}

/** The numbers of the chart, each a link to its jobs. */
export function OpenJobsTable({ report }: { report: DashboardReport }) {
  const rows = stageRows(report);
  return (
    <FigureTable caption="Open jobs by stage, per shop">
      <thead className="border-b border-paper-200 bg-paper-50">
        <tr>
          <th scope="col" className={th}>Shop</th>
          {OPEN_STAGES.map((s) => (
            <th key={s} scope="col" className={`${th} text-right`}>{JOB_STAGE_LABELS[s]}</th>
          ))}
          <th scope="col" className={`${th} text-right`}>All open</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-200">
        {rows.map((r) => (
          <tr key={String(r.shopId)}>
            <th scope="row" className={`${td} font-semibold text-ink-950`}>{r.shop}</th>
            {OPEN_STAGES.map((s) => (
              <td key={s} className={tdNum}>
                {Number(r[s]) > 0 ? (
                  <Link className={figureLink} to={reportLinks.jobs({ shop: String(r.shopId), stage: s })} aria-label={`${r[s]} ${JOB_STAGE_LABELS[s]} at ${r.shop}`}>
                    {r[s]}
                  </Link>
                ) : (
                  0
                )}
              </td>
            ))}
            <td className={tdNum}>
              <Link className={figureLink} to={reportLinks.jobs({ shop: String(r.shopId), stage: 'open' })} aria-label={`${r.total} open at ${r.shop}`}>
                {r.total}
              </Link>
            </td>
          </tr>
        ))}
      </tbody>
    </FigureTable>
  );
}

/** Open jobs per shop, one stacked bar per shop with a segment per stage. */
export function OpenJobsChart({ report }: { report: DashboardReport }) {
  const navigate = useNavigate();
  const rows = stageRows(report);
  const used = OPEN_STAGES.filter((s) => rows.some((r) => Number(r[s]) > 0));
  const height = Math.max(140, rows.length * 44 + 80);

  return (
    <ChartFigure
      title="Open jobs by stage"
      description="Every job not yet released, per shop. Follow a number to the jobs behind it."
      chart={
        used.length === 0 ? (
          <p className="text-ink-600">No open jobs.</p>
        ) : (
          <BarChart
            accessibilityLayer={false}
            layout="vertical"
            data={rows}
            responsive
            style={{ width: '100%', height }}
            margin={{ left: 8, right: 16 }}
          >
            <CartesianGrid horizontal={false} stroke="#e6e3dc" />
            <XAxis type="number" allowDecimals={false} tick={{ fill: '#3d444b', fontSize: 12 }} />
            <YAxis type="category" dataKey="shop" width={150} tick={{ fill: '#3d444b', fontSize: 12 }} />
            <Tooltip />
            <Legend itemSorter={null} wrapperStyle={{ fontSize: 12, color: '#3d444b' }} />
            {used.map((s) => (
              <Bar
                key={s}
                dataKey={s}
                name={JOB_STAGE_LABELS[s]}
                stackId="stages"
                fill={STAGE_COLORS[s]}
                stroke="#ffffff"
                strokeWidth={1}
                isAnimationActive={false}
                cursor="pointer"
                onClick={(data) => {
                  const shopId = (data as { payload?: { shopId?: string } }).payload?.shopId;
                  if (shopId) void navigate(reportLinks.jobs({ shop: shopId, stage: s }));
                }}
              />
            ))}
          </BarChart>
        )
      }
      table={<OpenJobsTable report={report} />}
    />
  );
}
