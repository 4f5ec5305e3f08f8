import { regularizedIncompleteBeta } from './incomplete-beta';

/**
 * The Jeffreys test of a probability of default against the observed defaults: under the
 * Jeffreys prior Beta(½, ½), the posterior of the default rate given D defaults among N accounts
 * is Beta(D + ½, N − D + ½), and the p-value is the posterior probability that the rate is at
 * most the PD:
 *   p = F_Beta(PD; D + ½, N − D + ½)
 * One-sided, H0: the PD is not underestimated; a small p says the observed defaults are too many
 * for the PD. Source: European Central Bank (2019), "Instructions for reporting the validation
 * results of internal models — IRB Pillar I models for credit risk", section on the Jeffreys test
 * (the PD of a grade, its defaults and its number of obligors).
 *
 * D and N may be fractional (a weighted holdout's effective counts, see calibration.ts): the
 * formula is the same. Cost: O(√N) (the incomplete beta's continued fraction).
 */
export function jeffreysTest(pd: number, defaults: number, accounts: number): number {
  if (!(pd >= 0 && pd <= 1)) throw new RangeError(`jeffreys test requires a PD in [0, 1], got ${pd}`);
  if (!(accounts > 0 && defaults >= 0 && defaults <= accounts)) {
    throw new RangeError(`jeffreys test requires 0 ≤ defaults ≤ accounts and accounts > 0, got ${defaults} of ${accounts}`);
  }
  return regularizedIncompleteBeta(pd, defaults + 0.5, accounts - defaults + 0.5);
}
