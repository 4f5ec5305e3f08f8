import { chiSquareSf } from './chi-square';
import { symmetricEigen } from './symmetric-eigen';

/**
 * The joint test that every challenger's AUC equals the champion's (DeLong, DeLong &
 * Clarke-Pearson 1988, Biometrics 44:837–845, §3: a contrast matrix L on the vector of AUCs θ with
 * covariance S): L has one row per challenger, challenger − champion, and under the null
 *   χ² = (Lθ)ᵀ (L S Lᵀ)⁻ (Lθ)
 * is χ²-distributed with df = rank(L S Lᵀ) degrees of freedom. (L S Lᵀ)⁻ is the Moore–Penrose
 * inverse, from the eigen-decomposition with eigenvalues at or below √ε times the largest
 * treated as zero (the tolerance of R's MASS::ginv): when two challengers rank every account
 * alike the contrast covariance is singular and the test has one degree of freedom fewer, as in
 * the committed R check (tests/reference/challengers/joint.R).
 *
 * Null when the contrast covariance is zero (every challenger identical to the champion): there
 * is nothing to test. Cost: O(K³), K ≤ 5.
 */
export interface JointTest {
  chi2: number;
  df: number;
  p: number;
}

export function jointDelongTest(auc: readonly number[], covariance: readonly (readonly number[])[]): JointTest | null {
  const k = auc.length - 1;
  if (k < 1) throw new RangeError('the joint test needs a champion and at least one challenger');
  // L S Lᵀ without forming L: entry (i, j) = S[i][j] − S[i][0] − S[0][j] + S[0][0] (models 1…K).
  const contrast = Array.from({ length: k }, (_, i) => auc[i + 1] - auc[0]);
  const v = Array.from({ length: k }, (_, i) =>
    Array.from({ length: k }, (_, j) => covariance[i + 1][j + 1] - covariance[i + 1][0] - covariance[0][j + 1] + covariance[0][0]),
  );
  // Symmetrise the rounding of the two off-diagonal sums.
  for (let i = 0; i < k; i++) for (let j = i + 1; j < k; j++) v[i][j] = v[j][i] = (v[i][j] + v[j][i]) / 2;
  const { values, vectors } = symmetricEigen(v);
  const largest = Math.max(...values.map(Math.abs));
  if (!(largest > 0)) return null;
  const tolerance = Math.sqrt(Number.EPSILON) * largest;
  let chi2 = 0;
  let df = 0;
  values.forEach((value, index) => {
    if (value <= tolerance) return;
    df += 1;
    const projection = vectors[index].reduce((sum, component, i) => sum + component * contrast[i], 0);
    chi2 += (projection * projection) / value;
  });
  return { chi2, df, p: chiSquareSf(chi2, df) };
}
