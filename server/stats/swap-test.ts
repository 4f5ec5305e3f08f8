import type { SwapSets } from '@shared/report';
import { fisherExactTwoSided } from './fisher-exact';
import { twoProportionZ } from './two-proportion';

export type SwapTest = SwapSets['test'];

/**
 * The swap-in vs swap-out bad-rate test: is the bad rate of the accounts the challenger newly
 * approves different from that of the accounts it newly declines?
 * Choice of test (common practice, no source): Fisher's exact test when any expected cell count of
 * the 2×2 table (swap-in / swap-out × bad / good) is below 5, otherwise the pooled two-proportion
 * z test. Both two-sided. When either side is empty there is nothing to compare: z and p are null
 * and `reason` says which side is empty.
 * Cost: O(1) for the z test, O(smaller margin) for Fisher.
 */
export function swapTest(swapInBads: number, swapInCount: number, swapOutBads: number, swapOutCount: number): SwapTest {
  const total = swapInCount + swapOutCount;
  const badsTotal = swapInBads + swapOutBads;
  const goodsTotal = total - badsTotal;
  const minExpected = total === 0 ? 0 : (Math.min(swapInCount, swapOutCount) * Math.min(badsTotal, goodsTotal)) / total;
  const method = minExpected < 5 ? 'fisher-exact' : 'two-proportion-z';

  if (swapInCount === 0 || swapOutCount === 0) {
    const reason =
      swapInCount === 0 && swapOutCount === 0
        ? 'no swap-in and no swap-out accounts: both models accept the same accounts'
        : swapInCount === 0
          ? 'no swap-in accounts: the challenger accepts no account the champion rejects'
          : 'no swap-out accounts: the challenger rejects no account the champion accepts';
    return { method, z: null, p: null, reason };
  }
  if (method === 'fisher-exact') {
    const p = fisherExactTwoSided(swapInBads, swapInCount - swapInBads, swapOutBads, swapOutCount - swapOutBads);
    return { method, z: null, p, reason: null };
  }
  const { z, p } = twoProportionZ(swapInBads, swapInCount, swapOutBads, swapOutCount);
  return { method, z, p, reason: null };
}
