import { useState, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { TurnaroundWindow } from '@shared/reports/schemas';
import { csvLinks, reportLinks } from '@shared/reports/links';
import { Card } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { dashboardQueryOptions } from '@/features/dashboard/queries';
import { BenchLoadTable } from '@/features/dashboard/components/bench-load-chart';
import { OpenJobsTable } from '@/features/dashboard/components/open-jobs-chart';
import { ScopePicker } from '@/features/dashboard/components/scope-picker';
import { TurnaroundTable, WindowPicker } from '@/features/dashboard/components/turnaround-chart';
import { WeeklyIntakeTable } from '@/features/dashboard/components/weekly-intake-chart';
import { figureLink } from '@/features/dashboard/components/chart-figure';
import { CsvLink } from '@/features/reports/components/csv-link';
import { InvoiceExport } from '@/features/reports/components/invoice-export';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useMayExport, useReportScope } from './report-scope';

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

function Section({ id, title, description, csv, children }: { id: string; title: string; description?: ReactNode; csv: ReactNode; children: ReactNode }) {
  return (
    <Card as="section" aria-labelledby={id} className="flex flex-col gap-4">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id={id} className="text-lg font-semibold text-ink-950">{title}</h2>
          {description ? <p className="mt-1 max-w-prose text-sm text-ink-600">{description}</p> : null}
        </div>
        <div className="flex flex-wrap gap-2">{csv}</div>
      </div>
      <div className="overflow-x-auto">{children}</div>
    </Card>
  );
}

/** The dashboard's figures as tables, each with its CSV, and the invoice export. */
export function ReportsRoute() {
  const { shops, shop, setShop, shopName } = useReportScope();
  const exporter = useReportScope('export');
  const mayExport = useMayExport(shop);
  // technicians and auditors read the tables; the files are for those who may export them
  const csvLink = (href: string, description: string) => (mayExport ? <CsvLink href={href} description={description} /> : null);
  const [days, setDays] = useState<TurnaroundWindow>(90);
  useDocumentTitle('Reports');
  const figures = useQuery(dashboardQueryOptions(shop));

  let body: ReactNode;
  if (figures.isPending) {
    body = (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Adding up the figures…" showLabel />
      </div>
    );
  } else if (figures.isError) {
    body = <ErrorState title="The figures could not be loaded" error={figures.error} onRetry={() => void figures.refetch()} retrying={figures.isFetching} />;
  } else {
    const report = figures.data;
    const scopeName = shopName ?? 'all shops';
    body = (
      <div className="flex flex-col gap-6">
        <Section id="open-jobs" title="Open jobs by stage" csv={csvLink(csvLinks.report('open-jobs', shop), `open jobs by stage, ${scopeName}`)}>
          <OpenJobsTable report={report} />
        </Section>
        <Section
          id="overdue"
          title="Overdue promises"
          description={`${plural(report.overdue.total, 'job is', 'jobs are')} past the promised date and not ready (each shop’s own calendar).`}
          csv={csvLink(csvLinks.report('overdue', shop), `overdue promises, ${scopeName}`)}
        >
          <Link className={figureLink} to={reportLinks.overdue(shop)}>Open the list of overdue jobs</Link>
        </Section>
        <Section
          id="transfers"
          title="Transfers in flight"
          description={`${plural(report.transfersInFlight.total, 'instrument', 'instruments')} on the road, ${report.transfersInFlight.late} past the expected arrival.`}
          csv={csvLink(csvLinks.report('transfers', shop), `transfers in flight, ${scopeName}`)}
        >
          <Link className={figureLink} to={reportLinks.transfers(shop)}>Open the list of transfers in flight</Link>
        </Section>
        <Section id="bench-load" title="Bench load per skill" csv={csvLink(csvLinks.report('bench-load', shop), `bench load, ${scopeName}`)}>
          <BenchLoadTable report={report} />
        </Section>
        <Section
          id="turnaround"
          title="Turnaround, intake to ready"
          description="Median and 90th percentile. Business days count each shop’s opening days on its own calendar, after the intake date up to the ready date; calendar days are elapsed time. The CSV has all three windows."
          csv={
            <>
              <WindowPicker value={days} onChange={setDays} />
              {csvLink(csvLinks.report('turnaround', shop), `turnaround, ${scopeName}`)}
            </>
          }
        >
          <div className="flex flex-col gap-6">
            <TurnaroundTable report={report} days={days} by="shop" shop={shop} />
            <TurnaroundTable report={report} days={days} by="family" shop={shop} />
          </div>
        </Section>
        <Section id="weekly-intake" title="Weekly intake, last 52 weeks" csv={csvLink(csvLinks.report('weekly-intake', shop), `weekly intake, ${scopeName}`)}>
          <details>
            <summary className="min-h-11 cursor-pointer py-2 font-semibold text-accent-700">Show all 52 weeks</summary>
            <WeeklyIntakeTable report={report} shop={shop} />
          </details>
        </Section>
      </div>
    );
  }

  return (
    <>
      <PageHeader
        title="Reports"
        description={`${shopName ?? 'All your shops'}: the dashboard’s figures as tables${mayExport ? ', each with a CSV file' : ''}.`}
        actions={
          <div className="flex flex-wrap items-end gap-3">
            <ScopePicker shops={shops} value={shop} onChange={setShop} />
            <Link className={`${figureLink} min-h-11 content-center`} to={reportLinks.dashboard(shop)}>Back to the dashboard</Link>
          </div>
        }
      />
      <div className="flex flex-col gap-6">
        {exporter.shops.length ? <InvoiceExport shops={exporter.shops} /> : null}
        {body}
      </div>
    </>
  );
}
