import type { Interval } from '@shared/report';
import { normalQuantile } from './normal';
import { wilsonInterval } from './wilson';

/**
 * Wilson's score interval (wilson.ts) for a weighted bad rate: the same formula with the
 * weighted rate and Kish's effective sample size n_eff = (Σw)² / Σw² in place of x / n and n
 * (L. Kish 1965, "Survey Sampling", Wiley, §8.2, the design effect of unequal weights). Without
 * weights (every weight 1) n_eff = n and the interval is wilsonInterval's exactly: that case is
 * delegated to it. Cost: O(1).
 */
export function wilsonIntervalEffective(rate: number, effectiveN: number, confidence: number, unweighted: { x: number; n: number } | null): Interval | null {
  if (unweighted !== null) return wilsonInterval(unweighted.x, unweighted.n, confidence);
  if (!(effectiveN > 0)) return null;
  if (!(rate >= 0 && rate <= 1)) throw new RangeError(`wilson interval requires a rate in [0, 1], got ${rate}`);
  const z = normalQuantile((1 + confidence) / 2);
  const n = effectiveN;
  const z22n = (z * z) / (2 * n);
  const root = z * Math.sqrt((rate * (1 - rate)) / n + z22n / (2 * n));
  const denominator = 1 + 2 * z22n;
  const lower = rate === 0 ? 0 : Math.max(0, (rate + z22n - root) / denominator);
  const upper = rate === 1 ? 1 : Math.min(1, (rate + z22n + root) / denominator);
  return [lower, upper];
}
