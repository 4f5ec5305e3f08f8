import type { SegmentSwapCell, SwapCell, SwapSegmentRow, SwapSets } from '@shared/report';
import { locateCutoff, type LocatedCutoff } from './cutoffs';
import { levelOrder } from './holdout';
import type { PreparedHoldout } from './policy-data';
import { BOTH_ACCEPT, segmentApproval, SWAP_IN, SWAP_OUT, type SwapRequest, swapResult } from './swap-result';
import { swapTest } from './swap-test';
import { weightedSwapSets } from './swap-sets-weighted';
import { wilsonInterval } from './wilson';

/**
 * Swap sets: the 2×2 of accept / reject decisions of the two models at their cut-offs, either
 * given per model or matched to one approval rate (see cutoffs.ts for the acceptance and tie
 * rules). Cells: both accept; swap-in (champion rejects, challenger accepts); swap-out (champion
 * accepts, challenger rejects); both reject. Each with count, share of the holdout, bads, bad
 * rate with its Wilson interval (Wilson 1927, JASA 22:209–212), and the exposure sum when an
 * exposure column is mapped; and the swap-in vs swap-out bad-rate test (swap-test.ts).
 * Within each value of each mapped segment column (`bySegment`): each model's approvals and the
 * bad rate of what it approves, and the swap-in and swap-out cells, at the same cut-offs, values
 * in the order of the report's segment rows.
 * Common practice, no source.
 *
 * Weights and applicants without an outcome (swap-sets-weighted.ts): when the holdout has either,
 * every cell also carries accounts (summed weights), known and unknown accounts, bads and the bad
 * rate of the known accounts with Wilson's interval on the Kish effective size, the bounds
 * [every unknown good, every unknown bad], and the inferred bad rate under the report's reject
 * inference; without them the cells are exactly as before.
 * Cost: O(log n) to place the cut-offs, one O(n) pass over typed arrays on prepared data, and one
 * more per segment column.
 */

export type { SwapRequest } from './swap-result';

export function swapSets(data: PreparedHoldout, request: SwapRequest, confidence: number): SwapSets {
  const { champion, challenger } = locateBoth(data, request);
  if (data.weight !== null || data.known !== null) return weightedSwapSets(data, request, champion, challenger, confidence);
  return plainSwapSets(data, request, champion, challenger, confidence);
}

export function locateBoth(data: PreparedHoldout, request: SwapRequest): { champion: LocatedCutoff; challenger: LocatedCutoff } {
  let champion: LocatedCutoff;
  let challenger: LocatedCutoff;
  if (request.basis === 'cutoffs') {
    champion = locateCutoff(data.champion, { cutoff: request.cutoffs.champion });
    challenger = locateCutoff(data.challenger, { cutoff: request.cutoffs.challenger });
  } else {
    champion = locateCutoff(data.champion, { approvalRate: request.approvalRate });
    challenger = locateCutoff(data.challenger, { approvalRate: request.approvalRate });
  }
  return { champion, challenger };
}

function plainSwapSets(data: PreparedHoldout, request: SwapRequest, champion: LocatedCutoff, challenger: LocatedCutoff, confidence: number): SwapSets {
  const { n, bad, exposure } = data;
  const a = data.champion.safety;
  const b = data.challenger.safety;
  const cutA = champion.safetyCut;
  const cutB = challenger.safetyCut;
  const counts = new Float64Array(4);
  const bads = new Float64Array(4);
  const amounts = new Float64Array(4);
  // Each account's cell, kept for the segment passes.
  const cells = data.segments.length > 0 ? new Uint8Array(n) : null;
  if (exposure) {
    for (let i = 0; i < n; i++) {
      const cell = (a[i] >= cutA ? 1 : 0) | (b[i] >= cutB ? 2 : 0);
      counts[cell]++;
      bads[cell] += bad[i];
      amounts[cell] += exposure[i];
      if (cells) cells[i] = cell;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const cell = (a[i] >= cutA ? 1 : 0) | (b[i] >= cutB ? 2 : 0);
      counts[cell]++;
      bads[cell] += bad[i];
      if (cells) cells[i] = cell;
    }
  }

  const cell = (index: number): SwapCell => ({
    ...cellOf(counts[index], bads[index], exposure ? amounts[index] : null, confidence),
    share: counts[index] / n,
  });

  const test = swapTest(bads[SWAP_IN], counts[SWAP_IN], bads[SWAP_OUT], counts[SWAP_OUT]);
  return swapResult(request, champion, challenger, cell, test, cells ? swapBySegment(data, cells, confidence) : []);
}

/** A cell's count, bads, bad rate with its Wilson interval, and amount. */
function cellOf(count: number, bads: number, amount: number | null, confidence: number): SegmentSwapCell {
  return { count, bads, badRate: count > 0 ? bads / count : null, badRateCi: wilsonInterval(bads, count, confidence), amount };
}

/** Per segment value: the four cells' counts, bads and amounts from each account's cell. */
function swapBySegment(data: PreparedHoldout, cells: Uint8Array, confidence: number): SwapSegmentRow[] {
  const { n, bad, exposure } = data;
  const rows: SwapSegmentRow[] = [];
  for (const { column, levels, codes } of data.segments) {
    // Index level·4 + cell.
    const counts = new Float64Array(levels.length * 4);
    const bads = new Float64Array(levels.length * 4);
    const amounts = exposure ? new Float64Array(levels.length * 4) : null;
    for (let i = 0; i < n; i++) {
      const k = codes[i] * 4 + cells[i];
      counts[k]++;
      bads[k] += bad[i];
      if (amounts) amounts[k] += exposure![i];
    }
    // Values in the same order as the report's segment rows (segments.ts).
    for (const level of levelOrder(levels)) {
      const value = levels[level];
      const at = level * 4;
      const cell = (index: number) => cellOf(counts[at + index], bads[at + index], amounts ? amounts[at + index] : null, confidence);
      const accounts = counts[at] + counts[at + 1] + counts[at + 2] + counts[at + 3];
      const approval = (accepted: number, other: number) => {
        const approved = counts[at + accepted] + counts[at + other];
        return segmentApproval(accounts, approved, approved, bads[at + accepted] + bads[at + other]);
      };
      rows.push({
        column,
        value,
        accounts,
        bads: bads[at] + bads[at + 1] + bads[at + 2] + bads[at + 3],
        champion: approval(BOTH_ACCEPT, SWAP_OUT),
        challenger: approval(BOTH_ACCEPT, SWAP_IN),
        swapIn: cell(SWAP_IN),
        swapOut: cell(SWAP_OUT),
      });
    }
  }
  return rows;
}
