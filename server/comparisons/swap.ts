import type { ChallengersSwapQuery, ChallengersSwapResult, SwapQuery, SwapResult } from '@shared/comparisons';
import { noSuchChallengerMessage } from '@shared/challengers-words';
import { errorCodes } from '@shared/errors';
import { championOf, challengersOf, type SwapMatrix, type SwapSets } from '@shared/report';
import { AppError } from '../errors';
import { swapMatrix } from '../stats/swap-matrix';
import type { PreparedHoldout } from '../stats/policy-data';
import { approvalPatterns } from '../stats/approval-patterns';
import { pairData } from '../stats/policy-data';
import type { AppContext } from '../context';
import type { AnalysisRun } from '../db/entities/index';
import { locateCutoff } from '../stats/cutoffs';
import { equalApproval, strategyCurve } from '../stats/strategy-curve';
import { swapSets, type SwapRequest } from '../stats/swap-sets';
import type { PreparedRun } from './prepared-cache';
import { requireCurrentRun } from './service';

/**
 * Swap sets on demand: the current run's data (prepared once, then cached), the engine's swap
 * sets at the cut-offs or approval rate asked for, the swap matrix (the same at every cut-off:
 * its bands are the models' quantile bands), and where the cut-offs sit on the strategy curve.
 * O(n) per request once prepared (one pass over typed arrays).
 *
 * Cut-offs win when both cut-offs and an approval rate are given.
 *
 * Strategy position:
 * - at an approval rate r: the report's strategy-curve figures at r (both models at the cut-offs
 *   that give r, tie rule of cutoffs.ts) — identical to the report's `atApprovalRate` when r is
 *   the report's approval rate;
 * - at given cut-offs: `approvalRate` is the champion's achieved approval rate; the champion's
 *   book at its cut-off sets the number of accounts, the challenger's bads are counted in a book
 *   of that size (equalApproval in strategy-curve.ts), its own cut-off's book is stated beside;
 *   approvalsGainedAtEqualBadRate is measured against the champion's book at its cut-off (null
 *   when the champion approves nobody).
 * Both: championApprovalRate and challengerApprovalRate are the rates each cut-off achieves.
 */

export function swapRequestOf(query: { cutoffs?: { champion: number; challenger: number } | null; approvalRate?: number | null }): SwapRequest {
  if (query.cutoffs) return { basis: 'cutoffs', cutoffs: query.cutoffs };
  if (query.approvalRate === undefined || query.approvalRate === null) throw new Error('give cut-offs or an approval rate');
  return { basis: 'approval-rate', approvalRate: query.approvalRate };
}

/**
 * Each further challenger's swap matrix against the champion, computed once per prepared run (it
 * does not depend on the cut-offs either); the first challenger's is the entry's own.
 */
const pairMatrices = new WeakMap<PreparedRun, Map<number, SwapMatrix>>();
function matrixOf(entry: PreparedRun, k: number, data: PreparedHoldout): SwapMatrix {
  if (k === 0) return entry.matrix;
  let byChallenger = pairMatrices.get(entry);
  if (!byChallenger) pairMatrices.set(entry, (byChallenger = new Map()));
  let matrix = byChallenger.get(k);
  if (!matrix) byChallenger.set(k, (matrix = swapMatrix(data)));
  return matrix;
}

/** Swap sets of challenger k (0 = the first) against the champion at the request, on a prepared run. */
export function swapAt(entry: PreparedRun, request: SwapRequest, k = 0): SwapResult {
  const { settings } = entry;
  const data = pairData(entry.data, k);
  const swap: SwapSets = swapSets(data, request, settings.confidence);
  let position: SwapResult['strategyPosition'];
  if (request.basis === 'approval-rate') {
    position = {
      ...strategyCurve(data, request.approvalRate).atApprovalRate,
      championApprovalRate: swap.champion.approvalRate,
      challengerApprovalRate: swap.challenger.approvalRate,
    };
  } else {
    const champion = locateCutoff(data.champion, { cutoff: request.cutoffs.champion });
    const challenger = locateCutoff(data.challenger, { cutoff: request.cutoffs.challenger });
    position = {
      approvalRate: champion.position.approvalRate,
      ...equalApproval(data, champion, challenger),
      championApprovalRate: champion.position.approvalRate,
      challengerApprovalRate: challenger.position.approvalRate,
    };
  }
  return { swap, swapMatrix: matrixOf(entry, k, data), strategyPosition: position };
}

/** The current run, prepared (409 while no run is done). */
export async function preparedCurrentRun(ctx: AppContext, comparisonId: number): Promise<{ run: AnalysisRun; entry: PreparedRun }> {
  const run = await requireCurrentRun(ctx.dataSource, comparisonId);
  const entry = await ctx.preparedCache.get(ctx.dataSource, run);
  return { run, entry };
}

/**
 * The swap sets at the query's settings for challenger `query.challenger` (default 0, the first);
 * a 400 names an index the current run does not have, before any data is read.
 */
export async function swapOnDemand(ctx: AppContext, comparisonId: number, query: SwapQuery): Promise<SwapResult> {
  const run = await requireCurrentRun(ctx.dataSource, comparisonId);
  const k = challengerIndexOf(run, query.challenger);
  const entry = await ctx.preparedCache.get(ctx.dataSource, run);
  return swapAt(entry, swapRequestOf(query), k);
}

/** The challenger asked for (default 0), checked against the run's challengers: a 400 naming it otherwise. */
export function challengerIndexOf(run: Pick<AnalysisRun, 'mapping'>, asked: number | undefined): number {
  const k = asked ?? 0;
  const count = challengersOf(run.mapping).length;
  if (k >= count) throw new AppError(errorCodes.badInput, noSuchChallengerMessage(k, count), 400);
  return k;
}

/**
 * Several challengers, side by side: every challenger's swap sets against the champion at one
 * approval rate (each model at its own cut-off for the rate), and who each model approves (the
 * approval patterns). On the current run's prepared data, which holds every challenger: O(K·n).
 */
export async function challengersSwapOnDemand(ctx: AppContext, comparisonId: number, query: ChallengersSwapQuery): Promise<ChallengersSwapResult> {
  const { run, entry } = await preparedCurrentRun(ctx, comparisonId);
  const specs = challengersOf(run.mapping);
  const pairs = specs.map((_, k) => pairData(entry.data, k));
  const request = { basis: 'approval-rate' as const, approvalRate: query.approvalRate };
  const champion = championOf(run.mapping);
  return {
    approvalRate: query.approvalRate,
    challengers: specs.map((spec, k) => ({ challenger: k, column: spec.column, name: spec.name, swap: swapSets(pairs[k], request, entry.settings.confidence) })),
    patterns: approvalPatterns(
      [{ name: champion.name, column: champion.column, prepared: entry.data.champion }, ...pairs.map((pair, k) => ({ name: specs[k].name, column: specs[k].column, prepared: pair.challenger }))],
      { bad: entry.data.bad, weight: entry.data.weight, known: entry.data.known },
      query.approvalRate,
    ),
  };
}
