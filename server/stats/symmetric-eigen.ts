/**
 * Eigenvalues and eigenvectors of a small real symmetric matrix by the cyclic Jacobi method
 * (Golub & Van Loan, Matrix Computations, 4th ed., 2013, §8.5; rotations as in Numerical Recipes,
 * Press et al., 3rd ed., 2007, §11.1): plane rotations zero the off-diagonal entries one at a
 * time until they are negligible. Accurate to a few ulps of the largest eigenvalue, and simple;
 * used for the at most 5 × 5 contrast covariance of the joint DeLong test.
 * Cost: O(m³) per sweep, a handful of sweeps.
 */
export interface SymmetricEigen {
  values: number[];
  /** vectors[k] is the unit eigenvector of values[k]. */
  vectors: number[][];
}

const MAX_SWEEPS = 100;

export function symmetricEigen(matrix: readonly (readonly number[])[]): SymmetricEigen {
  const m = matrix.length;
  const a = matrix.map((row, i) => {
    if (row.length !== m) throw new RangeError('symmetricEigen: the matrix must be square');
    return row.map((value, j) => {
      if (!Number.isFinite(value)) throw new RangeError('symmetricEigen: the matrix must be finite');
      if (Math.abs(value - matrix[j][i]) > 1e-12 * (Math.abs(value) + Math.abs(matrix[j][i]))) {
        throw new RangeError('symmetricEigen: the matrix must be symmetric');
      }
      return value;
    });
  });
  const v: number[][] = Array.from({ length: m }, (_, i) => Array.from({ length: m }, (_, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let off = 0;
    let scale = 0;
    for (let i = 0; i < m; i++) {
      scale += a[i][i] * a[i][i];
      for (let j = i + 1; j < m; j++) off += a[i][j] * a[i][j];
    }
    if (off === 0 || off <= Number.EPSILON * Number.EPSILON * scale) break;
    for (let p = 0; p < m; p++) {
      for (let q = p + 1; q < m; q++) {
        if (a[p][q] === 0) continue;
        const theta = (a[q][q] - a[p][p]) / (2 * a[p][q]);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < m; k++) {
          const akp = a[k][p];
          const akq = a[k][q];
          a[k][p] = c * akp - s * akq;
          a[k][q] = s * akp + c * akq;
        }
        for (let k = 0; k < m; k++) {
          const apk = a[p][k];
          const aqk = a[q][k];
          a[p][k] = c * apk - s * aqk;
          a[q][k] = s * apk + c * aqk;
        }
        for (let k = 0; k < m; k++) {
          const vkp = v[k][p];
          const vkq = v[k][q];
          v[k][p] = c * vkp - s * vkq;
          v[k][q] = s * vkp + c * vkq;
        }
      }
    }
  }
  return {
    values: a.map((row, i) => row[i]),
    vectors: Array.from({ length: m }, (_, k) => v.map((row) => row[k])),
  };
}
