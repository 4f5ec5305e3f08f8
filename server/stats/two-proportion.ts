import { normalSf } from './normal';

/**
 * Pooled two-proportion z test of x1 / n1 against x2 / n2, two-sided:
 * z = (p1 − p2) / sqrt(p̂(1 − p̂)(1/n1 + 1/n2)) with p̂ = (x1 + x2) / (n1 + n2); p = 2·P(Z > |z|).
 * Common practice, no source (the textbook large-sample test; R's
 * `prop.test(c(x1, x2), c(n1, n2), correct = FALSE)` reports z² as its statistic).
 * Cost: O(1).
 *
 * When the pooled rate is 0 or 1 both proportions are equal and the variance is 0: z = 0, p = 1.
 */
export function twoProportionZ(x1: number, n1: number, x2: number, n2: number): { z: number; p: number } {
  for (const [x, n] of [
    [x1, n1],
    [x2, n2],
  ]) {
    if (!Number.isInteger(x) || !Number.isInteger(n) || x < 0 || x > n || n < 1) {
      throw new Error(`two-proportion test requires integers 0 ≤ x ≤ n and n ≥ 1, got x = ${x}, n = ${n}`);
    }
  }
  const pooled = (x1 + x2) / (n1 + n2);
  const variance = pooled * (1 - pooled) * (1 / n1 + 1 / n2);
  if (!(variance > 0)) return { z: 0, p: 1 };
  const z = (x1 / n1 - x2 / n2) / Math.sqrt(variance);
  return { z, p: Math.min(1, 2 * normalSf(Math.abs(z))) };
}
