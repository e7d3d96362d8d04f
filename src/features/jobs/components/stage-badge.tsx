import type { JobStage } from '@shared/domain';
import { isHold } from '@shared/jobs/stage-machine';
import { cn } from '@/lib/cn';
import { stageLabel } from '../format';

/** The stage in words, never by colour alone; holds are outlined so they read as "paused". */
export function StageBadge({ stage, className }: { stage: JobStage; className?: string }) {
  return (
    <span
      className={cn(
        'inline-flex items-center rounded-full px-2.5 py-0.5 text-xs font-semibold whitespace-nowrap',
        isHold(stage)
          ? 'border border-ink-400 bg-white text-ink-800'
          : stage === 'ready'
            ? 'bg-accent-600 text-white'
            : stage === 'released'
              ? 'bg-paper-200 text-ink-800'
              : 'bg-accent-50 text-accent-800',
        className,
      )}
    >
      {stageLabel(stage)}
    </span>
  );
}

export function OverdueBadge() {
  return (
    <span className="inline-flex items-center rounded-full bg-danger-50 px-2.5 py-0.5 text-xs font-semibold text-danger-700">
      Overdue
    </span>
  );
}
