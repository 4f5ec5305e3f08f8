import { describe, expect, it } from 'vitest';
import { fisherExactTwoSided } from '@server/stats/fisher-exact';
import { swapTest } from '@server/stats/swap-test';
import { twoProportionZ } from '@server/stats/two-proportion';

describe('swapTest', () => {
  it('uses the two-proportion z test when every expected count is at least 5', () => {
    // Table swap-in 25/812 bad, swap-out 52/812 bad: smallest expected count 812·77/1624 = 38.5
    // (computed by hand), so the z test.
    const test = swapTest(25, 812, 52, 812);
    expect(test.method).toBe('two-proportion-z');
    expect(test).toEqual({ method: 'two-proportion-z', ...twoProportionZ(25, 812, 52, 812), reason: null });
    expect(test.z).toBeLessThan(0);
  });

  it("uses Fisher's exact test when an expected count is below 5", () => {
    // Swap-in 1/20 bad, swap-out 6/25 bad: expected bads in swap-in 20·7/45 = 3.11 < 5 (by hand).
    const test = swapTest(1, 20, 6, 25);
    expect(test).toEqual({ method: 'fisher-exact', z: null, p: fisherExactTwoSided(1, 19, 6, 19), reason: null });
    // Exactly 5 is not below 5: swap-in 5/10, swap-out 5/10 → expected 5 in every cell (by hand).
    expect(swapTest(5, 10, 5, 10).method).toBe('two-proportion-z');
  });

  it('gives null z and p with the reason when a side is empty', () => {
    expect(swapTest(0, 0, 3, 40)).toMatchObject({ z: null, p: null, reason: expect.stringMatching(/no swap-in/) });
    expect(swapTest(3, 40, 0, 0)).toMatchObject({ z: null, p: null, reason: expect.stringMatching(/no swap-out/) });
    expect(swapTest(0, 0, 0, 0)).toMatchObject({ z: null, p: null, reason: expect.stringMatching(/same accounts/) });
  });

  it('handles sides without any bad through Fisher (p = 1), never NaN', () => {
    // No bads at all: expected bad counts 0 < 5, so Fisher; every table has the observed
    // probability, p = 1 (R fisher.test(matrix(c(0, 0, 30, 40), 2)) gives 1: proportions.json).
    expect(swapTest(0, 30, 0, 40)).toEqual({ method: 'fisher-exact', z: null, p: 1, reason: null });
  });
});
