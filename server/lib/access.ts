import { subject as asSubject } from '@casl/ability';
import { rulesToCondition } from '@casl/ability/extra';
import { Op, type WhereOptions } from 'sequelize';
import type { Action, AppAbility, SubjectName } from '../../shared/auth/ability.js';
import { forbidden } from './errors.js';

/**
 * The small Sequelize adapter CASL lacks: turns the rules for (action, subject) into a `where`.
 * Conditions in shared/auth/ability.ts use only equality and `$in`, which this translates;
 * anything else is refused loudly rather than silently widened.
 */
function conditionToWhere(cond: Record<string, unknown>): WhereOptions {
  const where: Record<string, unknown> = {};
  for (const [field, value] of Object.entries(cond)) {
    if (value && typeof value === 'object' && !Array.isArray(value)) {
      const ops = value as Record<string, unknown>;
      const out: Record<symbol, unknown> = {};
      for (const [op, v] of Object.entries(ops)) {
        if (op === '$in') out[Op.in] = v;
        else if (op === '$eq') out[Op.eq] = v;
        else if (op === '$ne') out[Op.ne] = v;
        else throw new Error(`accessibleWhere: unsupported operator ${op}`);
      }
      where[field] = out;
    } else {
      where[field] = value;
    }
  }
  return where;
}

/**
 * `null` means "nothing is allowed" (the caller answers with an empty list or 403);
 * `{}` means "no restriction beyond the network".
 */
export function accessibleWhere(ability: AppAbility, action: Action, subject: SubjectName): WhereOptions | null {
  return rulesToCondition<AppAbility, WhereOptions, WhereOptions>(
    ability.rulesFor(action, subject),
    (rule) => {
      const where = conditionToWhere(rule.conditions ?? {});
      return rule.inverted ? { [Op.not]: where } : where;
    },
    {
      and: (conds) => ({ [Op.and]: conds }),
      or: (conds) => (conds.length === 1 ? conds[0] : { [Op.or]: conds }),
      empty: () => ({}),
    },
  );
}

/** Single-row check against the loaded row; throws 403 with a plain message. */
export function assertCan(ability: AppAbility, action: Action, subject: SubjectName, row?: Record<string, unknown>, message?: string) {
  const target = row ? asSubject(subject, { ...row }) : subject;
  if (!ability.can(action, target)) throw forbidden(message);
}
