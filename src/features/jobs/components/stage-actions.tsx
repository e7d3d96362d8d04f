import type { JobDetail } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-controls';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { isApiError } from '@/lib/api-client';
import { jobApi, useJobMutation } from '../queries';
import { stageLabel } from '../format';

const BLOCKED_REASON: Record<string, string> = {
  estimate_approved: 'Waits for the customer’s approval (record it under Approval).',
  estimate_reapproved: 'The estimate rose above what the customer approved: waits for a new approval (record it under Approval).',
};

/**
 * The cautions that stand beside a move: the one that starts (or restarts) the work on the bench carries every
 * hazard of the job's lines, and lifting for a heavy case; the hand-back carries lifting for a heavy case.
 */
function cautionsBeside(to: JobDetail['moves'][number]['to'], detail: JobDetail) {
  if (to === 'on_bench') return detail.safety.cautions;
  if (to === 'released') return detail.safety.cautions.filter((c) => c.hazard === 'heavy_lift');
  return [];
}

/** Only the moves this person may make now, as large buttons; the server checks each one again. */
export function StageActions({ detail }: { detail: JobDetail }) {
  const move = useJobMutation(detail.job.id, (to: JobDetail['moves'][number]['to']) => jobApi.move(detail.job.id, to));
  if (detail.moves.length === 0) {
    return <p className="text-sm text-ink-600">No stage moves for you here right now.</p>;
  }
  const forward = detail.moves.filter((m) => m.to !== 'waiting_for_parts');
  const hold = detail.moves.filter((m) => m.to === 'waiting_for_parts');
  return (
    <div className="flex flex-col gap-3">
      <div className="grid gap-3 sm:grid-cols-2">
        {[...forward, ...hold].map((m) => {
          const cautions = cautionsBeside(m.to, detail);
          return (
          <div key={m.to} className={cautions.length ? 'flex flex-col gap-2 sm:col-span-2' : 'flex flex-col gap-1'}>
            <Button
              size="lg"
              variant={m.to === 'waiting_for_parts' ? 'secondary' : 'primary'}
              disabled={move.isPending || m.blockedBy.length > 0}
              onClick={() => move.mutate(m.to)}
              aria-describedby={[m.blockedBy.length ? `blocked-${m.to}` : '', cautions.length ? `cautions-${m.to}` : ''].filter(Boolean).join(' ') || undefined}
            >
              {m.label}
              <span className="sr-only"> (move to {stageLabel(m.to)})</span>
            </Button>
            {m.blockedBy.length ? (
              <p id={`blocked-${m.to}`} className="text-sm text-ink-600">
                {m.blockedBy.map((b) => BLOCKED_REASON[b] ?? b).join(' ')}
              </p>
            ) : null}
            <HazardCautions id={`cautions-${m.to}`} cautions={cautions} intro={m.to === 'on_bench' ? 'Before you start on the bench' : 'Before you hand it back'} />
          </div>
          );
        })}
      </div>
      <FormError message={move.error ? (isApiError(move.error) ? move.error.message : 'The move could not be saved. Try again.') : null} />
    </div>
  );
}
