import type { SwapCell, SwapSets } from '@shared/report';
import { locateCutoff, type LocatedCutoff } from './cutoffs';
import type { PreparedHoldout } from './policy-data';
import { swapTest } from './swap-test';
import { wilsonInterval } from './wilson';

/**
 * Swap sets: the 2×2 of accept / reject decisions of the two models at their cut-offs, either
 * given per model or matched to one approval rate (see cutoffs.ts for the acceptance and tie
 * rules). Cells: both accept; swap-in (champion rejects, challenger accepts); swap-out (champion
 * accepts, challenger rejects); both reject. Each with count, share of the holdout, bads, bad
 * rate with its Wilson interval (Wilson 1927, JASA 22:209–212), and the exposure sum when an
 * exposure column is mapped; and the swap-in vs swap-out bad-rate test (swap-test.ts).
 * Common practice, no source.
 * Cost: O(log n) to place the cut-offs and one O(n) pass over typed arrays on prepared data.
 */

export type SwapRequest =
  | { basis: 'cutoffs'; cutoffs: { champion: number; challenger: number } }
  | { basis: 'approval-rate'; approvalRate: number };

// Cell index: bit 0 = champion accepts, bit 1 = challenger accepts.
const BOTH_REJECT = 0;
const SWAP_OUT = 1;
const SWAP_IN = 2;
const BOTH_ACCEPT = 3;

export function swapSets(data: PreparedHoldout, request: SwapRequest, confidence: number): SwapSets {
  let champion: LocatedCutoff;
  let challenger: LocatedCutoff;
  if (request.basis === 'cutoffs') {
    champion = locateCutoff(data.champion, { cutoff: request.cutoffs.champion });
    challenger = locateCutoff(data.challenger, { cutoff: request.cutoffs.challenger });
  } else {
    champion = locateCutoff(data.champion, { approvalRate: request.approvalRate });
    challenger = locateCutoff(data.challenger, { approvalRate: request.approvalRate });
  }

  const { n, bad, exposure } = data;
  const a = data.champion.safety;
  const b = data.challenger.safety;
  const cutA = champion.safetyCut;
  const cutB = challenger.safetyCut;
  const counts = new Float64Array(4);
  const bads = new Float64Array(4);
  const amounts = new Float64Array(4);
  if (exposure) {
    for (let i = 0; i < n; i++) {
      const cell = (a[i] >= cutA ? 1 : 0) | (b[i] >= cutB ? 2 : 0);
      counts[cell]++;
      bads[cell] += bad[i];
      amounts[cell] += exposure[i];
    }
  } else {
    for (let i = 0; i < n; i++) {
      const cell = (a[i] >= cutA ? 1 : 0) | (b[i] >= cutB ? 2 : 0);
      counts[cell]++;
      bads[cell] += bad[i];
    }
  }

  const cell = (index: number): SwapCell => {
    const count = counts[index];
    const cellBads = bads[index];
    return {
      count,
      share: count / n,
      bads: cellBads,
      badRate: count > 0 ? cellBads / count : null,
      badRateCi: wilsonInterval(cellBads, count, confidence),
      amount: exposure ? amounts[index] : null,
    };
  };

  return {
    basis: request.basis,
    requestedApprovalRate: request.basis === 'approval-rate' ? request.approvalRate : null,
    champion: champion.position,
    challenger: challenger.position,
    bothAccept: cell(BOTH_ACCEPT),
    swapIn: cell(SWAP_IN),
    swapOut: cell(SWAP_OUT),
    bothReject: cell(BOTH_REJECT),
    test: swapTest(bads[SWAP_IN], counts[SWAP_IN], bads[SWAP_OUT], counts[SWAP_OUT]),
  };
}
