import { type BootstrapPlan, MAX_CELL, planBootstrapReference, shared } from './bootstrap-kernel';
import type { ScoreBlocks } from './order';

/**
 * The bootstrap's cells (see bootstrap-kernel.ts: accounts grouped by champion score, challenger
 * score, outcome and, with sampling weights, weight; a combination of more than MAX_CELL accounts
 * split into adjacent cells), the same plan as planBootstrapReference, array for array, built with
 * fewer passes over the rows (issue 20: at ten million rows the plan is a single-threaded stage
 * before the replicates; issue 12: with weights the reference cost more than the replicates).
 *
 * The reference sorts the rows by (champion block, challenger block, outcome, weight code), ties
 * in the challenger's order, with stable counting sorts whose keys are looked up row by row (the
 * weight code of a row: its weight's rank in order of first appearance). Here the sorts below the
 * champion block are not needed as such: the challenger's order is already by block, so a stable
 * split of each block into its (outcome, weight code) buckets (goods then bads without weights,
 * read from the blocks' sorted outcomes) is the order by (challenger block, outcome, weight code).
 * The sort by champion block carries that key with each row, and the champion block of each
 * sorted position is known from the champion's blocks (block a covers the same positions in both
 * sorts: its size), so cutting the cells reads only sequential arrays.
 *
 * The reference builds the plan with further challengers, and with weights when there are so many
 * distinct weights that the buckets of every challenger block would outnumber the rows several
 * times (e.g. a fractional weight per row on continuous scores).
 *
 * Cost: O(n + blocks · distinct weights) time; per row one random read of the champion block, one
 * random write, and with weights one random read of the weight code; memory five 4-byte arrays
 * per row besides the plan (seven with weights).
 */
export function planBootstrap(
  champion: ScoreBlocks,
  challenger: ScoreBlocks,
  bad: Uint8Array,
  weight: Float64Array | null = null,
  /** Further challengers (several challengers): the reference builds their plan. */
  moreModels: readonly ScoreBlocks[] = [],
): BootstrapPlan {
  if (moreModels.length > 0) return planBootstrapReference(champion, challenger, bad, weight, moreModels);
  if (weight === null) return cutCells(champion, challenger.count, unweightedKeys(challenger), 1, null);
  const codes = weightCodes(weight, weightCodeLimit(challenger, bad.length));
  if (codes === null) return planBootstrapReference(champion, challenger, bad, weight, moreModels);
  return cutCells(champion, challenger.count, weightedKeys(challenger, codes.code, codes.count), codes.count, weight);
}

/** Rows in (challenger block, outcome, weight code) order, and each row's key (see cutCells). */
interface KeyedRows {
  rows: Uint32Array;
  key: Uint32Array;
}

/** Without weights: each challenger block's goods, then its bads (stable). */
function unweightedKeys(challenger: ScoreBlocks): KeyedRows {
  const n = challenger.order.length;
  const rows = new Uint32Array(n);
  const key = new Uint32Array(n);
  const { order, sortedBad, start } = challenger;
  for (let k = 0; k < challenger.count; k++) {
    const from = start[k];
    const to = start[k + 1];
    let good = from;
    let badAt = from + challenger.goods[k];
    for (let at = from; at < to; at++) {
      if (sortedBad[at]) {
        rows[badAt] = order[at];
        key[badAt++] = 2 * k + 1;
      } else {
        rows[good] = order[at];
        key[good++] = 2 * k;
      }
    }
  }
  return { rows, key };
}

/**
 * The most distinct weights the fast plan takes: every challenger block of more than one row is
 * split into 2·codes buckets, at most 8n + 1024 of them in all, and a key (2·block + outcome)·codes
 * + code must fit in 32 bits.
 */
function weightCodeLimit(challenger: ScoreBlocks, n: number): number {
  let tied = 0;
  for (let k = 0; k < challenger.count; k++) if (challenger.start[k + 1] - challenger.start[k] > 1) tied++;
  return Math.max(1, Math.min(Math.floor((8 * n + 1024) / (2 * Math.max(1, tied))), Math.floor(0xffffffff / (2 * Math.max(1, challenger.count)))));
}

/**
 * The reference's weight codes: distinct weights numbered 0, 1, … in order of first appearance
 * (equal as a Map's keys are). Null when there are more than `limit`.
 */
function weightCodes(weight: Float64Array, limit: number): { code: Uint32Array; count: number } | null {
  const n = weight.length;
  const code = new Uint32Array(n);
  const codes = new Map<number, number>();
  // Runs of equal weights skip the lookup (the last weight seen is remembered).
  let last = NaN;
  let lastCode = 0;
  for (let i = 0; i < n; i++) {
    const w = weight[i];
    if (w !== last) {
      let found = codes.get(w);
      if (found === undefined) {
        if (codes.size === limit) return null;
        found = codes.size;
        codes.set(w, found);
      }
      last = w;
      lastCode = found;
    }
    code[i] = lastCode;
  }
  return { code, count: codes.size };
}

/**
 * With weights: each challenger block's rows split stably into 2·codes buckets, (outcome, weight
 * code) ascending; a row's key is (2·block + outcome)·codes + weight code. Each row's weight code
 * is read once (a random read), its bucket kept for the placing pass. A block of one row needs no
 * split.
 */
function weightedKeys(challenger: ScoreBlocks, code: Uint32Array, codes: number): KeyedRows {
  const n = challenger.order.length;
  const rows = new Uint32Array(n);
  const key = new Uint32Array(n);
  const local = new Uint32Array(n);
  const { order, sortedBad, start } = challenger;
  const bucket = new Uint32Array(2 * codes + 1);
  for (let k = 0; k < challenger.count; k++) {
    const from = start[k];
    const to = start[k + 1];
    const base = 2 * k * codes;
    if (to - from === 1) {
      const row = order[from];
      rows[from] = row;
      key[from] = base + sortedBad[from] * codes + code[row];
      continue;
    }
    bucket.fill(0);
    for (let at = from; at < to; at++) {
      const which = sortedBad[at] * codes + code[order[at]];
      local[at] = which;
      bucket[which + 1]++;
    }
    for (let b = 1; b <= 2 * codes; b++) bucket[b] += bucket[b - 1];
    for (let at = from; at < to; at++) {
      const which = local[at];
      const place = from + bucket[which]++;
      rows[place] = order[at];
      key[place] = base + which;
    }
  }
  return { rows, key };
}

/**
 * The plan from the rows in (challenger block, outcome, weight code) order with their keys
 * ((2·block + outcome)·codes + weight code; codes = 1 without weights): a stable counting sort by
 * champion block carrying the key, cells cut where the champion block or the key changes or the
 * cell is full, then the cells' challenger order.
 */
function cutCells(champion: ScoreBlocks, blocksB: number, byB: KeyedRows, codes: number, weight: Float64Array | null): BootstrapPlan {
  const n = byB.rows.length;
  // Champion block of every row.
  const rankA = new Uint32Array(n);
  for (let a = 0; a < champion.count; a++) {
    const end = champion.start[a + 1];
    for (let at = champion.start[a]; at < end; at++) rankA[champion.order[at]] = a;
  }
  // Stable counting sort by champion block (its buckets are the champion's blocks), the key carried along.
  const next = new Uint32Array(champion.count + 1);
  for (let a = 0; a < champion.count; a++) next[a] = champion.start[a];
  const rows = new Uint32Array(n);
  const rowKey = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const row = byB.rows[i];
    const at = next[rankA[row]]++;
    rows[at] = row;
    rowKey[at] = byB.key[i];
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
  const weightChampion = weight === null ? null : shared(Float64Array, cells);
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
      const outcome = Math.floor(key / codes) & 1;
      if (at === from || run === MAX_CELL || key !== rowKey[at - 1]) {
        c++;
        run = 0;
        cellRankB[c] = Math.floor(key / (2 * codes));
        flagsChampion[c] = outcome;
        // The weight of the cell's first row, as the reference takes it.
        if (weightChampion !== null) weightChampion[c] = weight![rows[at]];
      }
      run++;
      size[c]++;
      if (outcome) badCells[badAt++] = c;
      else goodCells[goodAt++] = c;
    }
    if (end > from) flagsChampion[c] |= 2;
  }

  // Challenger order of the cells: a stable counting sort by challenger block.
  const firstOf = new Uint32Array(blocksB + 1);
  for (let cell = 0; cell < cells; cell++) firstOf[cellRankB[cell] + 1]++;
  for (let k = 1; k <= blocksB; k++) firstOf[k] += firstOf[k - 1];
  const byChallenger = new Uint32Array(cells);
  for (let cell = 0; cell < cells; cell++) byChallenger[firstOf[cellRankB[cell]]++] = cell;
  const positionChallenger = shared(Uint32Array, cells);
  const flagsChallenger = shared(Uint8Array, cells);
  const weightChallenger = weightChampion === null ? null : shared(Float64Array, cells);
  for (let j = 0; j < cells; j++) {
    const cell = byChallenger[j];
    positionChallenger[cell] = j;
    if (weightChallenger !== null) weightChallenger[j] = weightChampion![cell];
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
    weightChampion,
    weightChallenger,
    more: [],
  };
}
