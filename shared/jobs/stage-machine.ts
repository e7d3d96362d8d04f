import { JOB_HOLDS, JOB_STAGE_LABELS, JOB_STAGES, type JobStage, type Role } from '../domain.js';

/**
 * The job stage machine: which moves exist, who may make each one, and what must be true first.
 * The server refuses every other move; the client uses the same table to show only the buttons
 * a person can press.
 *
 * Who moves a job is a matter of the work, not of the screen:
 * - `bench`: the technician's own moves (starting work, handing to quality check, passing it);
 * - `desk`: front desk moves (assessing at intake, recording the customer's approval, releasing);
 * - `shared`: moves either of them makes (putting a job on hold for parts, resuming it);
 * - `transfer`: moves only the transfer steps make (a job goes on the road and arrives), never a button.
 * Owners and regional managers may make every bench, desk and shared move at the shops they run.
 */

export type MainStage = (typeof JOB_STAGES)[number];
export type HoldStage = (typeof JOB_HOLDS)[number];
export type MoveActor = 'bench' | 'desk' | 'shared' | 'transfer';
/** Conditions checked against the job before a move. */
export type MoveGuard = 'estimate_approved' | 'estimate_reapproved';

export interface MoveRule {
  from: JobStage;
  /** `resume` means: back to the stage the job was in before the hold. */
  to: JobStage | 'resume';
  actor: MoveActor;
  /** Short label for the button. */
  label: string;
  guards?: MoveGuard[];
}

/** Main stages a job may be put on hold from (waiting for parts). Work not yet assessed has no parts list. */
const PARTS_HOLD_FROM: MainStage[] = ['assessed', 'approved', 'on_bench', 'quality_check'];
/** Main stages a job may travel from (a transfer). Released work has left the network's hands. */
const TRANSIT_FROM: MainStage[] = ['intake', 'assessed', 'approved', 'on_bench', 'quality_check', 'ready'];

export const MOVE_RULES: readonly MoveRule[] = [
  { from: 'intake', to: 'assessed', actor: 'shared', label: 'Mark assessed' },
  { from: 'assessed', to: 'approved', actor: 'desk', label: 'Estimate approved', guards: ['estimate_approved'] },
  { from: 'approved', to: 'on_bench', actor: 'bench', label: 'Start on bench' },
  { from: 'on_bench', to: 'quality_check', actor: 'bench', label: 'Send to quality check' },
  { from: 'quality_check', to: 'ready', actor: 'bench', label: 'Passed: ready' },
  { from: 'quality_check', to: 'on_bench', actor: 'bench', label: 'Failed: back to bench' },
  { from: 'ready', to: 'released', actor: 'desk', label: 'Release to customer' },
  ...PARTS_HOLD_FROM.map((from): MoveRule => ({ from, to: 'waiting_for_parts', actor: 'shared', label: 'Wait for parts' })),
  { from: 'waiting_for_parts', to: 'resume', actor: 'shared', label: 'Parts arrived: resume' },
  ...TRANSIT_FROM.map((from): MoveRule => ({ from, to: 'in_transit', actor: 'transfer', label: 'Send on relay run' })),
  { from: 'in_transit', to: 'resume', actor: 'transfer', label: 'Received' },
];

export const isHold = (stage: JobStage): stage is HoldStage => (JOB_HOLDS as readonly string[]).includes(stage);

/**
 * The estimate is frozen once the work is finished: from *ready* on, no line, hour or price changes
 * (the customer is quoted what passed the final check). The jobs service enforces it for every write of
 * a job's lines, the pad map's included; screens read it to show the estimate read only.
 */
export const ESTIMATE_FROZEN_STAGES: readonly JobStage[] = ['ready', 'released'];
export const isEstimateFrozen = (stage: JobStage): boolean => ESTIMATE_FROZEN_STAGES.includes(stage);

/** The roles a person holds at one shop; the network-wide owner role counts at every shop. */
export function rolesAtShop(memberships: ReadonlyArray<{ shopId: string | null; role: Role }>, shopId: string): Role[] {
  return [...new Set(memberships.filter((m) => m.shopId === shopId || m.role === 'owner').map((m) => m.role))];
}

/** Which kinds of move a set of roles at one shop may make. */
export function actorsFor(roles: readonly Role[]): Set<MoveActor> {
  const out = new Set<MoveActor>();
  if (roles.includes('owner') || roles.includes('regional_manager')) {
    out.add('bench').add('desk').add('shared');
  }
  if (roles.includes('technician')) out.add('bench').add('shared');
  if (roles.includes('front_desk')) out.add('desk').add('shared');
  return out;
}

/** Recording the customer's approval is desk work (or a manager's). */
export function mayRecordApproval(roles: readonly Role[]): boolean {
  return actorsFor(roles).has('desk');
}

export interface JobState {
  stage: JobStage;
  stageBeforeHold: MainStage | null;
  estimateApprovedAt?: Date | string | null;
  /** The estimate's total rose above the approved amount after the approval (see estimateNeedsReapproval). */
  needsReapproval?: boolean;
}

/**
 * Stages that are work the customer pays for. While a raised estimate waits for a new approval, a job
 * may not move into any of them — it stays at Approved (or where it stands) — except back from quality
 * check to the bench. Holds for parts and transfers still move.
 */
const PAID_WORK_STAGES: JobStage[] = ['on_bench', 'quality_check', 'ready', 'released'];
export function waitsForReapproval(from: JobStage, to: JobStage): boolean {
  return PAID_WORK_STAGES.includes(to) && !(from === 'quality_check' && to === 'on_bench');
}

/** True when an approved estimate has since risen above what the customer approved. */
export function estimateNeedsReapproval(job: { approvedTotalCents?: number | null }, currentTotalCents: number): boolean {
  return job.approvedTotalCents != null && currentTotalCents > job.approvedTotalCents;
}

export interface MoveOption {
  to: JobStage;
  label: string;
  actor: MoveActor;
  /** Guards the job does not meet yet: the move exists but must wait. */
  blockedBy: MoveGuard[];
}

function targetOf(rule: MoveRule, job: JobState): JobStage | null {
  if (rule.to !== 'resume') return rule.to;
  return job.stageBeforeHold;
}

function unmetGuards(rule: MoveRule, job: JobState, to: JobStage): MoveGuard[] {
  const unmet: MoveGuard[] = [];
  for (const guard of rule.guards ?? []) {
    if (guard === 'estimate_approved' && !job.estimateApprovedAt) unmet.push(guard);
  }
  if (job.needsReapproval && rule.actor !== 'transfer' && waitsForReapproval(job.stage, to)) unmet.push('estimate_reapproved');
  return unmet;
}

/** Every move out of the job's stage, whoever may make it (transfer moves included). */
export function movesFrom(job: JobState): MoveOption[] {
  const options: MoveOption[] = [];
  for (const rule of MOVE_RULES) {
    if (rule.from !== job.stage) continue;
    const to = targetOf(rule, job);
    if (!to) continue; // a hold without a stage to resume is damaged data; offer no way out but a fix
    options.push({ to, label: rule.label, actor: rule.actor, blockedBy: unmetGuards(rule, job, to) });
  }
  return options;
}

/** The moves these roles may make from here, as buttons (transfer moves never are). */
export function allowedMoves(job: JobState, roles: readonly Role[]): MoveOption[] {
  const may = actorsFor(roles);
  return movesFrom(job).filter((m) => may.has(m.actor));
}

export type MoveRefusal = 'no_such_move' | 'not_your_move' | 'transfer_only' | MoveGuard;

export type MoveCheck =
  | { ok: true; to: JobStage; stageBeforeHold: MainStage | null }
  | { ok: false; reason: MoveRefusal; message: string };

const GUARD_MESSAGES: Record<MoveGuard, string> = {
  estimate_approved: "Record the customer's approval of the estimate first.",
  estimate_reapproved: "The estimate has risen above what the customer approved; record a new approval first.",
};

/**
 * Checks one move. `via: 'transfer'` is how the transfer steps move a job; people always move as
 * 'person'. On success it also says what `stage_before_hold` becomes.
 */
export function checkMove(job: JobState, to: JobStage, roles: readonly Role[], via: 'person' | 'transfer' = 'person'): MoveCheck {
  const candidates = movesFrom(job).filter((m) => m.to === to);
  const label = (s: JobStage) => JOB_STAGE_LABELS[s];
  if (!candidates.length) {
    return { ok: false, reason: 'no_such_move', message: `A job cannot go from ${label(job.stage)} to ${label(to)}.` };
  }
  const move =
    via === 'transfer'
      ? candidates.find((m) => m.actor === 'transfer')
      : candidates.find((m) => m.actor !== 'transfer' && actorsFor(roles).has(m.actor));
  if (!move) {
    if (via === 'person' && candidates.every((m) => m.actor === 'transfer')) {
      return { ok: false, reason: 'transfer_only', message: `Only a transfer moves a job to or from ${label('in_transit')}.` };
    }
    if (via === 'transfer') {
      return { ok: false, reason: 'no_such_move', message: `A transfer cannot move a job from ${label(job.stage)} to ${label(to)}.` };
    }
    return { ok: false, reason: 'not_your_move', message: `Your role at this shop does not move jobs from ${label(job.stage)} to ${label(to)}.` };
  }
  if (move.blockedBy.length) {
    return { ok: false, reason: move.blockedBy[0], message: GUARD_MESSAGES[move.blockedBy[0]] };
  }
  // entering a hold remembers where to come back to; leaving one (or any main move) clears it
  const stageBeforeHold = isHold(to) ? (isHold(job.stage) ? job.stageBeforeHold : job.stage) : null;
  return { ok: true, to, stageBeforeHold };
}
