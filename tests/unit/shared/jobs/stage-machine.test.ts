import { describe, expect, it } from 'vitest';
import { ALL_JOB_STAGES, ROLES, type JobStage, type Role } from '../../../../shared/domain.js';
import {
  actorsFor,
  allowedMoves,
  checkMove,
  mayRecordApproval,
  rolesAtShop,
  type JobState,
} from '../../../../shared/jobs/stage-machine.js';

/**
 * The expected table is written out by hand (not derived from MOVE_RULES), so a changed rule fails here.
 * For holds the job remembers `on_bench` as the stage to resume.
 */
const RESUME_TO: JobStage = 'on_bench';
type Who = Role;
const EVERYONE_WHO_WORKS: Who[] = ['owner', 'regional_manager', 'front_desk', 'technician'];
const BENCH: Who[] = ['owner', 'regional_manager', 'technician'];
const DESK: Who[] = ['owner', 'regional_manager', 'front_desk'];

const PERSON_MOVES: Array<[JobStage, JobStage, Who[]]> = [
  ['intake', 'assessed', EVERYONE_WHO_WORKS],
  ['assessed', 'approved', DESK],
  ['approved', 'on_bench', BENCH],
  ['on_bench', 'quality_check', BENCH],
  ['quality_check', 'ready', BENCH],
  ['quality_check', 'on_bench', BENCH],
  ['ready', 'released', DESK],
  ['assessed', 'waiting_for_parts', EVERYONE_WHO_WORKS],
  ['approved', 'waiting_for_parts', EVERYONE_WHO_WORKS],
  ['on_bench', 'waiting_for_parts', EVERYONE_WHO_WORKS],
  ['quality_check', 'waiting_for_parts', EVERYONE_WHO_WORKS],
  ['waiting_for_parts', RESUME_TO, EVERYONE_WHO_WORKS],
];

const TRANSFER_MOVES: Array<[JobStage, JobStage]> = [
  ['intake', 'in_transit'],
  ['assessed', 'in_transit'],
  ['approved', 'in_transit'],
  ['on_bench', 'in_transit'],
  ['quality_check', 'in_transit'],
  ['ready', 'in_transit'],
  ['in_transit', RESUME_TO],
];

function jobAt(stage: JobStage, over: Partial<JobState> = {}): JobState {
  const hold = stage === 'waiting_for_parts' || stage === 'in_transit';
  return { stage, stageBeforeHold: hold ? RESUME_TO : null, estimateApprovedAt: new Date('2025-10-01T17:00:00Z'), ...over } as JobState;
}

describe('stage machine: every move, for every role', () => {
  for (const role of ROLES) {
    for (const from of ALL_JOB_STAGES) {
      for (const to of ALL_JOB_STAGES) {
        const allowed = PERSON_MOVES.some(([f, t, who]) => f === from && t === to && who.includes(role));
        it(`${role}: ${from} → ${to} is ${allowed ? 'allowed' : 'refused'}`, () => {
          const result = checkMove(jobAt(from), to, [role]);
          expect(result.ok).toBe(allowed);
        });
      }
    }
  }

  it('offers as buttons exactly the allowed moves, never a transfer move', () => {
    for (const role of ROLES) {
      for (const from of ALL_JOB_STAGES) {
        const expected = PERSON_MOVES.filter(([f, , who]) => f === from && who.includes(role)).map(([, t]) => t).sort();
        expect(allowedMoves(jobAt(from), [role]).map((m) => m.to).sort(), `${role} at ${from}`).toEqual(expected);
      }
    }
  });
});

describe('stage machine: transfers', () => {
  for (const from of ALL_JOB_STAGES) {
    for (const to of ALL_JOB_STAGES) {
      const allowed = TRANSFER_MOVES.some(([f, t]) => f === from && t === to);
      it(`a transfer step: ${from} → ${to} is ${allowed ? 'allowed' : 'refused'}`, () => {
        expect(checkMove(jobAt(from), to, [], 'transfer').ok).toBe(allowed);
      });
    }
  }

  it('refuses people the in-transit moves with a reason that names transfers, even the owner', () => {
    const out = checkMove(jobAt('on_bench'), 'in_transit', ['owner']);
    expect(out).toMatchObject({ ok: false, reason: 'transfer_only' });
    const back = checkMove(jobAt('in_transit'), RESUME_TO, ['owner']);
    expect(back).toMatchObject({ ok: false, reason: 'transfer_only' });
  });
});

describe('stage machine: holds', () => {
  it('entering a hold remembers the stage; leaving it resumes exactly there and clears it', () => {
    expect(checkMove(jobAt('quality_check'), 'waiting_for_parts', ['technician'])).toEqual({
      ok: true,
      to: 'waiting_for_parts',
      stageBeforeHold: 'quality_check',
    });
    const held = jobAt('waiting_for_parts', { stageBeforeHold: 'approved' });
    expect(checkMove(held, 'approved', ['front_desk'])).toEqual({ ok: true, to: 'approved', stageBeforeHold: null });
    // any other main stage is refused: a hold only resumes
    for (const other of ['intake', 'assessed', 'on_bench', 'quality_check', 'ready', 'released'] as const) {
      expect(checkMove(held, other, ['owner']).ok).toBe(false);
    }
  });

  it('a job on the road resumes where it left off when it is received', () => {
    const travelling = jobAt('in_transit', { stageBeforeHold: 'ready' });
    expect(checkMove(travelling, 'ready', [], 'transfer')).toEqual({ ok: true, to: 'ready', stageBeforeHold: null });
    expect(checkMove(jobAt('ready'), 'in_transit', [], 'transfer')).toEqual({ ok: true, to: 'in_transit', stageBeforeHold: 'ready' });
  });

  it('a hold without a remembered stage offers no way out (damaged data is not guessed at)', () => {
    expect(allowedMoves(jobAt('waiting_for_parts', { stageBeforeHold: null }), ['owner'])).toEqual([]);
  });
});

describe('stage machine: guards and reasons', () => {
  it('approval cannot be marked before the customer approved the estimate', () => {
    const job = jobAt('assessed', { estimateApprovedAt: null });
    expect(checkMove(job, 'approved', ['front_desk'])).toMatchObject({ ok: false, reason: 'estimate_approved' });
    // the button is still shown, marked as waiting for the approval
    expect(allowedMoves(job, ['front_desk']).find((m) => m.to === 'approved')?.blockedBy).toEqual(['estimate_approved']);
  });

  it('says why a move is refused', () => {
    expect(checkMove(jobAt('intake'), 'released', ['owner'])).toMatchObject({ ok: false, reason: 'no_such_move' });
    expect(checkMove(jobAt('ready'), 'released', ['technician'])).toMatchObject({ ok: false, reason: 'not_your_move' });
    expect(checkMove(jobAt('approved'), 'on_bench', ['front_desk'])).toMatchObject({ ok: false, reason: 'not_your_move' });
    expect(checkMove(jobAt('released'), 'ready', ['owner'])).toMatchObject({ ok: false, reason: 'no_such_move' });
  });

  it('a person with two roles at one shop may make the moves of both', () => {
    const both: Role[] = ['technician', 'front_desk'];
    expect(checkMove(jobAt('ready'), 'released', both).ok).toBe(true);
    expect(checkMove(jobAt('approved'), 'on_bench', both).ok).toBe(true);
  });
});

describe('roles at a shop', () => {
  const memberships = [
    { shopId: 'pdx', role: 'technician' as const },
    { shopId: 'sea', role: 'front_desk' as const },
  ];
  it('counts only the roles held at that shop', () => {
    expect(rolesAtShop(memberships, 'pdx')).toEqual(['technician']);
    expect(rolesAtShop(memberships, 'sea')).toEqual(['front_desk']);
    expect(rolesAtShop(memberships, 'den')).toEqual([]);
  });
  it('counts the network-wide owner role at every shop', () => {
    expect(rolesAtShop([{ shopId: null, role: 'owner' }], 'den')).toEqual(['owner']);
  });
  it('auditors move nothing and record no approvals; desk and managers record approvals, technicians do not', () => {
    expect([...actorsFor(['auditor'])]).toEqual([]);
    expect(mayRecordApproval(['auditor'])).toBe(false);
    expect(mayRecordApproval(['technician'])).toBe(false);
    expect(mayRecordApproval(['front_desk'])).toBe(true);
    expect(mayRecordApproval(['regional_manager'])).toBe(true);
  });
});
