import { useState } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import { Link } from 'react-router-dom';
import { INSTRUMENT_FAMILY_LABELS } from '@shared/domain';
import { TURNAROUND_WINDOWS, type DashboardReport, type TurnaroundFigure, type TurnaroundWindow } from '@shared/reports/schemas';
import { reportLinks, type JobListFilters } from '@shared/reports/links';
import { formatDays } from '@shared/reports/format';
import { cn } from '@/lib/cn';
import { SERIES } from '../colors';
import { ChartFigure, FigureTable, figureLink, td, th, tdNum } from './chart-figure';

type Row = TurnaroundFigure & { name: string; filters: JobListFilters };

function turnaroundRows(report: DashboardReport, days: TurnaroundWindow, by: 'shop' | 'family', shop?: string): Row[] {
  const w = report.turnaround.find((t) => t.days === days)!;
  if (by === 'shop') {
    return w.byShop.map((f) => ({
      ...f,
      name: report.shops.find((s) => s.id === f.shopId)?.name ?? 'Shop',
      filters: { shop: f.shopId, readyWithin: days },
    }));
  }
  return w.byFamily.map((f) => ({
    ...f,
    name: INSTRUMENT_FAMILY_LABELS[f.family],
    filters: { shop, family: f.family, readyWithin: days },
  }));
}

interface TurnaroundTableProps {
  report: DashboardReport;
  days: TurnaroundWindow;
  by: 'shop' | 'family';
  shop?: string;
}

/** Median and 90th percentile in business and calendar days; the job counts link to the sample. */
export function TurnaroundTable({ report, days, by, shop }: TurnaroundTableProps) {
  const rows = turnaroundRows(report, days, by, shop);
  const first = by === 'shop' ? 'Shop' : 'Family';
  return (
    <FigureTable caption={`Turnaround per ${by === 'shop' ? 'shop' : 'instrument family'}, last ${days} days`}>
      <thead className="border-b border-paper-200 bg-paper-50">
        <tr>
          <th scope="col" className={th}>{first}</th>
          <th scope="col" className={`${th} text-right`}>Jobs ready</th>
          <th scope="col" className={`${th} text-right`}>Median</th>
          <th scope="col" className={`${th} text-right`}>90th percentile</th>
          <th scope="col" className={`${th} text-right`}>Median, calendar</th>
          <th scope="col" className={`${th} text-right`}>90th pct., calendar</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-paper-200">
        {rows.map((r) => (
          <tr key={r.name}>
            <th scope="row" className={`${td} font-semibold text-ink-950`}>{r.name}</th>
            <td className={tdNum}>
              <Link className={figureLink} to={reportLinks.jobs(r.filters)} aria-label={`${r.jobs} jobs ready in ${days} days, ${r.name}`}>
                {r.jobs}
              </Link>
            </td>
            <td className={tdNum}>{formatDays(r.medianBusinessDays)}</td>
            <td className={tdNum}>{formatDays(r.p90BusinessDays)}</td>
            <td className={tdNum}>{formatDays(r.medianCalendarDays, 'calendar')}</td>
            <td className={tdNum}>{formatDays(r.p90CalendarDays, 'calendar')}</td>
          </tr>
        ))}
      </tbody>
    </FigureTable>
  );
}

/** Pick 30, 90 or 365 days. */
export function WindowPicker({ value, onChange }: { value: TurnaroundWindow; onChange: (d: TurnaroundWindow) => void }) {
  return (
    <div role="group" aria-label="Window" className="inline-flex rounded-lg border border-paper-300 bg-white p-0.5">
      {TURNAROUND_WINDOWS.map((d) => (
        <button
          key={d}
          type="button"
          aria-pressed={d === value}
          onClick={() => onChange(d)}
          className={cn(
            'min-h-10 rounded-md px-3 text-sm font-semibold',
            d === value ? 'bg-accent-600 text-white' : 'text-ink-800 hover:bg-paper-100',
          )}
        >
          {d} days
        </button>
      ))}
    </div>
  );
}

/**
 * Intake → ready, median and 90th percentile, in business days (the shop's opening days on its own
 * calendar); the table adds calendar days. One chart per shop, one per family, for a chosen window.
 */
export function TurnaroundCharts({ report, shop }: { report: DashboardReport; shop?: string }) {
  const [days, setDays] = useState<TurnaroundWindow>(90);
  const w = report.turnaround.find((t) => t.days === days)!;
  const byShop = turnaroundRows(report, days, 'shop', shop);
  const byFamily = turnaroundRows(report, days, 'family', shop);

  const picker = <WindowPicker value={days} onChange={setDays} />;

  const chart = (rows: Row[]) =>
    rows.length === 0 ? (
      <p className="text-ink-600">No job reached Ready in the last {days} days.</p>
    ) : (
      <BarChart
        accessibilityLayer={false}
        layout="vertical"
        data={rows.map((r) => ({ name: r.name, median: r.medianBusinessDays, p90: r.p90BusinessDays }))}
        responsive
        style={{ width: '100%', height: rows.length * 48 + 70 }}
        margin={{ left: 8, right: 16 }}
      >
        <CartesianGrid horizontal={false} stroke="#e6e3dc" />
        <XAxis type="number" unit=" d" tick={{ fill: '#3d444b', fontSize: 12 }} />
        <YAxis type="category" dataKey="name" width={150} tick={{ fill: '#3d444b', fontSize: 12 }} />
        <Tooltip />
        <Legend itemSorter={null} wrapperStyle={{ fontSize: 12, color: '#3d444b' }} />
        <Bar dataKey="median" name="Median (business days)" fill={SERIES.median} isAnimationActive={false} />
        <Bar dataKey="p90" name="90th percentile (business days)" fill={SERIES.p90} isAnimationActive={false} />
      </BarChart>
    );

  const note = `Last ${days} days: ${w.overall.jobs} ${w.overall.jobs === 1 ? 'job' : 'jobs'} reached Ready; median ${formatDays(w.overall.medianBusinessDays)}, 90th percentile ${formatDays(w.overall.p90BusinessDays)}.`;
  return (
    <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
      <ChartFigure
        title="Turnaround per shop"
        description={<>Intake to ready, in business days (each shop’s opening days, on its own calendar). {note}</>}
        actions={picker}
        chart={chart(byShop)}
        table={<TurnaroundTable report={report} days={days} by="shop" shop={shop} />}
      />
      <ChartFigure
        title="Turnaround per family"
        description={`Intake to ready, in business days, last ${days} days.`}
        chart={chart(byFamily)}
        table={<TurnaroundTable report={report} days={days} by="family" shop={shop} />}
      />
    </div>
  );
}
