import { useQuery } from '@tanstack/react-query';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { dashboardQueryOptions } from '../queries';
import { BenchLoadChart } from './bench-load-chart';
import { OpenJobsChart } from './open-jobs-chart';
import { OverduePreview } from './overdue-preview';
import { StatCards } from './stat-cards';
import { TransfersPreview } from './transfers-preview';
import { TurnaroundCharts } from './turnaround-chart';
import { WeeklyIntakeChart } from './weekly-intake-chart';

/** Every figure of the dashboard for one scope (a shop, or all the person's shops). */
export function DashboardView({ shop }: { shop?: string }) {
  const figures = useQuery(dashboardQueryOptions(shop));
  if (figures.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Adding up the figures…" showLabel />
      </div>
    );
  }
  if (figures.isError) {
    return (
      <ErrorState
        title="The figures could not be loaded"
        error={figures.error}
        onRetry={() => void figures.refetch()}
        retrying={figures.isFetching}
      />
    );
  }
  const report = figures.data;
  return (
    <div className="flex flex-col gap-6">
      <StatCards report={report} shop={shop} />
      <OpenJobsChart report={report} />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
        <OverduePreview report={report} shop={shop} />
        <TransfersPreview report={report} shop={shop} />
      </div>
      <BenchLoadChart report={report} />
      <TurnaroundCharts report={report} shop={shop} />
      <WeeklyIntakeChart report={report} shop={shop} />
    </div>
  );
}
