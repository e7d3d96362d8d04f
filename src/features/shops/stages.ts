/**
 * Job stages in the order work moves through a shop, then the two holds. The labels are the words
 * shown everywhere in the client.
 */
export const jobStages = [
  'intake',
  'assessed',
  'approved',
  'on_bench',
  'quality_check',
  'ready',
  'released',
  'waiting_for_parts',
  'in_transit',
] as const;

export type JobStage = (typeof jobStages)[number];

export const stageLabels: Record<JobStage, string> = {
  intake: 'Intake',
  assessed: 'Assessed',
  approved: 'Approved',
  on_bench: 'On bench',
  quality_check: 'Quality check',
  ready: 'Ready',
  released: 'Released',
  waiting_for_parts: 'Waiting for parts',
  in_transit: 'In transit',
};

export const holdStages: ReadonlySet<JobStage> = new Set(['waiting_for_parts', 'in_transit']);

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
 * Non-zero stage counts in workflow order. A stage the client does not know yet (the server moved
 * ahead of this build) is still shown, after the known ones, rather than silently dropped.
 */
export function stageBreakdown(jobsByStage: Record<string, number>): StageCount[] {
  const known = jobStages
    .filter((stage) => (jobsByStage[stage] ?? 0) > 0)
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
