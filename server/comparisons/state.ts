import { comparisonStateLabels, type ComparisonState } from '@shared/comparisons';
import type { EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { Comparison } from '../db/entities/index';
import { conflict, notFound } from '../errors';

/**
 * The one way a comparison changes state (docs/design.md "Workflow and roles"): check that it is in
 * one of the states the step starts from, change it, and write the audit event, all in the
 * caller's transaction (`inTransaction`). A wrong state is a 409 naming the current state and the
 * ones the step needs. Role rules ("not on a comparison you created") are the caller's.
 *
 *   await inTransaction(ctx.dataSource, (manager) =>
 *     transition(manager, comparisonId, ['analysed'], 'in-review', {
 *       actor: user, action: 'comparison.submitted', details: { message },
 *     }));
 */

export interface TransitionEvent {
  /** Who made the change; null for the system (an analysis run finishing). */
  actor: { id: number } | null;
  /** Dotted verb for the audit trail, e.g. `comparison.submitted`. */
  action: string;
  details?: Record<string, unknown>;
}

/**
 * The 409 for a comparison in the wrong state, naming its state and (unless `need` says it in the
 * step's own words) the ones the step needs; nothing when it is in one of `allowed`. For
 * `transition()` and for steps that need a state but do not change it.
 */
export function requireState(comparison: Pick<Comparison, 'state'>, allowed: readonly ComparisonState[], need?: string): void {
  if (allowed.includes(comparison.state)) return;
  const wanted = need ?? `this step needs it ${allowed.map((state) => comparisonStateLabels[state].toLowerCase()).join(' or ')}`;
  throw conflict(`This comparison is ${comparisonStateLabels[comparison.state].toLowerCase()}; ${wanted}.`, {
    state: comparison.state,
    allowedFrom: allowed,
  });
}

export async function transition(
  manager: EntityManager,
  comparison: Comparison | number,
  from: readonly ComparisonState[],
  to: ComparisonState,
  event: TransitionEvent,
): Promise<Comparison> {
  const id = typeof comparison === 'number' ? comparison : comparison.id;
  // Read it again inside the transaction: the caller's copy may be stale.
  const current = await manager.findOneBy(Comparison, { id });
  if (!current) throw notFound(`There is no comparison ${id}.`);
  requireState(current, from);
  const previous = current.state;
  current.state = to;
  current.updatedAt = now();
  await manager.update(Comparison, { id }, { state: to, updatedAt: current.updatedAt });
  await recordAudit(manager, {
    actor: event.actor,
    action: event.action,
    target: { type: 'comparison', id },
    details: { ...event.details, from: previous, to },
  });
  if (typeof comparison !== 'number') {
    comparison.state = to;
    comparison.updatedAt = current.updatedAt;
  }
  return current;
}
