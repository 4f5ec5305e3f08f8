import seedrandom from 'seedrandom';
import { drawPoissonCounts, INV_TWO_POW_32, poissonTables, TWO_POW_32 } from './bootstrap-poisson';
import { type StagedScatter, spreadStaged } from './bootstrap-scatter';
import type { ChallengerBlocks } from './bootstrap-blocks';
import { scoreCells, scoreCellsWeighted, type ScoreScratch, scoreScratch } from './bootstrap-score';
import type { ScoreBlocks } from './order';

/**
 * The bootstrap's inner loop, shared by the calling thread and the worker threads
 * (bootstrap-worker.ts). See bootstrap.ts for the method; this file holds the data layout and
 * the per-replicate kernel.
 *
 * Cells. AUC and KS of both models depend on a resample only through how many times each
 * (champion score, challenger score, outcome) combination was drawn, so the accounts are
 * grouped into such cells once, and a replicate draws cell counts instead of accounts: a
 * stratified paired bootstrap draws n_good goods and n_bad bads with replacement, i.e. the counts
 * of the good cells are Multinomial(n_good; m_c / n_good) and likewise for the bads, m_c being
 * the cell's size. With continuous scores every cell is one account; with points there are far
 * fewer cells than accounts.
 *
 * Multinomial counts, exactly, in O(cells + n/64 + √n) per replicate: draw independent
 * Poisson(m_c) counts (their conditional law given the stratum total T is Multinomial(T; m_c/N),
 * the Poisson splitting property), then bring T to N: while T > N remove a uniformly chosen draw
 * (propose a cell with probability m_c/N by a uniform account, accept with probability
 * (count_c/m_c)/R, R ≥ max count/m), while T < N add a draw from a uniformly chosen account. A
 * uniformly chosen subset, or added independent draws, of an i.i.d. sample is an i.i.d. sample,
 * so the result is Multinomial(N; m_c/N) whatever T was. Poisson(m) for m ≤ 64 is drawn by
 * inversion of a tabulated cdf (with a 32-entry guide table; probabilities resolved to 2^-32,
 * tails beyond 1e-17 cut); larger m as a sum of Poisson(64) and a remainder (bootstrap-poisson.ts).
 *
 * This kernel runs one replicate at a time and is the plain reference for the WebAssembly one,
 * which runs four at a time where it applies (bootstrap-lanes.ts) and gives the same values.
 *
 * Sampling weights: a row is resampled with its weight (the stratified draws are still n_good goods
 * and n_bad bads, rows chosen uniformly), so rows with different weights never share a cell: the
 * cells are (champion score, challenger score, outcome, weight) combinations, and each replicate's
 * AUC and KS are computed from the cell counts times the cell's weight, over the replicate's own
 * total weights (scoreCellsWeighted in bootstrap-score.ts). Without weights nothing of this runs.
 *
 * Random numbers: xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 47(4), 2021; the reference is from memory), inlined; its state for replicate r is four 32-bit words from seedrandom's ARC4
 * keyed with `${seed}:${r}`. Each replicate has its own stream, so the result does not depend on
 * how replicates are spread over threads.
 */

/** Largest cell; bigger combinations are split (see BootstrapPlan.size). */
export const MAX_CELL = 255;
const TWO_POW_53 = 9007199254740992;

/** Cell data, on SharedArrayBuffers so worker threads read them without copies. */
export interface BootstrapPlan {
  cells: number;
  nGood: number;
  nBad: number;
  /**
   * Cell sizes, in champion order (cells sorted by champion score, challenger score, outcome).
   * A combination with more than MAX_CELL accounts is split into several cells (adjacent, same
   * scores): the multinomial of the parts sums to that of the whole, and small sizes keep the
   * per-replicate data small.
   */
  size: Uint8Array;
  /** Bit 0: bad cell; bit 1: last cell of its champion block. */
  flagsChampion: Uint8Array;
  /** Each cell's position in challenger order, and the flags in that order (bit 0 bad, bit 1 last
   * cell of its challenger block). */
  positionChallenger: Uint32Array;
  flagsChallenger: Uint8Array;
  /** For each good (bad) account, its cell: the urn uniform draws pick from. */
  goodCells: Uint32Array;
  badCells: Uint32Array;
  /** The weight of each cell's rows, in champion order and in challenger order; null without weights. */
  weightChampion: Float64Array | null;
  weightChallenger: Float64Array | null;
  /**
   * Further challengers (several challengers), in order: each cell's position in that model's
   * order, its flags and weights in that order, as for the challenger. Empty for two models. The
   * cells are then (champion, challenger, each further challenger, outcome[, weight])
   * combinations, so every model is scored on the same resampled rows.
   */
  more: ModelLayout[];
  /** Large plans: the challenger-order writes staged through windows (bootstrap-scatter.ts). */
  scatter?: StagedScatter | null;
  /** Plans with many cells per challenger block: the challenger by block totals on the WebAssembly
   * lanes (bootstrap-blocks.ts); this file's kernel lays it out cell by cell whatever this holds. */
  challengerBlocks?: ChallengerBlocks | null;
}

/** One further model's view of the cells. */
export interface ModelLayout {
  position: Uint32Array;
  flags: Uint8Array;
  weight: Float64Array | null;
}

export function shared<T extends Uint8Array | Uint32Array | Float64Array>(Kind: { new (buffer: SharedArrayBuffer): T; BYTES_PER_ELEMENT: number }, length: number): T {
  return new Kind(new SharedArrayBuffer(Math.max(1, length) * Kind.BYTES_PER_ELEMENT));
}

/** Block index of every account, from one model's blocks. */
function ranks(blocks: ScoreBlocks, n: number): Uint32Array {
  const rank = new Uint32Array(n);
  for (let k = 0; k < blocks.count; k++) for (let at = blocks.start[k]; at < blocks.start[k + 1]; at++) rank[blocks.order[at]] = k;
  return rank;
}

/** Stable counting sort of `items` by key[item] in [0, range). */
function sortByKey(items: Uint32Array, key: (item: number) => number, range: number): Uint32Array {
  const count = new Uint32Array(range + 1);
  for (let i = 0; i < items.length; i++) count[key(items[i]) + 1]++;
  for (let b = 1; b <= range; b++) count[b] += count[b - 1];
  const out = new Uint32Array(items.length);
  for (let i = 0; i < items.length; i++) out[count[key(items[i])]++] = items[i];
  return out;
}

/**
 * Groups the accounts into cells. O(n). The plain implementation: the rows sorted by (champion
 * block, challenger block, each further challenger's block, outcome[, weight]) with stable
 * counting sorts, cells cut where the combination changes. bootstrap-plan.ts has the one the
 * bootstrap runs for two models without weights; the tests compare the two.
 */
export function planBootstrapReference(
  champion: ScoreBlocks,
  challenger: ScoreBlocks,
  bad: Uint8Array,
  weight: Float64Array | null = null,
  /** Further challengers (several challengers); none for two models. */
  moreModels: readonly ScoreBlocks[] = [],
): BootstrapPlan {
  const n = bad.length;
  const rankA = ranks(champion, n);
  const rankB = ranks(challenger, n);
  const rankMore = moreModels.map((model) => ranks(model, n));
  // Weighted: each distinct weight's code, so that rows of different weights never share a cell.
  let weightCode: Uint32Array | null = null;
  let base = challenger.order;
  if (weight !== null) {
    weightCode = new Uint32Array(n);
    const codes = new Map<number, number>();
    for (let i = 0; i < n; i++) {
      let code = codes.get(weight[i]);
      if (code === undefined) {
        code = codes.size;
        codes.set(weight[i], code);
      }
      weightCode[i] = code;
    }
    const byWeight = weightCode;
    base = sortByKey(challenger.order, (row) => byWeight[row], codes.size);
  }
  // Rows by (champion block, challenger block, outcome[, weight]): stable counting sorts. With
  // further challengers: (champion, challenger, each further challenger, outcome[, weight]).
  let byB: Uint32Array;
  if (moreModels.length === 0) byB = sortByKey(base, (row) => 2 * rankB[row] + bad[row], 2 * challenger.count);
  else {
    let sorted = sortByKey(base, (row) => bad[row], 2);
    for (let m = moreModels.length - 1; m >= 0; m--) {
      const rank = rankMore[m];
      sorted = sortByKey(sorted, (row) => rank[row], moreModels[m].count);
    }
    byB = sortByKey(sorted, (row) => rankB[row], challenger.count);
  }
  const rows = sortByKey(byB, (row) => rankA[row], champion.count);
  const sameMore = (row: number, previous: number): boolean => {
    for (let m = 0; m < rankMore.length; m++) if (rankMore[m][row] !== rankMore[m][previous]) return false;
    return true;
  };

  // A new cell where the combination changes, or where the current one is full.
  const newCell = (k: number, run: number): boolean => {
    if (k === 0 || run === MAX_CELL) return true;
    const row = rows[k];
    const previous = rows[k - 1];
    return (
      rankA[row] !== rankA[previous] ||
      rankB[row] !== rankB[previous] ||
      bad[row] !== bad[previous] ||
      (rankMore.length > 0 && !sameMore(row, previous)) ||
      (weightCode !== null && weightCode[row] !== weightCode[previous])
    );
  };
  let cells = 0;
  let run = 0;
  for (let k = 0; k < n; k++) {
    if (newCell(k, run)) {
      cells++;
      run = 0;
    }
    run++;
  }
  const size = shared(Uint8Array, cells);
  const flagsChampion = shared(Uint8Array, cells);
  const cellRankA = new Uint32Array(cells);
  const cellRankB = new Uint32Array(cells);
  const cellRankMore = rankMore.map(() => new Uint32Array(cells));
  const goodCells = shared(Uint32Array, champion.nGood);
  const badCells = shared(Uint32Array, champion.nBad);
  const weightChampion = weight === null ? null : shared(Float64Array, cells);
  let c = -1;
  let goodAt = 0;
  let badAt = 0;
  run = 0;
  for (let k = 0; k < n; k++) {
    const row = rows[k];
    if (newCell(k, run)) {
      c++;
      run = 0;
      cellRankA[c] = rankA[row];
      cellRankB[c] = rankB[row];
      for (let m = 0; m < rankMore.length; m++) cellRankMore[m][c] = rankMore[m][row];
      flagsChampion[c] = bad[row];
      if (weightChampion !== null) weightChampion[c] = weight![row];
    }
    run++;
    size[c]++;
    if (bad[row]) badCells[badAt++] = c;
    else goodCells[goodAt++] = c;
  }
  for (let k = 0; k < cells; k++) {
    if (k === cells - 1 || cellRankA[k + 1] !== cellRankA[k]) flagsChampion[k] |= 2;
  }
  const identity = new Uint32Array(cells);
  for (let k = 0; k < cells; k++) identity[k] = k;
  // Each other model's view of the cells: its order (cells sorted by its block, ties in champion
  // order), the flags there (bad; last cell of its block) and the weights in that order.
  const layout = (cellRank: Uint32Array, blocks: number): ModelLayout => {
    const byModel = sortByKey(identity, (cell) => cellRank[cell], blocks);
    const position = shared(Uint32Array, cells);
    const flags = shared(Uint8Array, cells);
    const modelWeight = weightChampion === null ? null : shared(Float64Array, cells);
    for (let j = 0; j < cells; j++) {
      const cell = byModel[j];
      position[cell] = j;
      if (modelWeight !== null) modelWeight[j] = weightChampion![cell];
      flags[j] = (flagsChampion[cell] & 1) | (j === cells - 1 || cellRank[byModel[j + 1]] !== cellRank[cell] ? 2 : 0);
    }
    return { position, flags, weight: modelWeight };
  };
  const { position: positionChallenger, flags: flagsChallenger, weight: weightChallenger } = layout(cellRankB, challenger.count);
  const more = moreModels.map((model, m) => layout(cellRankMore[m], model.count));
  return {
    more,
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
  };
}

/** The four 32-bit state words of replicate r's generator. */
export function replicateState(seed: number, replicate: number): Int32Array {
  const arc4 = seedrandom(`${seed}:${replicate}`);
  const state = new Int32Array(4);
  do {
    for (let i = 0; i < 4; i++) state[i] = arc4.int32();
  } while ((state[0] | state[1] | state[2] | state[3]) === 0);
  return state;
}

/** xoshiro128** on a state array: the next output as an unsigned 32-bit integer. */
export function nextUint32(state: Int32Array): number {
  const s1 = state[1];
  const x = Math.imul(s1, 5);
  const result = Math.imul((x << 7) | (x >>> 25), 9) >>> 0;
  const t = s1 << 9;
  state[2] ^= state[0];
  state[3] ^= s1;
  state[1] ^= state[2];
  state[0] ^= state[3];
  state[2] ^= t;
  state[3] = (state[3] << 11) | (state[3] >>> 21);
  return result;
}

/**
 * A uniform integer in [0, bound), exactly: a 53-bit draw, the last partial range rejected.
 * `limit` = 2^53 − (2^53 mod bound), computed once per stratum.
 */
function uniformIndex(state: Int32Array, bound: number, limit: number): number {
  for (;;) {
    const high = nextUint32(state) >>> 11;
    const value = high * TWO_POW_32 + nextUint32(state);
    if (value < limit) {
      // value mod bound without a floating-point remainder: the quotient can only round up.
      const remainder = value - Math.floor(value / bound) * bound;
      return remainder < 0 ? remainder + bound : remainder;
    }
  }
}

/** Per-replicate results: AUC and KS of both models. */
export interface ReplicateOutput {
  aucChampion: Float64Array;
  aucChallenger: Float64Array;
  ksChampion: Float64Array;
  ksChallenger: Float64Array;
  /** Further challengers' AUC and KS (plan.more's order); absent or empty for two models. */
  aucMore?: Float64Array[];
  ksMore?: Float64Array[];
}

/** Scratch space for runReplicates: each cell's count, in champion and in challenger order, and
 * the scoring passes' block totals for each model. */
export interface ReplicateScratch {
  counts: Uint16Array;
  countsChallenger: Uint16Array;
  scoreChampion: ScoreScratch;
  scoreChallenger: ScoreScratch;
  /** Further challengers: counts in each one's order, and its scoring scratch. */
  countsMore: Uint16Array[];
  scoreMore: ScoreScratch[];
  /** The staging array of a plan with a staged scatter, else null. */
  staged: Uint16Array | null;
}

/** The number of blocks of a model's order: its cells flagged as a block's last (bit 1). */
export function blockEnds(flags: Uint8Array, cells: number): number {
  let blocks = 0;
  for (let c = 0; c < cells; c++) blocks += flags[c] >> 1;
  return blocks;
}

export function replicateScratch(plan: BootstrapPlan): ReplicateScratch {
  return {
    counts: new Uint16Array(plan.cells),
    countsChallenger: new Uint16Array(plan.cells),
    scoreChampion: scoreScratch(blockEnds(plan.flagsChampion, plan.cells)),
    scoreChallenger: scoreScratch(blockEnds(plan.flagsChallenger, plan.cells)),
    countsMore: plan.more.map(() => new Uint16Array(plan.cells)),
    scoreMore: plan.more.map((layout) => scoreScratch(blockEnds(layout.flags, plan.cells))),
    staged: plan.scatter ? new Uint16Array(plan.cells) : null,
  };
}

/**
 * Runs replicates [from, to) and writes their results at [from − offset, to − offset) of `out`.
 * The counts are written in both orders as they are drawn (a scatter, staged for large plans), so
 * both passes read memory in sequence. Each step is its own small function: V8 keeps their loop
 * variables in registers, which it does not manage in one long function.
 */
export function runReplicates(
  plan: BootstrapPlan,
  seed: number,
  from: number,
  to: number,
  out: ReplicateOutput,
  offset: number,
  scratch: ReplicateScratch,
  /** Tests only: sees each replicate's cell counts (champion order) before they are used. */
  inspect?: (replicate: number, counts: Uint16Array) => void,
): void {
  const { cells, nGood, nBad, size, flagsChampion, positionChallenger, flagsChallenger, goodCells, badCells } = plan;
  const { counts, countsChallenger } = scratch;
  const tables = poissonTables();
  const totals = new Float64Array(3);
  const scores = new Float64Array(2);
  for (let r = from; r < to; r++) {
    const state = replicateState(seed, r);
    // 1. Poisson(m_c) counts; totals = [all draws, bad draws, max count / size].
    //    In challenger order directly, or through the staging array of a large plan.
    if (plan.scatter && scratch.staged) {
      drawPoissonCounts(cells, size, flagsChampion, plan.scatter.slot, counts, scratch.staged, state, tables, totals);
      spreadStaged(plan.scatter.position, scratch.staged, countsChallenger, cells);
    } else drawPoissonCounts(cells, size, flagsChampion, positionChallenger, counts, countsChallenger, state, tables, totals);
    // 2. Bring each stratum's total to its size.
    const bound = totals[2] * (1 + 1e-12);
    adjustStratum(goodCells, nGood, totals[0] - totals[1], bound, size, positionChallenger, counts, countsChallenger, state);
    adjustStratum(badCells, nBad, totals[1], bound, size, positionChallenger, counts, countsChallenger, state);
    if (inspect) inspect(r, counts);
    // 3. and 4. Both models, each over the cells in its own order, blocks taken whole.
    if (plan.weightChampion) scoreCellsWeighted(counts, flagsChampion, plan.weightChampion, cells, scores, scratch.scoreChampion);
    else scoreCells(counts, flagsChampion, cells, nGood, nBad, scores, scratch.scoreChampion);
    out.aucChampion[r - offset] = scores[0];
    out.ksChampion[r - offset] = scores[1];
    if (plan.weightChallenger) scoreCellsWeighted(countsChallenger, flagsChallenger, plan.weightChallenger, cells, scores, scratch.scoreChallenger);
    else scoreCells(countsChallenger, flagsChallenger, cells, nGood, nBad, scores, scratch.scoreChallenger);
    out.aucChallenger[r - offset] = scores[0];
    out.ksChallenger[r - offset] = scores[1];
    // Further challengers: the same counts laid out in each one's order, then scored alike.
    for (let m = 0; m < plan.more.length; m++) {
      const layout = plan.more[m];
      const target = scratch.countsMore[m];
      scatter(counts, layout.position, target, cells);
      if (layout.weight) scoreCellsWeighted(target, layout.flags, layout.weight, cells, scores, scratch.scoreMore[m]);
      else scoreCells(target, layout.flags, cells, nGood, nBad, scores, scratch.scoreMore[m]);
      out.aucMore![m][r - offset] = scores[0];
      out.ksMore![m][r - offset] = scores[1];
    }
  }
}

/** counts (champion order) into another model's order. */
function scatter(counts: Uint16Array, position: Uint32Array, target: Uint16Array, cells: number): void {
  for (let c = 0; c < cells; c++) target[position[c]] = counts[c];
}

/**
 * Brings one stratum's total from `total` to `target`: removes uniformly chosen draws (a cell
 * proposed by a uniform account, accepted with probability (count/size)/bound), or adds draws
 * of uniform accounts. `bound` ≥ every count/size. Each change goes to the cell's count and to
 * its count in challenger order (countsChallenger; null where that is laid out afterwards, as on
 * the WebAssembly lanes).
 */
export function adjustStratum(
  urn: Uint32Array,
  target: number,
  total: number,
  bound: number,
  size: Uint8Array,
  positionChallenger: Uint32Array,
  counts: Uint16Array,
  countsChallenger: Uint16Array | null,
  state: Int32Array,
  /** Counts of several replicates side by side (bootstrap-lanes.ts): cell c's at c·stride + lane. */
  stride = 1,
  lane = 0,
): void {
  const limit = TWO_POW_53 - (TWO_POW_53 % target);
  while (total > target) {
    const cell = urn[uniformIndex(state, target, limit)];
    const at = cell * stride + lane;
    if (nextUint32(state) * INV_TWO_POW_32 * bound < counts[at] / size[cell]) {
      counts[at]--;
      if (countsChallenger !== null) countsChallenger[positionChallenger[cell]]--;
      total--;
    }
  }
  while (total < target) {
    const cell = urn[uniformIndex(state, target, limit)];
    const at = cell * stride + lane;
    // Counts are 16-bit: a cell would need over 65,000 of the added draws (far beyond anything
    // with a probability above 1e-300); refuse rather than wrap around.
    if (counts[at] === 0xffff) throw new RangeError('bootstrap: a cell count passed 65535');
    counts[at]++;
    if (countsChallenger !== null) countsChallenger[positionChallenger[cell]]++;
    total++;
  }
}
