import { chiSquareQuantile } from './chi-square';

/**
 * The critical value of the population stability index for B bands, a reference sample of M
 * accounts and a compared sample of N accounts, at significance level α:
 *   PSI_crit = (1/M + 1/N) · χ²_{B−1}(1 − α)
 * Under H0 (both samples from one distribution) PSI = Σ (aᵢ − eᵢ) ln(aᵢ / eᵢ) is, to first
 * order, Σ (aᵢ − eᵢ)² / eᵢ, which for two independent multinomial samples is distributed as
 * (1/M + 1/N) · χ² with B − 1 degrees of freedom. Source: B. Yurdakul & J. Naranjo (2020),
 * "Statistical properties of the population stability index", Journal of Risk Model Validation
 * 14(4). The formula is written here FROM MEMORY of that paper (the paper itself could not be
 * consulted while writing it); the committed script tests/reference/calibration/psi_null.py
 * checks it independently by simulating the PSI of two samples drawn from one distribution and
 * comparing the simulated (1 − α) quantile with this value.
 * Cost: O(χ² quantile).
 */
export function psiCriticalValue(bands: number, referenceSize: number, actualSize: number, alpha: number): number {
  if (!(Number.isInteger(bands) && bands >= 2)) throw new RangeError(`psi critical value requires at least 2 bands, got ${bands}`);
  if (!(referenceSize > 0 && actualSize > 0)) throw new RangeError(`psi critical value requires both sizes > 0, got ${referenceSize} and ${actualSize}`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`psi critical value requires 0 < α < 1, got ${alpha}`);
  return (1 / referenceSize + 1 / actualSize) * chiSquareQuantile(1 - alpha, bands - 1);
}
