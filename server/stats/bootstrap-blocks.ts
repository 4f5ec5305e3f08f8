import { blockEnds, type BootstrapPlan, shared } from './bootstrap-kernel';

/**
 * The challenger's side of a bootstrap replicate by block totals instead of cell by cell, on the
 * WebAssembly lanes (issue 20; bootstrap-lanes.ts, wasm/bootstrap-lanes.ts blockTotalsFour).
 *
 * AUC and KS of the challenger depend on a replicate only through the good and bad draws in each
 * of its blocks of equal scores. The cells are (champion score, challenger score, outcome)
 * combinations, so where the challenger's blocks hold many cells — points, or PD scores rounded
 * to six decimals on millions of rows (ten million cells in some 630,000 challenger blocks) — the
 * counts need not be laid out in challenger order: one sequential pass adds each cell's counts to
 * its (challenger block, outcome) totals after the stratum adjustment (a few megabytes at most),
 * and the challenger is scored from the totals. That replaces a scattered write per cell and a
 * scoring pass over every cell in challenger order.
 *
 * The totals are integers and the sums that make AUC and KS from them are exact (see
 * bootstrap-score.ts), so both layouts give the same replicate values to the bit; the tests run
 * both on the same plans, and against the TypeScript kernel, which always goes cell by cell. With continuous scores nearly every cell is its own block, the totals
 * would outweigh the cell counts they replace, and the cell layout stays; with sampling weights
 * the cell layout stays too (the weighted sums depend on the order of their terms).
 */

/** Each cell's (challenger block, outcome) total: index 2·block + bad, in champion order. */
export interface ChallengerBlocks {
  key: Uint32Array;
  blocks: number;
}

/**
 * Whether block totals pay for this plan: no weights, and at most one (block, outcome) total per
 * four cells (a total is 4 bytes where a cell's count in challenger order is 2).
 */
export function blockTotalsPay(plan: BootstrapPlan): boolean {
  if (plan.weightChampion !== null) return false;
  return 2 * blockEnds(plan.flagsChallenger, plan.cells) * 4 <= plan.cells;
}

/** The plan with the challenger's block totals keyed (see above); O(cells) once per bootstrap. */
export function withChallengerBlocks(plan: BootstrapPlan): BootstrapPlan {
  const { cells, positionChallenger, flagsChallenger, flagsChampion } = plan;
  // Block index of every challenger position: block ends counted before it.
  const blockAt = new Uint32Array(cells);
  let block = 0;
  for (let j = 0; j < cells; j++) {
    blockAt[j] = block;
    block += flagsChallenger[j] >> 1;
  }
  const key = shared(Uint32Array, cells);
  for (let c = 0; c < cells; c++) key[c] = 2 * blockAt[positionChallenger[c]] + (flagsChampion[c] & 1);
  return { ...plan, challengerBlocks: { key, blocks: block } };
}

