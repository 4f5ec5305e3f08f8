import { regularizedIncompleteBeta } from './incomplete-beta';

/**
 * The exact binomial test of a probability of default, one-sided, H0: the PD is not
 * underestimated (the default rate is at most the PD): the probability of D or more defaults
 * among N accounts when each defaults with probability PD,
 *   p = P(X ≥ D | N, PD) = I_PD(D, N − D + 1)  for D ≥ 1,  and 1 for D = 0
 * (the tail of the binomial as an incomplete beta: Abramowitz & Stegun 1964, 26.5.24). This is
 * scipy.stats.binomtest(D, N, PD, alternative='greater').pvalue for whole counts (checked in
 * tests/reference/calibration/). For fractional effective counts (weights) the same continuous
 * extension is used. Source of the test: C. J. Clopper & E. S. Pearson (1934), Biometrika
 * 26:404–413, for the exact binomial tail; its use per rating grade is common practice in PD
 * back-testing, no single source.
 * Cost: O(√N).
 */
export function binomialTestUpper(pd: number, defaults: number, accounts: number): number {
  if (!(pd >= 0 && pd <= 1)) throw new RangeError(`binomial test requires a PD in [0, 1], got ${pd}`);
  if (!(accounts > 0 && defaults >= 0 && defaults <= accounts)) {
    throw new RangeError(`binomial test requires 0 ≤ defaults ≤ accounts and accounts > 0, got ${defaults} of ${accounts}`);
  }
  if (defaults === 0) return 1;
  if (pd === 0) return 0;
  if (pd === 1) return 1;
  return regularizedIncompleteBeta(pd, defaults, accounts - defaults + 1);
}
