import type { ReactNode } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { INSTRUMENT_FAMILIES, INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS, type InstrumentFamily, type JobStage } from '@shared/domain';
import { csvLinks, reportLinks, type JobListFilters } from '@shared/reports/links';
import { formatIsoDate } from '@shared/reports/format';
import { TURNAROUND_WINDOWS, type TurnaroundWindow } from '@shared/reports/schemas';
import { PageHeader } from '@/components/ui/page-header';
import { ScopePicker } from '@/features/dashboard/components/scope-picker';
import { figureLink } from '@/features/dashboard/components/chart-figure';
import { CsvLink } from '@/features/reports/components/csv-link';
import { JobsTable } from '@/features/reports/components/jobs-table';
import { OverdueTable } from '@/features/reports/components/overdue-table';
import { TransfersTable } from '@/features/reports/components/transfers-table';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useMayExport, useReportScope } from './report-scope';

function ListPage({ title, description, csv, children }: { title: string; description: ReactNode; csv: string; children: ReactNode }) {
  const { shops, shop, setShop, shopName } = useReportScope();
  const mayExport = useMayExport(shop);
  useDocumentTitle(title);
  return (
    <>
      <PageHeader
        title={title}
        description={<>{shopName ?? 'All your shops'}. {description}</>}
        actions={
          <div className="flex flex-wrap items-end gap-3">
            <ScopePicker shops={shops} value={shop} onChange={setShop} />
            {mayExport ? <CsvLink href={csv} description={title} /> : null}
          </div>
        }
      />
      <nav aria-label="Reports" className="mb-4 flex flex-wrap gap-4 text-sm">
        <Link className={figureLink} to={reportLinks.dashboard(shop)}>Dashboard</Link>
        <Link className={figureLink} to={reportLinks.reports(shop)}>All reports</Link>
      </nav>
      {children}
    </>
  );
}

export function OverdueRoute() {
  const { shop } = useReportScope();
  return (
    <ListPage
      title="Overdue promises"
      description="Jobs past their promised date (on the shop’s own calendar) that are not ready yet, most days late first."
      csv={csvLinks.report('overdue', shop)}
    >
      <OverdueTable shop={shop} />
    </ListPage>
  );
}

export function TransfersInFlightRoute() {
  const { shop } = useReportScope();
  return (
    <ListPage
      title="Transfers in flight"
      description="Instruments that have left on a relay run and not been received yet; times on the destination’s clock."
      csv={csvLinks.report('transfers', shop)}
    >
      <TransfersTable shop={shop} />
    </ListPage>
  );
}

const STAGE_FILTERS = new Set<string>([...Object.keys(JOB_STAGE_LABELS), 'open', 'bench']);

/** Reads the list's filters from the address, dropping anything the API would refuse. */
function useJobFilters(shop: string | undefined): JobListFilters {
  const [params] = useSearchParams();
  const stage = params.get('stage') ?? undefined;
  const family = params.get('family') ?? undefined;
  const readyWithin = Number(params.get('readyWithin'));
  const week = params.get('week') ?? undefined;
  return {
    shop,
    stage: stage && STAGE_FILTERS.has(stage) ? (stage as JobStage | 'open' | 'bench') : undefined,
    skill: params.get('skill') ?? undefined,
    family: family && (INSTRUMENT_FAMILIES as readonly string[]).includes(family) ? (family as InstrumentFamily) : undefined,
    readyWithin: (TURNAROUND_WINDOWS as readonly number[]).includes(readyWithin) ? (readyWithin as TurnaroundWindow) : undefined,
    week: week && /^\d{4}-\d{2}-\d{2}$/.test(week) ? week : undefined,
  };
}

function describeFilters(f: JobListFilters): string {
  const parts: string[] = [];
  if (f.stage === 'open') parts.push('every open job');
  else if (f.stage === 'bench' || (f.skill && !f.stage)) parts.push('open work waiting for the bench');
  else if (f.stage) parts.push(`jobs at the stage “${JOB_STAGE_LABELS[f.stage]}”`);
  if (f.skill) parts.push('needing the skill of the bench-load row you followed');
  if (f.family) parts.push(INSTRUMENT_FAMILY_LABELS[f.family].toLowerCase());
  if (f.readyWithin) parts.push(`that reached Ready in the last ${f.readyWithin} days`);
  if (f.week) parts.push(`taken in during the week of ${formatIsoDate(f.week)}`);
  if (!parts.length) return 'Every job, newest first.';
  const text = parts.join(', ');
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}; newest first.`;
}

export function ReportJobsRoute() {
  const { shop } = useReportScope();
  const filters = useJobFilters(shop);
  return (
    <ListPage title="Jobs behind the figure" description={describeFilters(filters)} csv={csvLinks.jobs(filters)}>
      <JobsTable filters={filters} />
    </ListPage>
  );
}
