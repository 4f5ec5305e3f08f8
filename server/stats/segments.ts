import type { AdoptionPolicy } from '@shared/policy';
import type { SegmentRow } from '@shared/report';
import { pairedDelong } from './delong';
import { levelOrder, type Holdout } from './holdout';
import { holm } from './holm';
import { blocksFromSorted, type ScoreBlocks, weighBlocks } from './order';
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
 * Cost: O(n) per segment column after the two whole-holdout sorts: each segment's blocks are the
 * whole holdout's blocks filtered, in one pass per model; then O(n) for DeLong.
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

export function segments(holdout: Holdout, options: SegmentOptions): SegmentRow[] {
  const rows: SegmentRow[] = [];
  const { bad } = holdout;
  for (const column of holdout.segments) {
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

    for (const level of levelOrder(column.levels)) {
      const n = size[level];
      const { nBad: bads, nGood: goods } = champion[level];
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
      if (goods === 0 || bads === 0) {
        row.note = n === 0 ? 'no accounts' : `only ${goods === 0 ? 'bads' : 'goods'} in this segment: Gini undefined`;
      } else {
        const result = pairedDelong(champion[level], challenger[level], badByLevel.subarray(offsets[level], offsets[level + 1]), options.confidence);
        row.championGini = result.champion.gini;
        row.challengerGini = result.challenger.gini;
        row.deltaGini = result.difference.gini;
        row.giniSe = result.difference.giniSe;
        row.p = result.difference.pTwoSided;
        row.pTwoSided = result.difference.pTwoSided;
        row.giniCi = result.difference.giniCi;
        row.note = result.difference.inference;
      }
      rows.push(row);
    }
  }
  const adjusted = holm(rows.map((row) => row.p));
  rows.forEach((row, i) => {
    row.pHolm = adjusted[i];
    row.flags = segmentFlags(row, options.policy);
  });
  return rows;
}
