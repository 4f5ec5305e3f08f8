import type { SwapQuery, SwapResult } from '@shared/comparisons';
import type { SwapSets } from '@shared/report';
import type { AppContext } from '../context';
import type { AnalysisRun } from '../db/entities/index';
import { locateCutoff, type LocatedCutoff } from '../stats/cutoffs';
import type { PreparedHoldout } from '../stats/policy-data';
import { strategyCurve } from '../stats/strategy-curve';
import { swapSets, type SwapRequest } from '../stats/swap-sets';
import { preparedCacheFor, type PreparedRun } from './prepared-cache';
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
 * - at given cut-offs: `approvalRate` is the champion's achieved approval rate; championBads and
 *   challengerBads are the bads each model approves at its own cut-off, badsAvoided their
 *   difference; approvalsGainedAtEqualBadRate is measured against the champion's book at its
 *   cut-off (null when the champion approves nobody).
 * Both: championApprovalRate and challengerApprovalRate are the rates each cut-off achieves.
 */

export function swapRequestOf(query: { cutoffs?: { champion: number; challenger: number } | null; approvalRate?: number | null }): SwapRequest {
  if (query.cutoffs) return { basis: 'cutoffs', cutoffs: query.cutoffs };
  if (query.approvalRate === undefined || query.approvalRate === null) throw new Error('give cut-offs or an approval rate');
  return { basis: 'approval-rate', approvalRate: query.approvalRate };
}

function approvedBads(data: PreparedHoldout, model: 'champion' | 'challenger', located: LocatedCutoff): number {
  return data.bads - data[model].badsBefore[located.start];
}

export function swapAt(entry: PreparedRun, request: SwapRequest): SwapResult {
  const { data, settings } = entry;
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
    const championBads = approvedBads(data, 'champion', champion);
    const challengerBads = approvedBads(data, 'challenger', challenger);
    const rate = champion.position.approvalRate;
    position = {
      approvalRate: rate,
      championBads,
      challengerBads,
      badsAvoided: championBads - challengerBads,
      approvalsGainedAtEqualBadRate: rate > 0 ? strategyCurve(data, rate).atApprovalRate.approvalsGainedAtEqualBadRate : null,
      championApprovalRate: champion.position.approvalRate,
      challengerApprovalRate: challenger.position.approvalRate,
    };
  }
  return { swap, swapMatrix: entry.matrix, strategyPosition: position };
}

/** The current run, prepared (409 while no run is done). */
export async function preparedCurrentRun(ctx: AppContext, comparisonId: number): Promise<{ run: AnalysisRun; entry: PreparedRun }> {
  const run = await requireCurrentRun(ctx.dataSource, comparisonId);
  const entry = await preparedCacheFor(ctx.dataSource).get(ctx.dataSource, run);
  return { run, entry };
}

export async function swapOnDemand(ctx: AppContext, comparisonId: number, query: SwapQuery): Promise<SwapResult> {
  const { entry } = await preparedCurrentRun(ctx, comparisonId);
  return swapAt(entry, swapRequestOf(query));
}
