import type { Interval } from '@shared/report';
import { normalQuantile } from './normal';

/**
 * Wilson score interval of a weighted bad rate, on the Kish effective sample size.
 * Sources: E. B. Wilson (1927), JASA 22:209–212 (the interval, as in wilson.ts); L. Kish (1965),
 * "Survey Sampling", Wiley, §8.2 (effective size n_eff = (Σw)² / Σw² of the rows behind the rate).
 * p = weighted bads / weighted accounts, n = n_eff; the ends are exactly 0 when p = 0 and exactly 1
 * when p = 1. With every weight 1, n_eff = n and p = x / n in the same arithmetic as wilson.ts, so
 * the interval is the same to the last bit.
 * Cost: O(1).
 *
 * Returns null when there are no accounts (the rate is undefined).
 */
export function wilsonEffective(bads: number, accounts: number, sumSquares: number, confidence: number): Interval | null {
  if (!(confidence > 0 && confidence < 1)) throw new Error(`wilson interval requires 0 < confidence < 1, got ${confidence}`);
  if (!(accounts >= 0) || !(bads >= 0) || !(sumSquares >= 0)) throw new Error('wilson interval requires non-negative weighted counts');
  if (accounts === 0 || sumSquares === 0) return null;
  const n = (accounts * accounts) / sumSquares;
  const z = normalQuantile((1 + confidence) / 2);
  const p = Math.min(1, bads / accounts);
  const z22n = (z * z) / (2 * n);
  const root = z * Math.sqrt((p * (1 - p)) / n + z22n / (2 * n));
  const denominator = 1 + 2 * z22n;
  const lower = p === 0 ? 0 : Math.max(0, (p + z22n - root) / denominator);
  const upper = p === 1 ? 1 : Math.min(1, (p + z22n + root) / denominator);
  return [lower, upper];
}

/** Kish effective size n_eff = (Σw)² / Σw² (0 for no rows). */
export function kishSize(sum: number, sumSquares: number): number {
  return sumSquares > 0 ? (sum * sum) / sumSquares : 0;
}
