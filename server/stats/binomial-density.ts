import { stirlingError } from './log-gamma';

/**
 * The binomial density Γ(n + 1) / (Γ(x + 1) Γ(n − x + 1)) · p^x · q^(n−x) for real 0 ≤ x ≤ n
 * (q = 1 − p passed separately so that it keeps its precision when p is near 1), in the saddle
 * point form of C. Loader (2000), "Fast and accurate computation of binomial probabilities"
 * (the algorithm of R's dbinom_raw):
 *   exp(stirlerr(n) − stirlerr(x) − stirlerr(n − x) − bd0(x, np) − bd0(n − x, nq)) · √(n / (2π x (n − x)))
 * where bd0(x, m) = x ln(x / m) + m − x is summed as a series when x is near m. It keeps full
 * relative precision at counts in the hundreds of thousands, where exp of differences of ln Γ
 * would lose half the digits. Used as the prefactor of the incomplete beta function.
 * Cost: O(1) (the bd0 series converges in a few terms).
 */

function bd0(x: number, np: number): number {
  if (Math.abs(x - np) < 0.1 * (x + np)) {
    let v = (x - np) / (x + np);
    let s = (x - np) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const next = s + ej / (2 * j + 1);
      if (next === s) return next;
      s = next;
    }
  }
  return x * Math.log(x / np) + np - x;
}

const LN_2PI = 1.8378770664093456;

export function binomialDensity(x: number, n: number, p: number, q: number): number {
  if (!(p >= 0 && p <= 1 && q >= 0 && q <= 1)) throw new RangeError(`binomialDensity requires 0 ≤ p, q ≤ 1, got ${p}, ${q}`);
  if (!(x >= 0 && x <= n)) return 0;
  if (p === 0) return x === 0 ? 1 : 0;
  if (q === 0) return x === n ? 1 : 0;
  if (x === 0) {
    if (n === 0) return 1;
    return Math.exp(p < 0.1 ? -bd0(n, n * q) - n * p : n * Math.log(q));
  }
  if (x === n) return Math.exp(q < 0.1 ? -bd0(n, n * p) - n * q : n * Math.log(p));
  const lc = stirlingError(n) - stirlingError(x) - stirlingError(n - x) - bd0(x, n * p) - bd0(n - x, n * q);
  const lf = LN_2PI + Math.log(x) + Math.log1p(-x / n);
  return Math.exp(lc - 0.5 * lf);
}
