import { errorCodes } from '@shared/errors';
import { segmentValueLabel, type MixedStrategyQuery, type MixedStrategyResult } from '@shared/mixed-strategy';
import { noSuchChallengerMessage } from '@shared/challengers-words';
import { challengersOf } from '@shared/report';
import type { AppContext } from '../context';
import type { AnalysisRun } from '../db/entities/index';
import { AppError } from '../errors';
import { mixedStrategy, resolveKept } from '../stats/mixed-strategy';
import { pairData } from '../stats/policy-data';
import { requireCurrentRun } from './service';

/**
 * Conditional adoption on a stored run: the mixed strategy's figures (stats/mixed-strategy.ts) on
 * the run's prepared data (prepared-cache.ts: no sort on the request thread; one O(n) pass). The
 * approval rate defaults to the run's (the report's strategy curve). A segment value that is not
 * in the run's holdout is a 400 naming it, before anything else. With several challengers,
 * `challenger` (default 0, the primary) is the one adopted outside the kept values: the same
 * figures on its prepared data against the champion, and the result names it.
 */
export async function mixedStrategyOnRun(
  ctx: Pick<AppContext, 'dataSource' | 'preparedCache'>,
  run: Pick<AnalysisRun, 'id' | 'input' | 'settings' | 'mapping'>,
  query: MixedStrategyQuery,
): Promise<MixedStrategyResult> {
  // Several challengers: the one adopted outside the kept values (400 for an index beyond them).
  const k = query.challenger ?? 0;
  const challengers = challengersOf(run.mapping);
  if (k >= challengers.length) {
    throw new AppError(errorCodes.badInput, noSuchChallengerMessage(k, challengers.length), 400);
  }
  const entry = await ctx.preparedCache.get(ctx.dataSource, run);
  const data = pairData(entry.data, k);
  const unknown = resolveKept(data.segments, query.keepChampion, 0).unknown;
  if (unknown.length > 0) {
    const columns = data.segments.map((segment) => segment.column);
    throw new AppError(
      errorCodes.badInput,
      `${unknown.length === 1 ? 'This segment value is' : 'These segment values are'} not in the holdout: ${unknown.map(segmentValueLabel).join('; ')}. ${
        columns.length === 0 ? 'The comparison maps no segment column.' : `Its segment columns are ${columns.join(', ')}.`
      }`,
      400,
      { unknown },
    );
  }
  // One reference per value, in the order given.
  const seen = new Set<string>();
  const keep = query.keepChampion.filter((ref) => {
    const key = JSON.stringify([ref.column, ref.value]);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  const named = challengers.length > 1 ? { challenger: k, challengerName: challengers[k].name } : {};
  return { runId: run.id, ...mixedStrategy(data, query.approvalRate ?? entry.settings.approvalRate, keep), ...named };
}

/** The preview: the figures on the comparison's current run. */
export async function mixedStrategyPreview(ctx: Pick<AppContext, 'dataSource' | 'preparedCache'>, comparisonId: number, query: MixedStrategyQuery): Promise<MixedStrategyResult> {
  const run = await requireCurrentRun(ctx.dataSource, comparisonId);
  return mixedStrategyOnRun(ctx, run, query);
}
