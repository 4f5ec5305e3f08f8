import type { HigherIs } from '@shared/report';

/**
 * Orientation and ordering helpers shared by every statistic.
 *
 * - safety(): scores turned to "higher = safer". O(n).
 * - argsortAscending(): stable ascending index order without comparisons. Scores that are all
 *   whole multiples of one power of ten, 10^−d for d = 0 … 9 (points: d = 0; PDs given with six
 *   decimals: d = 6), over a modest range of keys round(v·10^d), are sorted by those integer keys
 *   (decimalKeys): a counting sort, or for wide ranges two LSD radix passes on the key. Other
 *   scores take an LSD radix sort on the IEEE-754 bit patterns (16-bit digits; a digit every value
 *   shares is skipped), the plain path the tests compare the keyed one with. O(n) per pass; at a
 *   million rows about 5× faster than a comparator sort for continuous scores, more on keys.
 * - scoreBlocks(): the ascending order cut into blocks of equal scores with the goods and bads of
 *   each block — what AUC, DeLong placements, KS, curves and band tables all start from. O(n)
 *   after the sort.
 * - rowBlocks(): each row's block number, for the passes that go through the rows in their own
 *   order (DeLong placements, midranks, bands, segments) and look a per-block table up instead of
 *   writing to every row in sorted order (random writes are what costs most at millions of rows).
 *   The keyed sort gets it almost free; otherwise one pass in sorted order makes it.
 */

/** Scores turned to "higher = safer": unchanged for points, negated for PD-like scores. */
export function safety(scores: Float64Array, higherIs: HigherIs): Float64Array {
  if (higherIs === 'safer') return scores;
  const out = new Float64Array(scores.length);
  for (let i = 0; i < scores.length; i++) out[i] = -scores[i];
  return out;
}

const RADIX = 1 << 16;

/** Each ScoreBlocks' rows' block numbers, once made (rowBlocks). */
const rowBlockCache = new WeakMap<ScoreBlocks, Uint32Array>();

/**
 * A stable ascending sort: the order, and optionally the sorted values and a carried byte column
 * (the outcome) in sorted order. Random reads are what costs most at a million rows, so
 * scoreBlocks has the values travel with the indices instead of looking them up afterwards.
 */
interface Sorted {
  order: Uint32Array;
  /** values[order[k]], when asked for. */
  sorted: Float64Array | null;
  /** carry[order[k]], when a byte column was given. */
  carried: Uint8Array | null;
}

/**
 * Indices that sort `values` ascending; ties keep index order (a stable sort).
 * −0 and +0 are equal; NaN sorts after +Infinity (the engine never passes NaN: the reader
 * rejects or drops missing scores). Scores on a decimal grid over a modest range (points, PDs
 * with six decimals; decimalKeys) take the keyed sort, everything else the radix sort.
 */
export function argsortAscending(values: Float64Array): Uint32Array {
  const keys = decimalKeys(values);
  if (keys !== null) return keyedBlocks(values, null, keys).order;
  return radixSort(values, false, null).order;
}

/**
 * Integer keys for values that are all whole multiples of 10^−d for one d in 0 … 9: key =
 * round(v·10^d), offset by the smallest key, when the keys span fewer than max(2^16, 2n) values;
 * else null. Every value is checked to be exactly key / 10^d (the double nearest that decimal), so
 * equal values get equal keys and different values different keys; and since that division is
 * monotone in the key, the keys sort as the values do (−0 and +0 both get key 0). The smallest d
 * that fits is taken (a value off the grid usually shows within the first few rows).
 */
export function decimalKeys(values: Float64Array): KeyRange | null {
  const n = values.length;
  if (n >= 2 ** 32) throw new RangeError('argsortAscending: more than 2^32 − 1 values');
  if (n === 0) return null;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const limit = Math.max(RADIX, 2 * n);
  for (let d = 0, scale = 1; d <= 9; d++, scale *= 10) {
    const low = Math.round(min * scale);
    const high = Math.round(max * scale);
    // A finer grid only widens the range.
    if (!(high - low < limit && Math.abs(low) <= MAX_KEY && Math.abs(high) <= MAX_KEY)) return null;
    if (onGrid(values, scale)) return { low, size: high - low + 1, scale };
  }
  return null;
}

const MAX_KEY = 2 ** 52;

/** Keys of values on the 1/scale grid: round(v·scale) − low, an integer in [0, size). */
export interface KeyRange {
  low: number;
  size: number;
  scale: number;
}

function onGrid(values: Float64Array, scale: number): boolean {
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== Math.round(v * scale) / scale) return false;
  }
  return true;
}

/** LSD radix sort on order-preserving 64-bit keys, 16 bits per pass. */
function radixSort(values: Float64Array, withValues: boolean, carry: Uint8Array | null): Sorted {
  const n = values.length;
  const words = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  // Order-preserving unsigned keys: flip every bit of negatives, only the sign bit of the rest;
  // −0 is read as +0 so the two stay tied.
  let lo = new Uint32Array(n);
  let hi = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const h = words[2 * i + 1];
    const l = words[2 * i];
    if (h & 0x80000000 && (h !== 0x80000000 || l !== 0)) {
      hi[i] = ~h >>> 0;
      lo[i] = ~l >>> 0;
    } else {
      hi[i] = (h | 0x80000000) >>> 0;
      lo[i] = h === 0x80000000 ? 0 : l;
    }
  }

  // One histogram per digit, all from one pass (LSD histograms do not depend on the order).
  const counts = [new Uint32Array(RADIX), new Uint32Array(RADIX), new Uint32Array(RADIX), new Uint32Array(RADIX)];
  const [c0, c1, c2, c3] = counts;
  for (let i = 0; i < n; i++) {
    const l = lo[i];
    const h = hi[i];
    c0[l & 0xffff]++;
    c1[l >>> 16]++;
    c2[h & 0xffff]++;
    c3[h >>> 16]++;
  }
  // A digit every value shares does not reorder anything.
  const passes: number[] = [];
  for (let digit = 0; digit < 4; digit++) {
    let used = 0;
    for (let b = 0; b < RADIX && used < 2; b++) if (counts[digit][b] !== 0) used++;
    if (used >= 2) passes.push(digit);
  }

  let index: Uint32Array | null = null;
  let nextIndex: Uint32Array = new Uint32Array(n);
  // Keys travel with the indices through every pass but the last, and through the last too when
  // the sorted values are wanted; so does the carried byte column.
  const keepKeys = withValues || passes.length > 1;
  let nextLo = keepKeys && passes.length > 0 ? new Uint32Array(n) : lo;
  let nextHi = keepKeys && passes.length > 0 ? new Uint32Array(n) : hi;
  let bytes: Uint8Array | null = carry === null ? null : Uint8Array.from(carry);
  let nextBytes: Uint8Array | null = carry === null ? null : new Uint8Array(n);
  for (let p = 0; p < passes.length; p++) {
    const digit = passes[p];
    const count = counts[digit];
    let sum = 0;
    for (let b = 0; b < RADIX; b++) {
      const c = count[b];
      count[b] = sum;
      sum += c;
    }
    const shift = digit % 2 === 0 ? 0 : 16;
    const key = digit >= 2 ? hi : lo;
    const moveKeys = withValues || p < passes.length - 1;
    for (let i = 0; i < n; i++) {
      const at = count[(key[i] >>> shift) & 0xffff]++;
      nextIndex[at] = index === null ? i : index[i];
      if (moveKeys) {
        nextLo[at] = lo[i];
        nextHi[at] = hi[i];
      }
      if (bytes !== null) nextBytes![at] = bytes[i];
    }
    const previous = index ?? new Uint32Array(n);
    index = nextIndex;
    nextIndex = previous;
    if (moveKeys) {
      [lo, nextLo] = [nextLo, lo];
      [hi, nextHi] = [nextHi, hi];
    }
    if (bytes !== null) [bytes, nextBytes] = [nextBytes!, bytes];
  }
  if (index === null) {
    index = new Uint32Array(n);
    for (let i = 0; i < n; i++) index[i] = i;
  }
  let sorted: Float64Array | null = null;
  if (withValues) {
    // Back from keys to doubles, in sorted order.
    sorted = new Float64Array(n);
    const out = new Uint32Array(sorted.buffer);
    for (let k = 0; k < n; k++) {
      const h = hi[k];
      if (h & 0x80000000) {
        out[2 * k + 1] = (h & 0x7fffffff) >>> 0;
        out[2 * k] = lo[k];
      } else {
        out[2 * k + 1] = ~h >>> 0;
        out[2 * k] = ~lo[k] >>> 0;
      }
    }
  }
  return { order: index, sorted, carried: bytes };
}

/** Equal-score blocks of one model's scores in ascending "safety" order. */
export interface ScoreBlocks {
  /** Row indices in ascending order of the (safety) values, ties in row order. */
  order: Uint32Array;
  /** The outcome in that order: bad[order[k]]. */
  sortedBad: Uint8Array;
  /** Number of blocks (distinct values). */
  count: number;
  /** Block k covers order[start[k]] … order[start[k + 1] − 1]; length count + 1. */
  start: Uint32Array;
  /** The (safety) value of each block. */
  value: Float64Array;
  goods: Uint32Array;
  bads: Uint32Array;
  nGood: number;
  nBad: number;
  /** Sampling weights, when the holdout has them (see weighBlocks); absent = every row counts once. */
  weights?: BlockWeights;
}

/** What AUC, DeLong placements and the paired test read of a ScoreBlocks: the counts per block. */
export type BlockCounts = Pick<ScoreBlocks, 'count' | 'goods' | 'bads' | 'nGood' | 'nBad' | 'weights'>;

/** The weighted counterpart of a ScoreBlocks' counts. */
export interface BlockWeights {
  /** Weight of each row, indexed like the rows in `order`. */
  row: Float64Array;
  /** The weights in sorted order, row[order[k]]: read in sequence by the later passes in that order. */
  sorted: Float64Array;
  /** Summed weight of the goods and of the bads of each block. */
  goods: Float64Array;
  bads: Float64Array;
  /** Total weight of the goods and of the bads. */
  good: number;
  bad: number;
}

/**
 * The blocks with the sampling weights of their rows summed per block and class (`weight[row]`
 * for every row in `order`). Sums run in sorted order, block by block. O(n).
 */
export function weighBlocks(blocks: ScoreBlocks, weight: Float64Array): ScoreBlocks {
  const { order, sortedBad, count, start } = blocks;
  const goods = new Float64Array(count);
  const bads = new Float64Array(count);
  const sorted = new Float64Array(order.length);
  let good = 0;
  let bad = 0;
  for (let k = 0; k < count; k++) {
    let g = 0;
    let b = 0;
    for (let at = start[k]; at < start[k + 1]; at++) {
      const w = weight[order[at]];
      sorted[at] = w;
      if (sortedBad[at]) b += w;
      else g += w;
    }
    goods[k] = g;
    bads[k] = b;
    good += g;
    bad += b;
  }
  const weighed = { ...blocks, weights: { row: weight, sorted, goods, bads, good, bad } };
  const rowBlock = rowBlockCache.get(blocks);
  if (rowBlock !== undefined) rowBlockCache.set(weighed, rowBlock);
  return weighed;
}

/**
 * Sorts `values` (already "higher = safer") and cuts the order into blocks of equal values, with
 * the goods and bads in each. `order` may be passed when it is already known (then the values
 * and outcomes are gathered into that order).
 */
export function scoreBlocks(values: Float64Array, bad: Uint8Array, order?: Uint32Array): ScoreBlocks {
  const n = values.length;
  if (bad.length !== n) throw new RangeError('scoreBlocks: scores and outcomes differ in length');
  let sorted: Float64Array;
  let sortedBad: Uint8Array;
  if (order === undefined) {
    const keys = decimalKeys(values);
    if (keys !== null) return keyedBlocks(values, bad, keys);
    const result = radixSort(values, true, bad);
    order = result.order;
    sorted = result.sorted!;
    sortedBad = result.carried!;
  } else {
    if (order.length !== n) throw new RangeError('scoreBlocks: the order must have one entry per score');
    sorted = new Float64Array(n);
    sortedBad = new Uint8Array(n);
    for (let k = 0; k < n; k++) {
      const row = order[k];
      sorted[k] = values[row];
      sortedBad[k] = bad[row];
    }
  }
  return blocksFromSorted(order, sorted, sortedBad);
}

/** Above this many blocks the keyed sort takes two radix passes instead of one counting pass. */
const ONE_PASS_BLOCKS = 1 << 16;

/** True when scoreBlocks would sort these values in one counting pass (keys over at most 2^16 values, e.g. points). */
export function sortsInOnePass(values: Float64Array): boolean {
  const keys = decimalKeys(values);
  return keys !== null && keys.size <= ONE_PASS_BLOCKS;
}

/** scoreBlocks the plain way, whatever the scores: the radix sort on their bits (the tests compare the keyed path with it). */
export function scoreBlocksReference(values: Float64Array, bad: Uint8Array): ScoreBlocks {
  if (bad.length !== values.length) throw new RangeError('scoreBlocks: scores and outcomes differ in length');
  const result = radixSort(values, true, bad);
  return blocksFromSorted(result.order, result.sorted!, result.carried!);
}

/**
 * Blocks of keyed scores (decimalKeys) straight from their histogram: the blocks are the keys that
 * occur, their goods and bads counted per key. Each row's key then becomes its block number
 * (rowBlocks), and the rows and outcomes are placed by a stable counting sort on it: one pass, or
 * two LSD passes of half its bits when there are more than 2^16 blocks, so that each pass writes
 * to at most a few thousand places at a time. `bad` null: the order only (argsortAscending).
 */
function keyedBlocks(values: Float64Array, bad: Uint8Array | null, keys: KeyRange): ScoreBlocks {
  const n = values.length;
  const { low, size, scale } = keys;
  // Each row's key (below, its block), counted with its outcome.
  const rowBlock = new Uint32Array(n);
  const count = new Uint32Array(size);
  const badCount = new Uint32Array(size);
  for (let i = 0; i < n; i++) {
    const b = scale === 1 ? values[i] - low : Math.round(values[i] * scale) - low;
    rowBlock[i] = b;
    count[b]++;
    if (bad !== null) badCount[b] += bad[i];
  }
  let blocks = 0;
  for (let b = 0; b < size; b++) if (count[b] !== 0) blocks++;
  const start = new Uint32Array(blocks + 1);
  const value = new Float64Array(blocks);
  const goods = new Uint32Array(blocks);
  const bads = new Uint32Array(blocks);
  let nBad = 0;
  // count[b] becomes the block of key b.
  for (let b = 0, k = 0, at = 0; b < size; b++) {
    const c = count[b];
    if (c === 0) continue;
    start[k] = at;
    value[k] = (low + b) / scale + 0; // the value itself (checked in decimalKeys); −0 reads as +0
    bads[k] = badCount[b];
    goods[k] = c - badCount[b];
    nBad += badCount[b];
    count[b] = k;
    at += c;
    k++;
  }
  start[blocks] = n;
  for (let i = 0; i < n; i++) rowBlock[i] = count[rowBlock[i]];
  const { order, sortedBad } = sortByBlock(rowBlock, bad, start, blocks);
  const result: ScoreBlocks = { order, sortedBad, count: blocks, start, value, goods, bads, nGood: n - nBad, nBad };
  rowBlockCache.set(result, rowBlock);
  return result;
}

/** Rows (and outcomes) in order of their block numbers, ties in row order: a stable counting sort. */
function sortByBlock(rowBlock: Uint32Array, bad: Uint8Array | null, start: Uint32Array, blocks: number): { order: Uint32Array; sortedBad: Uint8Array } {
  const n = rowBlock.length;
  const order = new Uint32Array(n);
  const sortedBad = new Uint8Array(bad === null ? 0 : n);
  if (blocks <= ONE_PASS_BLOCKS) {
    const next = start.slice(0, blocks);
    for (let i = 0; i < n; i++) {
      const at = next[rowBlock[i]]++;
      order[at] = i;
      if (bad !== null) sortedBad[at] = bad[i];
    }
    return { order, sortedBad };
  }
  const shift = Math.ceil(Math.ceil(Math.log2(blocks)) / 2);
  const mask = (1 << shift) - 1;
  const lowNext = new Uint32Array(mask + 1);
  const highNext = new Uint32Array((blocks >>> shift) + 1);
  for (let k = 0; k < blocks; k++) {
    const c = start[k + 1] - start[k];
    lowNext[k & mask] += c;
    highNext[k >>> shift] += c;
  }
  toStarts(lowNext);
  toStarts(highNext);
  // By the low digit, then (stable) by the high one.
  const passRow = new Uint32Array(n);
  const passBlock = new Uint32Array(n);
  const passBad = new Uint8Array(bad === null ? 0 : n);
  for (let i = 0; i < n; i++) {
    const k = rowBlock[i];
    const at = lowNext[k & mask]++;
    passRow[at] = i;
    passBlock[at] = k;
    if (bad !== null) passBad[at] = bad[i];
  }
  for (let at = 0; at < n; at++) {
    const to = highNext[passBlock[at] >>> shift]++;
    order[to] = passRow[at];
    if (bad !== null) sortedBad[to] = passBad[at];
  }
  return { order, sortedBad };
}

/** Counts turned into the start of each bucket, in place. */
function toStarts(count: Uint32Array): void {
  let sum = 0;
  for (let b = 0; b < count.length; b++) {
    const c = count[b];
    count[b] = sum;
    sum += c;
  }
}

/**
 * Blocks made elsewhere (a worker thread, rank.ts) with the row blocks made with them: rowBlocks
 * then returns those. `rowBlock` must be the blocks' own (rowBlocks of the same blocks there).
 */
export function adoptRowBlocks(blocks: ScoreBlocks, rowBlock: Uint32Array): ScoreBlocks {
  if (rowBlock.length !== blocks.order.length) throw new RangeError('adoptRowBlocks: one block number per row');
  rowBlockCache.set(blocks, rowBlock);
  return blocks;
}

/**
 * The block of every row: rowBlocks(blocks)[row] = k when the row lies in block k (its position
 * in `order` is in [start[k], start[k + 1])). Kept from the keyed sort, else made by one pass in
 * sorted order and kept for the next caller. Blocks weighed by weighBlocks share their source's.
 */
export function rowBlocks(blocks: ScoreBlocks): Uint32Array {
  let rowBlock = rowBlockCache.get(blocks);
  if (rowBlock === undefined) {
    const { order, start, count } = blocks;
    rowBlock = new Uint32Array(order.length);
    for (let k = 0; k < count; k++) for (let at = start[k]; at < start[k + 1]; at++) rowBlock[order[at]] = k;
    rowBlockCache.set(blocks, rowBlock);
  }
  return rowBlock;
}

/** The blocks of values already in ascending order (with their rows and outcomes in that order). O(n). */
export function blocksFromSorted(order: Uint32Array, sorted: Float64Array, sortedBad: Uint8Array): ScoreBlocks {
  const n = sorted.length;
  let blocks = 0;
  for (let k = 0; k < n; k++) if (k === 0 || sorted[k] !== sorted[k - 1]) blocks++;
  const start = new Uint32Array(blocks + 1);
  const value = new Float64Array(blocks);
  const goods = new Uint32Array(blocks);
  const bads = new Uint32Array(blocks);
  let b = -1;
  let blockBads = 0;
  let nBad = 0;
  for (let k = 0; k < n; k++) {
    const v = sorted[k];
    if (k === 0 || v !== sorted[k - 1]) {
      if (b >= 0) {
        bads[b] = blockBads;
        goods[b] = k - start[b] - blockBads;
      }
      b++;
      start[b] = k;
      value[b] = v === 0 ? 0 : v; // −0 reads as +0
      blockBads = 0;
    }
    blockBads += sortedBad[k];
  }
  if (b >= 0) {
    bads[b] = blockBads;
    goods[b] = n - start[b] - blockBads;
  }
  for (let k = 0; k < blocks; k++) nBad += bads[k];
  start[blocks] = n;
  return { order, sortedBad, count: blocks, start, value, goods, bads, nGood: n - nBad, nBad };
}
