import { type BootstrapPlan, MAX_CELL, planBootstrapReference, shared } from './bootstrap-kernel';
import type { ScoreBlocks } from './order';

/**
 * The bootstrap's cells (see bootstrap-kernel.ts: accounts grouped by champion score, challenger
 * score and outcome, a combination of more than MAX_CELL accounts split into adjacent cells), the
 * same plan as planBootstrapReference, array for array, built with fewer passes over the rows
 * (issue 20: at ten million rows the plan is a single-threaded stage before the replicates).
 *
 * The reference sorts the rows by (champion block, challenger block, outcome), ties in row order,
 * with two stable counting sorts whose keys are looked up row by row. Here the first sort is not
 * needed: in the challenger's order (blocks ascending, ties in row order) a stable split of each
 * block into its goods then its bads is the order by (challenger block, outcome), read from the
 * blocks' sorted outcomes without a lookup. The second, by champion block, carries that key with
 * each row, and the champion block of each sorted position is known from the champion's blocks
 * (block a covers the same positions in both sorts: its size), so cutting the cells reads only
 * sequential arrays. With sampling weights (the weight is a fourth key) or further challengers
 * the reference builds the plan.
 *
 * Cost: O(n + blocks) time, one random read of the champion block and one random write per row;
 * memory 12 bytes per row besides the plan.
 */
export function planBootstrap(
  champion: ScoreBlocks,
  challenger: ScoreBlocks,
  bad: Uint8Array,
  weight: Float64Array | null = null,
  /** Further challengers (several challengers): the reference builds their plan. */
  moreModels: readonly ScoreBlocks[] = [],
): BootstrapPlan {
  if (weight !== null || moreModels.length > 0) return planBootstrapReference(champion, challenger, bad, weight, moreModels);
  const n = bad.length;
  // Champion block of every row.
  const rankA = new Uint32Array(n);
  for (let a = 0; a < champion.count; a++) {
    const end = champion.start[a + 1];
    for (let at = champion.start[a]; at < end; at++) rankA[champion.order[at]] = a;
  }
  // Rows by (challenger block, outcome), each with its key 2·block + outcome; and how many rows
  // of each champion block (the counting sort's buckets).
  const byB = new Uint32Array(n);
  const keyB = new Uint32Array(n);
  const next = new Uint32Array(champion.count + 1);
  for (let a = 0; a < champion.count; a++) next[a] = champion.start[a];
  const { order, sortedBad, start } = challenger;
  for (let k = 0; k < challenger.count; k++) {
    const from = start[k];
    const to = start[k + 1];
    let good = from;
    let badAt = from + challenger.goods[k];
    for (let at = from; at < to; at++) {
      if (sortedBad[at]) {
        byB[badAt] = order[at];
        keyB[badAt++] = 2 * k + 1;
      } else {
        byB[good] = order[at];
        keyB[good++] = 2 * k;
      }
    }
  }
  // Stable counting sort by champion block, the key carried along.
  const rows = new Uint32Array(n);
  const rowKey = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const row = byB[i];
    const at = next[rankA[row]]++;
    rows[at] = row;
    rowKey[at] = keyB[i];
  }

  // Cells: a new one where the champion block or the key changes, or where the current one is full.
  let cells = 0;
  for (let a = 0; a < champion.count; a++) {
    const end = champion.start[a + 1];
    let run = 0;
    for (let at = champion.start[a]; at < end; at++) {
      if (at === champion.start[a] || run === MAX_CELL || rowKey[at] !== rowKey[at - 1]) {
        cells++;
        run = 0;
      }
      run++;
    }
  }
  const size = shared(Uint8Array, cells);
  const flagsChampion = shared(Uint8Array, cells);
  const cellRankB = new Uint32Array(cells);
  const goodCells = shared(Uint32Array, champion.nGood);
  const badCells = shared(Uint32Array, champion.nBad);
  let c = -1;
  let goodAt = 0;
  let badAt = 0;
  for (let a = 0; a < champion.count; a++) {
    const from = champion.start[a];
    const end = champion.start[a + 1];
    let run = 0;
    for (let at = from; at < end; at++) {
      const key = rowKey[at];
      if (at === from || run === MAX_CELL || key !== rowKey[at - 1]) {
        c++;
        run = 0;
        cellRankB[c] = key >>> 1;
        flagsChampion[c] = key & 1;
      }
      run++;
      size[c]++;
      if (key & 1) badCells[badAt++] = c;
      else goodCells[goodAt++] = c;
    }
    if (end > from) flagsChampion[c] |= 2;
  }

  // Challenger order of the cells: a stable counting sort by challenger block.
  const firstOf = new Uint32Array(challenger.count + 1);
  for (let cell = 0; cell < cells; cell++) firstOf[cellRankB[cell] + 1]++;
  for (let k = 1; k <= challenger.count; k++) firstOf[k] += firstOf[k - 1];
  const byChallenger = new Uint32Array(cells);
  for (let cell = 0; cell < cells; cell++) byChallenger[firstOf[cellRankB[cell]]++] = cell;
  const positionChallenger = shared(Uint32Array, cells);
  const flagsChallenger = shared(Uint8Array, cells);
  for (let j = 0; j < cells; j++) {
    const cell = byChallenger[j];
    positionChallenger[cell] = j;
    flagsChallenger[j] = (flagsChampion[cell] & 1) | (j === cells - 1 || cellRankB[byChallenger[j + 1]] !== cellRankB[cell] ? 2 : 0);
  }
  return {
    cells,
    nGood: champion.nGood,
    nBad: champion.nBad,
    size,
    flagsChampion,
    positionChallenger,
    flagsChallenger,
    goodCells,
    badCells,
    weightChampion: null,
    weightChallenger: null,
    more: [],
  };
}
