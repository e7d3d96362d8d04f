import { ALL_JOB_STAGES, JOB_HOLDS, JOB_STAGE_LABELS, type JobStage } from '@shared/domain';

export type { JobStage };
export const jobStages = ALL_JOB_STAGES;
export const stageLabels = JOB_STAGE_LABELS;
export const holdStages: ReadonlySet<JobStage> = new Set(JOB_HOLDS);

export function isJobStage(value: string): value is JobStage {
  return (jobStages as readonly string[]).includes(value);
}

export interface StageCount {
  stage: string;
  label: string;
  count: number;
  hold: boolean;
}

/**
 * Non-zero counts of open work in workflow order (released jobs are done, so they are left out). A stage the client does not know yet (the server moved
 * ahead of this build) is still shown, after the known ones, rather than silently dropped.
 */
export function stageBreakdown(jobsByStage: Record<string, number>): StageCount[] {
  const known = jobStages
    .filter((stage) => stage !== 'released' && (jobsByStage[stage] ?? 0) > 0)
    .map((stage) => ({ stage, label: stageLabels[stage], count: jobsByStage[stage], hold: holdStages.has(stage) }));
  const unknown = Object.entries(jobsByStage)
    .filter(([stage, count]) => !isJobStage(stage) && count > 0)
    .map(([stage, count]) => ({ stage, label: humanize(stage), count, hold: false }));
  return [...known, ...unknown];
}

function humanize(code: string): string {
  const words = code.replace(/[_-]+/g, ' ').trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}
