import { regularizedLowerGamma, regularizedUpperGamma } from './incomplete-gamma';

/**
 * The χ² quantile: the x with P(χ²_k ≤ x) = q, i.e. P(k / 2, x / 2) = q for the regularized
 * incomplete gamma function (incomplete-gamma.ts), found by bracketing and bisection to the last
 * bit (the distribution function is monotone, so bisection cannot fail). Checked against
 * scipy.stats.chi2.ppf in tests/reference/calibration/.
 * Cost: O(bits · √k).
 */
export function chiSquareQuantile(q: number, degreesOfFreedom: number): number {
  if (!(q > 0 && q < 1)) throw new RangeError(`chi-square quantile requires 0 < q < 1, got ${q}`);
  if (!(degreesOfFreedom > 0)) throw new RangeError(`chi-square quantile requires degrees of freedom > 0, got ${degreesOfFreedom}`);
  const a = degreesOfFreedom / 2;
  const cdf = (x: number) => regularizedLowerGamma(a, x / 2);
  let low = 0;
  let high = Math.max(1, degreesOfFreedom);
  while (cdf(high) < q) {
    low = high;
    high *= 2;
  }
  for (let i = 0; i < 200; i++) {
    const middle = (low + high) / 2;
    if (middle === low || middle === high) break;
    if (cdf(middle) < q) low = middle;
    else high = middle;
  }
  return (low + high) / 2;
}

/**
 * The χ² upper tail P(χ²_k > x) = Q(k / 2, x / 2) (incomplete-gamma.ts), the p-value of a χ² test;
 * computed from the upper function directly so small p-values keep their relative precision.
 * Checked against R's pchisq(lower.tail = FALSE) in tests/reference/challengers/.
 * Cost: O(√k) terms.
 */
export function chiSquareSf(x: number, degreesOfFreedom: number): number {
  if (!(degreesOfFreedom > 0)) throw new RangeError(`chi-square tail requires degrees of freedom > 0, got ${degreesOfFreedom}`);
  if (!(x >= 0)) throw new RangeError(`chi-square tail requires x ≥ 0, got ${x}`);
  return regularizedUpperGamma(degreesOfFreedom / 2, x / 2);
}
