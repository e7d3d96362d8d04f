import { useQuery } from '@tanstack/react-query';
import type { BenchJob, JobSummary } from '@shared/jobs/dto';
import { EmptyState } from '@/components/ui/empty-state';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { myBenchQueryOptions } from '../queries';
import { JobList } from './job-list';

/** The jobs assigned to me, soonest promise first, across every shop I work at. */
export function MyBench({ linkTo }: { linkTo: (job: JobSummary) => string }) {
  const mine = useQuery(myBenchQueryOptions());
  if (mine.isPending) {
    return (
      <div className="flex justify-center rounded-2xl border border-paper-200 bg-white py-16">
        <Spinner label="Loading your bench…" showLabel />
      </div>
    );
  }
  if (mine.isError) {
    return <ErrorState title="Your bench could not be loaded" error={mine.error} onRetry={() => void mine.refetch()} retrying={mine.isFetching} />;
  }
  if (mine.data.length === 0) {
    return <EmptyState title="Nothing on your bench">Jobs assigned to you appear here, soonest promise first.</EmptyState>;
  }
  const shops = new Set(mine.data.map((j) => j.shop.id));
  const overdue = mine.data.filter((j) => j.overdue).length;
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm text-ink-600">
        {mine.data.length} {mine.data.length === 1 ? 'job' : 'jobs'}
        {overdue ? `, ${overdue} overdue` : ''}
      </p>
      <JobList
        jobs={mine.data}
        linkTo={linkTo}
        showShop={shops.size > 1}
        label="My jobs"
        below={(job) => (
          <HazardCautions hazards={(job as BenchJob).hazards} label={`Safety cautions for job ${job.number}`} compact />
        )}
      />
    </div>
  );
}
