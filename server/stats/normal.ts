import jStat from 'jstat';

/**
 * The standard normal distribution: cdf, upper tail and quantile.
 *
 * Transitional implementation on jstat: its erfc is 1 − erf, so upper tails below about 1e-16
 * underflow to 0. The engine work replaces the bodies with a full-precision erfc (the exports stay
 * the same); nothing may rely on the tails of this version.
 */

/** P(Z ≤ z). */
export function normalCdf(z: number): number {
  return jStat.normal.cdf(z, 0, 1);
}

/** P(Z > z), the upper tail. */
export function normalSf(z: number): number {
  return jStat.normal.cdf(-z, 0, 1);
}

/** The z with P(Z ≤ z) = p, for 0 < p < 1. */
export function normalQuantile(p: number): number {
  return jStat.normal.inv(p, 0, 1);
}
