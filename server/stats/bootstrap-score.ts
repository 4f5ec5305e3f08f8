/**
 * AUC and KS of one model in one bootstrap replicate, from the replicate's cell counts laid out
 * in that model's order (bootstrap-kernel.ts builds the cells; bit 0 of a cell's flags: bad cell;
 * bit 1: last cell of its block of equal scores). AUC is the Mann–Whitney probability with ties
 * one half (Bamber 1975, J. Math. Psychol. 12:387–415), KS the largest gap between the two
 * cumulative distributions taken at block ends (Kolmogorov 1933; Smirnov 1948); the same
 * formulas as auc.ts and ks.ts, over counts instead of rows.
 *
 * Two implementations, which the tests compare on real plans (tests/unit/stats/bootstrap.test.ts):
 *
 * - scoreCellsReference: the plain one. One pass; at each block end the block's goods are
 *   credited with the bads below plus half the block's bads, and the KS gap is checked.
 *
 * - scoreCells (the one the bootstrap runs): the same sums in two branch-free passes. With
 *   continuous scores most cells end a block, at random, so the plain pass mispredicts the
 *   block-end branch about one time in three. Pass 1 writes the running totals of goods G and bads
 *   B at every cell into slot j and moves j on only at block ends, so slot j ends up holding the
 *   totals at the end of block j. Pass 2 walks the blocks: 2·wins += (G_j − G_{j−1})·(B_{j−1} + B_j)
 *   (that is goods_j · (2·bads below + bads_j)) and the KS gap is max |B_j·n_good − G_j·n_bad|.
 *
 * Exactness: every count, product and sum in both is a float64 integer (or a half-integer) below
 * 2^53 for any holdout under 47 million rows (2·n_good·n_bad < 2^53), so each is computed without
 * rounding and the two implementations return the same bits whatever the order of the additions.
 *
 * Cost: O(cells) per model per replicate; the fast one about a third of the plain one's time on
 * a million continuous scores (bench: bootstrap stage).
 */

/** The plain implementation: scores = [AUC, KS]. */
export function scoreCellsReference(counts: Uint16Array, flags: Uint8Array, cells: number, nGood: number, nBad: number, scores: Float64Array): void {
  let goods = 0;
  let bads = 0;
  let cumGood = 0;
  let cumBad = 0;
  let wins = 0;
  let gap = 0;
  for (let c = 0; c < cells; c++) {
    const w = counts[c];
    const f = flags[c];
    if (f & 1) bads += w;
    else goods += w;
    if (f & 2) {
      wins += goods * (cumBad + bads * 0.5);
      cumBad += bads;
      cumGood += goods;
      const d = cumBad * nGood - cumGood * nBad;
      const absolute = d < 0 ? -d : d;
      if (absolute > gap) gap = absolute;
      goods = 0;
      bads = 0;
    }
  }
  const pairs = nGood * nBad;
  scores[0] = wins / pairs;
  scores[1] = gap / pairs;
}

/** Scratch for scoreCells: running totals at each block end (length ≥ the model's blocks). */
export interface ScoreScratch {
  good: Float64Array;
  bad: Float64Array;
}

export function scoreScratch(blocks: number): ScoreScratch {
  return { good: new Float64Array(blocks + 1), bad: new Float64Array(blocks + 1) };
}

/** The two-pass implementation: scores = [AUC, KS], the same bits as scoreCellsReference. */
export function scoreCells(counts: Uint16Array, flags: Uint8Array, cells: number, nGood: number, nBad: number, scores: Float64Array, scratch: ScoreScratch): void {
  const blocks = blockTotals(counts, flags, cells, scratch.good, scratch.bad);
  blockSums(scratch.good, scratch.bad, blocks, nGood, nBad, scores);
}

/** Pass 1: the running totals at the end of each block; returns the number of blocks. */
function blockTotals(counts: Uint16Array, flags: Uint8Array, cells: number, good: Float64Array, bad: Float64Array): number {
  let totalGood = 0;
  let totalBad = 0;
  let j = 0;
  for (let c = 0; c < cells; c++) {
    const k = counts[c];
    const f = flags[c];
    const kBad = k * (f & 1);
    totalBad += kBad;
    totalGood += k - kBad;
    good[j] = totalGood;
    bad[j] = totalBad;
    j += f >> 1;
  }
  return j;
}

/** Pass 2: AUC and KS from the block-end totals. */
function blockSums(good: Float64Array, bad: Float64Array, blocks: number, nGood: number, nBad: number, scores: Float64Array): void {
  let previousGood = 0;
  let previousBad = 0;
  let wins2 = 0;
  let high = 0;
  let low = 0;
  for (let j = 0; j < blocks; j++) {
    const g = good[j];
    const b = bad[j];
    wins2 += (g - previousGood) * (previousBad + b);
    previousGood = g;
    previousBad = b;
    const d = b * nGood - g * nBad;
    high = Math.max(high, d);
    low = Math.min(low, d);
  }
  const pairs = nGood * nBad;
  scores[0] = (wins2 * 0.5) / pairs;
  scores[1] = Math.max(high, -low) / pairs;
}

/*
 * With sampling weights (bootstrap-kernel.ts): each cell counts count × its rows' weight, and
 * the replicate's total good and bad weights (which vary from replicate to replicate) take the
 * place of n_good and n_bad. The sums are no longer integers (fractional weights), so the order of
 * the additions matters to the last bit: both implementations make the same floating-point
 * operations on the same values in the same order, and so return the same bits.
 *
 * - scoreCellsWeightedReference: the plain one. A pass for the totals, then the plain pass above.
 *
 * - scoreCellsWeighted (the one the bootstrap runs): one branch-free pass over the cells for the
 *   totals and each block's good and bad weights (a bad cell's weight goes to the bads and 0 to
 *   the goods, x + 0 = x exactly; the block sums start again from 0 after a block's last cell,
 *   stored in slot j as in blockTotals), then the block-end sums of the plain pass over the
 *   blocks only. Issue 12: on a million points with weights 1–4 at random (272,000 cells) the
 *   plain one cost about eight times the unweighted scoring.
 */

/** The plain weighted implementation: scores = [AUC, KS]. */
export function scoreCellsWeightedReference(counts: Uint16Array, flags: Uint8Array, weight: Float64Array, cells: number, scores: Float64Array): void {
  let totalGood = 0;
  let totalBad = 0;
  for (let c = 0; c < cells; c++) {
    const w = counts[c] * weight[c];
    if (flags[c] & 1) totalBad += w;
    else totalGood += w;
  }
  let goods = 0;
  let bads = 0;
  let cumGood = 0;
  let cumBad = 0;
  let wins = 0;
  let gap = 0;
  for (let c = 0; c < cells; c++) {
    const w = counts[c] * weight[c];
    const f = flags[c];
    if (f & 1) bads += w;
    else goods += w;
    if (f & 2) {
      wins += goods * (cumBad + bads * 0.5);
      cumBad += bads;
      cumGood += goods;
      const d = cumBad * totalGood - cumGood * totalBad;
      const absolute = d < 0 ? -d : d;
      if (absolute > gap) gap = absolute;
      goods = 0;
      bads = 0;
    }
  }
  const pairs = totalGood * totalBad;
  scores[0] = wins / pairs;
  scores[1] = gap / pairs;
}

/** The weighted implementation the bootstrap runs: the same bits as scoreCellsWeightedReference. */
export function scoreCellsWeighted(counts: Uint16Array, flags: Uint8Array, weight: Float64Array, cells: number, scores: Float64Array, scratch: ScoreScratch): void {
  const { good, bad } = scratch;
  // Pass 1: totals, and each block's good and bad weights in slot j (the block's index).
  let totalGood = 0;
  let totalBad = 0;
  let goods = 0;
  let bads = 0;
  let j = 0;
  for (let c = 0; c < cells; c++) {
    const w = counts[c] * weight[c];
    const f = flags[c];
    const wBad = w * (f & 1);
    const wGood = w - wBad;
    totalBad += wBad;
    totalGood += wGood;
    bads += wBad;
    goods += wGood;
    good[j] = goods;
    bad[j] = bads;
    const end = f >> 1;
    j += end;
    // After a block's last cell its sums start again from 0.
    const keep = 1 - end;
    goods *= keep;
    bads *= keep;
  }
  // Pass 2: the plain pass's block-end sums, block by block.
  let cumGood = 0;
  let cumBad = 0;
  let wins = 0;
  let gap = 0;
  for (let b = 0; b < j; b++) {
    const g = good[b];
    const bd = bad[b];
    wins += g * (cumBad + bd * 0.5);
    cumBad += bd;
    cumGood += g;
    const d = cumBad * totalGood - cumGood * totalBad;
    const absolute = d < 0 ? -d : d;
    if (absolute > gap) gap = absolute;
  }
  const pairs = totalGood * totalBad;
  scores[0] = wins / pairs;
  scores[1] = gap / pairs;
}
