import type { BootstrapPlan } from './bootstrap-kernel';

/**
 * The bootstrap's counts in challenger order, written without a random write per cell
 * (issue 20: at ten million cells the scattered writes of bootstrap-kernel.ts miss every cache and
 * cost two to three times the draws themselves).
 *
 * Each replicate draws its counts in champion order and needs them also in challenger order:
 * count c goes to position positionChallenger[c], a random place in an array of 2 bytes per
 * cell. Staged instead, in two passes (a radix partition): the challenger positions are cut into
 * windows of WINDOW positions; the draw writes count c to slot[c], the next free entry of its
 * window's stretch of a staging array (one sequential stream per window: a few hundred streams,
 * each one cache line at a time), then spreadStaged copies each stretch to its window of the
 * counts (writes that stay within 64 KB, in cache). slot and position are computed once per plan.
 *
 * Same counts, so the same replicates to the bit; the tests compare both ways on the same plan.
 * Cost per replicate: two more sequential passes over 6 bytes per cell instead of one random write
 * per cell; it pays when the counts no longer fit in the caches, hence only from SCATTER_CELLS.
 * Measured on the development machine (2 cores, loaded): a replicate's CPU time the same either
 * way at a million cells (continuous scores), 1.5 times less staged at ten million (PD scores
 * with six decimals: 229 against 350 ms). Memory: 8 bytes per cell in the plan and 2 per cell per
 * thread.
 */

/** Cells from which the bootstrap stages its challenger-order writes (bootstrap.ts). */
export const SCATTER_CELLS = 4_000_000;
/** Challenger positions per window: 64 KB of 2-byte counts. */
export const WINDOW = 1 << 15;

export interface StagedScatter {
  /** For each cell (champion order), its entry in the staging array. */
  slot: Uint32Array;
  /** For each entry of the staging array, the cell's position in challenger order. */
  position: Uint32Array;
}

function sharedUint32(length: number): Uint32Array {
  return new Uint32Array(new SharedArrayBuffer(Math.max(1, length) * 4));
}

/** The plan with its challenger-order writes staged through windows of `window` positions (a power of two). */
export function stageScatter(plan: BootstrapPlan, window = WINDOW): BootstrapPlan {
  if (!(window > 0 && (window & (window - 1)) === 0)) throw new RangeError('stageScatter: the window must be a power of two');
  const { cells, positionChallenger } = plan;
  const shift = Math.log2(window);
  const buckets = Math.ceil(cells / window);
  const next = new Uint32Array(buckets + 1);
  for (let c = 0; c < cells; c++) next[(positionChallenger[c] >>> shift) + 1]++;
  for (let b = 1; b <= buckets; b++) next[b] += next[b - 1];
  const slot = sharedUint32(cells);
  const position = sharedUint32(cells);
  for (let c = 0; c < cells; c++) {
    const at = positionChallenger[c];
    const entry = next[at >>> shift]++;
    slot[c] = entry;
    position[entry] = at;
  }
  return { ...plan, scatter: { slot, position } };
}

/** Second pass: each staged count to its place in challenger order. */
export function spreadStaged(position: Uint32Array, staged: Uint16Array, countsChallenger: Uint16Array, cells: number): void {
  for (let e = 0; e < cells; e++) countsChallenger[position[e]] = staged[e];
}
