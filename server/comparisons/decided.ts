import type { ComparisonSummary } from '@shared/comparisons';
import { In, type DataSource, type EntityManager } from 'typeorm';
import { Decision } from '../db/entities/index';

export type Decided = NonNullable<ComparisonSummary['decided']>;

/**
 * The decision of each decided comparison among `ids` (the newest, should there be more than
 * one): its outcome and the model it chose, for the list and the header. One query.
 */
export async function decidedOf(source: DataSource | EntityManager, ids: readonly number[]): Promise<Map<number, Decided>> {
  const decided = new Map<number, Decided>();
  if (ids.length === 0) return decided;
  const decisions = await source.getRepository(Decision).find({
    where: { comparisonId: In([...ids]) },
    select: { id: true, comparisonId: true, outcome: true, chosen: true },
    order: { id: 'ASC' },
  });
  for (const decision of decisions) decided.set(decision.comparisonId, { outcome: decision.outcome, chosen: decision.chosen ?? null });
  return decided;
}
