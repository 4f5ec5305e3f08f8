import type { Interval } from '@shared/report';
import { normalQuantile } from './normal';

/**
 * Wilson score interval for a binomial proportion x / n at a two-sided confidence level.
 * Source: E. B. Wilson (1927), "Probable inference, the law of succession, and statistical
 * inference", Journal of the American Statistical Association 22:209–212. Written as R's
 * `prop.test(x, n, correct = FALSE)` computes it, including its ends: the lower bound is exactly 0
 * when x = 0 and the upper bound exactly 1 when x = n.
 * Cost: O(1).
 *
 * Returns null when n = 0 (no accounts: the rate is undefined).
 */
export function wilsonInterval(x: number, n: number, confidence: number): Interval | null {
  if (!(confidence > 0 && confidence < 1)) throw new Error(`wilson interval requires 0 < confidence < 1, got ${confidence}`);
  if (!Number.isInteger(x) || !Number.isInteger(n) || x < 0 || n < 0 || x > n) {
    throw new Error(`wilson interval requires integers 0 ≤ x ≤ n, got x = ${x}, n = ${n}`);
  }
  if (n === 0) return null;
  const z = normalQuantile((1 + confidence) / 2);
  const p = x / n;
  const z22n = (z * z) / (2 * n);
  const root = z * Math.sqrt((p * (1 - p)) / n + z22n / (2 * n));
  const denominator = 1 + 2 * z22n;
  const lower = x === 0 ? 0 : Math.max(0, (p + z22n - root) / denominator);
  const upper = x === n ? 1 : Math.min(1, (p + z22n + root) / denominator);
  return [lower, upper];
}
