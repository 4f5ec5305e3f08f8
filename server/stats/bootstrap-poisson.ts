/**
 * The bootstrap's per-replicate draw (bootstrap-kernel.ts has the method): an independent
 * Poisson(m_c) count for every cell, m_c its number of accounts, in champion order and, in the
 * same pass, in challenger order (drawPoissonCounts). The WebAssembly lanes (bootstrap-lanes.ts)
 * draw the same counts from the same tables and thresholds.
 *
 * Poisson(m) for m ≤ 64 is drawn by inversion of a tabulated cdf (with a 32-entry guide table;
 * probabilities resolved to 2^-32, tails beyond 1e-17 cut); larger m as a sum of Poisson(64) and a
 * remainder.
 */

export const POISSON_TABLE_MAX = 64;
export const GUIDE = 32;
export const TWO_POW_32 = 4294967296;
export const INV_TWO_POW_32 = 1 / TWO_POW_32;

/** Inversion tables for Poisson(λ), λ = 1 … POISSON_TABLE_MAX: cdf values and guide entries. */
export interface PoissonTables {
  cdf: Float64Array;
  offset: Uint32Array;
  guide: Uint32Array;
}

let tables: PoissonTables | null = null;

export function poissonTables(): PoissonTables {
  if (tables !== null) return tables;
  const lists: number[][] = [];
  for (let lambda = 1; lambda <= POISSON_TABLE_MAX; lambda++) {
    // p_k by the recurrence p_k = p_{k−1}·λ/k; stop when the upper tail is below 1e-17.
    const cdf: number[] = [];
    let p = Math.exp(-lambda);
    let sum = 0;
    for (let k = 0; ; k++) {
      if (k > 0) p = (p * lambda) / k;
      sum += p;
      cdf.push(sum);
      if (k > lambda && 1 - sum < 1e-17) break;
      if (k > lambda && p < 1e-300) break;
    }
    cdf[cdf.length - 1] = 1;
    lists.push(cdf);
  }
  const total = lists.reduce((sum, list) => sum + list.length, 0);
  const cdf = new Float64Array(total);
  const offset = new Uint32Array(POISSON_TABLE_MAX + 2);
  const guide = new Uint32Array((POISSON_TABLE_MAX + 1) * GUIDE);
  let at = 0;
  for (let lambda = 1; lambda <= POISSON_TABLE_MAX; lambda++) {
    const list = lists[lambda - 1];
    offset[lambda] = at;
    cdf.set(list, at);
    // guide[j]: the smallest k with cdf[k] > j / GUIDE, where the search for u ∈ [j/G, (j+1)/G) starts.
    let k = 0;
    for (let j = 0; j < GUIDE; j++) {
      while (list[k] <= j / GUIDE) k++;
      guide[lambda * GUIDE + j] = k;
    }
    at += list.length;
  }
  offset[POISSON_TABLE_MAX + 1] = at;
  tables = { cdf, offset, guide };
  return tables;
}

/** ⌈p·2^32⌉ with its top bit flipped, as a signed 32-bit integer (see drawPoissonCounts). */
export function poissonOneThreshold(p: number): number {
  return (Math.ceil(p * TWO_POW_32) ^ 0x80000000) | 0;
}

/**
 * Independent Poisson(size) counts for every cell, written in champion order and, through
 * positionChallenger, in challenger order (or, given a staged scatter's slots and staging array,
 * into those). xoshiro128** is inlined on local variables (the generator's state is read from and
 * written back to `state`). totals = [all draws, bad draws, max count / size].
 */
export function drawPoissonCounts(
  cells: number,
  size: Uint8Array,
  flags: Uint8Array,
  positionChallenger: Uint32Array,
  counts: Uint16Array,
  countsChallenger: Uint16Array,
  state: Int32Array,
  tables: PoissonTables,
  totals: Float64Array,
): void {
  const { cdf, offset: tableAt, guide } = tables;
  const L = POISSON_TABLE_MAX;
  const tableL = tableAt[L];
  const guideL = L * GUIDE;
  // Poisson(1), the usual cell size with continuous scores, compares the generator's 32-bit
  // output x with integer thresholds: u = x·2^-32 ≥ p exactly when x ≥ ⌈p·2^32⌉ (p·2^32 is exact),
  // so the counts are those of the floating-point comparisons, bit for bit. Compared as signed
  // integers after flipping the top bit (JavaScript's fast integers are signed 32-bit).
  const t0 = poissonOneThreshold(cdf[0]);
  const t1 = poissonOneThreshold(cdf[1]);
  const t2 = poissonOneThreshold(cdf[2]);
  const t3 = poissonOneThreshold(cdf[3]);
  const t4 = poissonOneThreshold(cdf[4]);
  const t5 = poissonOneThreshold(cdf[5]);
  let s0 = state[0];
  let s1 = state[1];
  let s2 = state[2];
  let s3 = state[3];
  let total = 0;
  let totalBad = 0;
  let ratioMax = 0;
  for (let c = 0; c < cells; c++) {
    const cellSize = size[c];
    let k = 0;
    if (cellSize === 1) {
      const x = Math.imul(s1, 5);
      const r = Math.imul((x << 7) | (x >>> 25), 9);
      const t = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = (s3 << 11) | (s3 >>> 21);
      const v = (r ^ 0x80000000) | 0;
      k = +(v >= t0) + +(v >= t1) + +(v >= t2) + +(v >= t3) + +(v >= t4) + +(v >= t5);
      if (k === 6) {
        const u = (r >>> 0) * INV_TWO_POW_32;
        while (u >= cdf[k]) k++;
      }
      if (k > ratioMax) ratioMax = k;
    } else {
      let m = cellSize;
      while (m > L) {
        const x = Math.imul(s1, 5);
        const u = (Math.imul((x << 7) | (x >>> 25), 9) >>> 0) * INV_TWO_POW_32;
        const t = s1 << 9;
        s2 ^= s0;
        s3 ^= s1;
        s1 ^= s2;
        s0 ^= s3;
        s2 ^= t;
        s3 = (s3 << 11) | (s3 >>> 21);
        let j = guide[guideL + ((u * GUIDE) | 0)];
        while (u >= cdf[tableL + j]) j++;
        k += j;
        m -= L;
      }
      const x = Math.imul(s1, 5);
      const u = (Math.imul((x << 7) | (x >>> 25), 9) >>> 0) * INV_TWO_POW_32;
      const t = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = (s3 << 11) | (s3 >>> 21);
      let j: number;
      if (m === 1) {
        j = 0;
        while (u >= cdf[j]) j++;
      } else {
        const base = tableAt[m];
        j = guide[m * GUIDE + ((u * GUIDE) | 0)];
        while (u >= cdf[base + j]) j++;
      }
      k += j;
      const ratio = k / cellSize;
      if (ratio > ratioMax) ratioMax = ratio;
    }
    counts[c] = k;
    countsChallenger[positionChallenger[c]] = k;
    total += k;
    totalBad += k * (flags[c] & 1);
  }
  state[0] = s0;
  state[1] = s1;
  state[2] = s2;
  state[3] = s3;
  totals[0] = total;
  totals[1] = totalBad;
  totals[2] = ratioMax;
}
