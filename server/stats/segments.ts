import type { AdoptionPolicy } from '@shared/policy';
import type { SegmentRow } from '@shared/report';
import { auc } from './auc';
import { blockPlacements, inferenceGap, pairedDelong, type PairedDelong, pairedFromSums, pairedWithoutVariance } from './delong';
import { levelOrder, type Holdout, type SegmentColumn } from './holdout';
import { holm } from './holm';
import { type BlockCounts, blocksFromSorted, rowBlocks, type ScoreBlocks, weighBlocks } from './order';
import { segmentFlags, tooFewBads } from './segment-flags';

/**
 * The comparison within each value of each segment column: accounts, goods, bads, both Ginis,
 * ΔGini with its DeLong se, two-sided p and interval (paired DeLong within the segment, delong.ts:
 * two-sided, so that harm can be significant as well as benefit), Holm-adjusted p across every
 * segment row of the report that has a test (holm.ts), and the flags significantly-worse /
 * materially-worse under the policy (segment-flags.ts).
 *
 * A segment with fewer bads than the policy's segment threshold is marked tooFewBads and left out
 * of the segment rule (its Gini moves a lot with a handful of accounts). A segment with one class
 * only has no Gini, and one with fewer than 2 goods or 2 bads no test; its row says why.
 *
 * Sampling weights (holdout.weight): each segment's Ginis and DeLong are the weighted ones
 * (weighted-auc.ts, delong.ts); the engine passes the rows with a known outcome only.
 *
 * Cost: O(n) per segment column after the two whole-holdout sorts. Without weights (byBlockNumbers)
 * two passes over each level's rows in row order, plus O(blocks) per level; with weights
 * (byFilteredBlocks) each segment's blocks are the whole holdout's blocks filtered, in one pass
 * per model in sorted order, then O(n) for DeLong.
 */
export interface SegmentOptions {
  /** Both models' blocks over the whole holdout ("higher = safer"). */
  champion: ScoreBlocks;
  challenger: ScoreBlocks;
  /** α, materiality and the segment rule's bads threshold. */
  policy: Pick<AdoptionPolicy, 'alpha' | 'materialityGiniPoints' | 'segmentRule'>;
  confidence: number;
}

/** One model's blocks restricted to each level of a segment column, in one pass over its order. */
function blocksByLevel(blocks: ScoreBlocks, levelAndLocal: Uint32Array, offsets: Uint32Array, levels: number): ScoreBlocks[] {
  const n = blocks.order.length;
  const order = new Uint32Array(n);
  const sorted = new Float64Array(n);
  const sortedBad = new Uint8Array(n);
  const cursor = offsets.slice(0, levels);
  const { start, value, sortedBad: bad } = blocks;
  for (let k = 0; k < blocks.count; k++) {
    const v = value[k];
    for (let at = start[k]; at < start[k + 1]; at++) {
      const row = blocks.order[at];
      const to = cursor[levelAndLocal[2 * row]]++;
      order[to] = levelAndLocal[2 * row + 1];
      sorted[to] = v;
      sortedBad[to] = bad[at];
    }
  }
  return Array.from({ length: levels }, (_, level) => {
    const from = offsets[level];
    const to = offsets[level + 1];
    return blocksFromSorted(order.subarray(from, to), sorted.subarray(from, to), sortedBad.subarray(from, to));
  });
}

/**
 * The segment rows. Per column, the fast path (byBlockNumbers) when it applies, else the plain
 * one (byFilteredBlocks); `segmentsReference` always takes the plain one, for the tests.
 */
export function segments(holdout: Holdout, options: SegmentOptions): SegmentRow[] {
  return segmentRows(holdout, options, true);
}

export function segmentsReference(holdout: Holdout, options: SegmentOptions): SegmentRow[] {
  return segmentRows(holdout, options, false);
}

function segmentRows(holdout: Holdout, options: SegmentOptions, fast: boolean): SegmentRow[] {
  const rows: SegmentRow[] = [];
  for (const column of holdout.segments) {
    const levels = (fast ? byBlockNumbers(holdout, column, options) : null) ?? byFilteredBlocks(holdout, column, options);
    for (const level of levelOrder(column.levels)) rows.push(segmentRow(column, level, levels[level], options));
  }
  const adjusted = holm(rows.map((row) => row.p));
  rows.forEach((row, i) => {
    row.pHolm = adjusted[i];
    row.flags = segmentFlags(row, options.policy);
  });
  return rows;
}

/** One level's accounts, goods, bads and paired DeLong (null with one class only). */
interface LevelResult {
  n: number;
  goods: number;
  bads: number;
  delong: PairedDelong | null;
}

function segmentRow(column: SegmentColumn, level: number, result: LevelResult, options: SegmentOptions): SegmentRow {
  const { n, goods, bads } = result;
  const row: SegmentRow = {
    column: column.column,
    value: column.levels[level],
    n,
    goods,
    bads,
    championGini: null,
    challengerGini: null,
    deltaGini: null,
    giniSe: null,
    p: null,
    pTwoSided: null,
    giniCi: null,
    pHolm: null,
    tooFewBads: tooFewBads({ bads }, options.policy),
    flags: [],
    note: null,
  };
  if (result.delong === null) {
    row.note = n === 0 ? 'no accounts' : `only ${goods === 0 ? 'bads' : 'goods'} in this segment: Gini undefined`;
  } else {
    const delong = result.delong;
    row.championGini = delong.champion.gini;
    row.challengerGini = delong.challenger.gini;
    row.deltaGini = delong.difference.gini;
    row.giniSe = delong.difference.giniSe;
    row.p = delong.difference.pTwoSided;
    row.pTwoSided = delong.difference.pTwoSided;
    row.giniCi = delong.difference.giniCi;
    row.note = delong.difference.inference;
  }
  return row;
}

/**
 * The plain path: each level's blocks filtered out of the whole holdout's sorted order (one pass
 * per model, blocksByLevel), weighed when the holdout has weights, then delong.ts's paired test.
 */
function byFilteredBlocks(holdout: Holdout, column: SegmentColumn, options: SegmentOptions): LevelResult[] {
  const { bad } = holdout;
  const levels = column.levels.length;
  const { codes } = column;
  // Each account's position within its level, the levels' sizes and where each level starts.
  // Level and local index side by side, so that one random read fetches both.
  const size = new Uint32Array(levels);
  const levelAndLocal = new Uint32Array(2 * holdout.n);
  for (let i = 0; i < holdout.n; i++) {
    const level = codes[i];
    levelAndLocal[2 * i] = level;
    levelAndLocal[2 * i + 1] = size[level]++;
  }
  const offsets = new Uint32Array(levels + 1);
  for (let level = 0; level < levels; level++) offsets[level + 1] = offsets[level] + size[level];
  const badByLevel = new Uint8Array(holdout.n);
  for (let i = 0; i < holdout.n; i++) badByLevel[offsets[codes[i]] + levelAndLocal[2 * i + 1]] = bad[i];
  const champion = blocksByLevel(options.champion, levelAndLocal, offsets, levels);
  const challenger = blocksByLevel(options.challenger, levelAndLocal, offsets, levels);
  const weight = holdout.weight ?? null;
  if (weight !== null) {
    const weightByLevel = new Float64Array(holdout.n);
    for (let i = 0; i < holdout.n; i++) weightByLevel[offsets[codes[i]] + levelAndLocal[2 * i + 1]] = weight[i];
    for (let level = 0; level < levels; level++) {
      const local = weightByLevel.subarray(offsets[level], offsets[level + 1]);
      champion[level] = weighBlocks(champion[level], local);
      challenger[level] = weighBlocks(challenger[level], local);
    }
  }
  return Array.from({ length: levels }, (_, level) => {
    const { nBad: bads, nGood: goods } = champion[level];
    const delong =
      goods === 0 || bads === 0
        ? null
        : pairedDelong(champion[level], challenger[level], badByLevel.subarray(offsets[level], offsets[level + 1]), options.confidence);
    return { n: size[level], goods, bads, delong };
  });
}

/**
 * The fast path, without sampling weights: no sort and no pass in sorted order. Each row's block
 * number in the whole holdout (rowBlocks, order.ts) is all a level needs: its rows, taken in row
 * order, count the goods and bads of each whole-holdout block; the blocks with any of its rows are
 * the level's blocks (a level's blocks are the whole holdout's filtered, in the same order), which
 * give both AUCs and every block's placements (delong.ts); then one pass over its rows, in row
 * order, sums the products of the centred placements exactly as pairedDelong does, so every
 * number is the plain path's to the bit. Its cost per level is O(rows + blocks of the whole
 * holdout), so a column with very many levels (more than n / blocks) takes the plain path.
 */
function byBlockNumbers(holdout: Holdout, column: SegmentColumn, options: SegmentOptions): LevelResult[] | null {
  const n = holdout.n;
  const models = [options.champion, options.challenger];
  const levels = column.levels.length;
  if (holdout.weight || models.some((model) => model.weights || model.order.length !== n)) return null;
  if (levels * (models[0].count + models[1].count) > 4 * n + 1024) return null;
  const { bad } = holdout;
  const { codes } = column;
  // The rows of each level, in row order.
  const offsets = new Uint32Array(levels + 1);
  for (let i = 0; i < n; i++) offsets[codes[i] + 1]++;
  for (let level = 0; level < levels; level++) offsets[level + 1] += offsets[level];
  const next = offsets.slice(0, levels);
  const rows = new Uint32Array(n);
  for (let i = 0; i < n; i++) rows[next[codes[i]]++] = i;

  const rowBlock = models.map((model) => rowBlocks(model));
  // Per model, counts per whole-holdout block (zeroed again as they are read), and each block's
  // placement for a good and a bad within the level.
  const goodsIn = models.map((model) => new Uint32Array(model.count));
  const badsIn = models.map((model) => new Uint32Array(model.count));
  const forGood = models.map((model) => new Float64Array(model.count));
  const forBad = models.map((model) => new Float64Array(model.count));
  return Array.from({ length: levels }, (_, level): LevelResult => {
    const from = offsets[level];
    const to = offsets[level + 1];
    {
      const [blockA, blockB] = rowBlock;
      const [goodA, goodB] = goodsIn;
      const [badA, badB] = badsIn;
      for (let at = from; at < to; at++) {
        const row = rows[at];
        if (bad[row]) {
          badA[blockA[row]]++;
          badB[blockB[row]]++;
        } else {
          goodA[blockA[row]]++;
          goodB[blockB[row]]++;
        }
      }
    }
    const local = models.map((model, m) => levelBlocks(goodsIn[m], badsIn[m], model.count));
    const [a, b] = local;
    if (a.nGood === 0 || a.nBad === 0) return { n: to - from, goods: a.nGood, bads: a.nBad, delong: null };
    const thetaA = auc(a);
    const thetaB = auc(b);
    const gap = inferenceGap(a.nGood, a.nBad);
    if (gap !== null) return { n: to - from, goods: a.nGood, bads: a.nBad, delong: pairedWithoutVariance(thetaA, thetaB, gap) };
    // Each whole-holdout block's placements within the level (blocks without its rows are never read).
    for (let m = 0; m < 2; m++) {
      const placed = blockPlacements(local[m]);
      const { wholeBlock } = local[m];
      for (let k = 0; k < local[m].count; k++) {
        forGood[m][wholeBlock[k]] = placed.forGood[k];
        forBad[m][wholeBlock[k]] = placed.forBad[k];
      }
    }
    const [goodA, goodB] = forGood;
    const [badA, badB] = forBad;
    const [blockA, blockB] = rowBlock;
    let gAA = 0;
    let gBB = 0;
    let gAB = 0;
    let gDD = 0;
    let bAA = 0;
    let bBB = 0;
    let bAB = 0;
    let bDD = 0;
    for (let at = from; at < to; at++) {
      const row = rows[at];
      if (bad[row]) {
        const pa = badA[blockA[row]] - thetaA;
        const pb = badB[blockB[row]] - thetaB;
        const d = pb - pa;
        bAA += pa * pa;
        bBB += pb * pb;
        bAB += pa * pb;
        bDD += d * d;
      } else {
        const pa = goodA[blockA[row]] - thetaA;
        const pb = goodB[blockB[row]] - thetaB;
        const d = pb - pa;
        gAA += pa * pa;
        gBB += pb * pb;
        gAB += pa * pb;
        gDD += d * d;
      }
    }
    const delong = pairedFromSums(a, thetaA, thetaB, { gAA, gBB, gAB, gDD, bAA, bBB, bAB, bDD }, options.confidence);
    return { n: to - from, goods: a.nGood, bads: a.nBad, delong };
  });
}

interface LevelBlocks extends BlockCounts {
  /** The whole-holdout block of each of the level's blocks. */
  wholeBlock: Uint32Array;
}

/** A level's blocks from its goods and bads per whole-holdout block (those counts are zeroed on the way). */
function levelBlocks(goodsIn: Uint32Array, badsIn: Uint32Array, count: number): LevelBlocks {
  let blocks = 0;
  for (let k = 0; k < count; k++) if (goodsIn[k] !== 0 || badsIn[k] !== 0) blocks++;
  const goods = new Uint32Array(blocks);
  const bads = new Uint32Array(blocks);
  const wholeBlock = new Uint32Array(blocks);
  let nGood = 0;
  let nBad = 0;
  for (let k = 0, j = 0; k < count; k++) {
    const g = goodsIn[k];
    const b = badsIn[k];
    if (g === 0 && b === 0) continue;
    goods[j] = g;
    bads[j] = b;
    wholeBlock[j] = k;
    nGood += g;
    nBad += b;
    goodsIn[k] = 0;
    badsIn[k] = 0;
    j++;
  }
  return { count: blocks, goods, bads, nGood, nBad, wholeBlock };
}
