import type { SegmentRow } from '@shared/report';
import { pairedDelong } from './delong';
import type { Holdout } from './holdout';
import { holm } from './holm';
import { type ScoreBlocks, scoreBlocks } from './order';

/**
 * The comparison within each value of each segment column: accounts, goods, bads, both Ginis,
 * ΔGini with its DeLong se and p (paired DeLong within the segment, delong.ts; one- or two-sided
 * as the adoption policy), and Holm-adjusted p across every segment row of the report (holm.ts).
 *
 * A segment with fewer than TOO_FEW_BADS bads is flagged: its Gini moves a lot with a handful of
 * accounts (the threshold is a rule of thumb, no source). A segment with one class only has no
 * Gini; its row says why.
 *
 * Cost: O(n) per segment column after the two whole-holdout sorts (each segment's order is the
 * whole order filtered), plus O(n) for DeLong.
 */
export const TOO_FEW_BADS = 30;

export interface SegmentOptions {
  /** Both models' scores as "higher = safer", and their blocks over the whole holdout. */
  championSafety: Float64Array;
  challengerSafety: Float64Array;
  champion: ScoreBlocks;
  challenger: ScoreBlocks;
  sided: 'one-sided' | 'two-sided';
  confidence: number;
}

export function segments(holdout: Holdout, options: SegmentOptions): SegmentRow[] {
  const rows: SegmentRow[] = [];
  const { bad } = holdout;
  for (const column of holdout.segments) {
    const levels = column.levels.length;
    const size = new Uint32Array(levels);
    const local = new Uint32Array(holdout.n);
    for (let i = 0; i < holdout.n; i++) local[i] = size[column.codes[i]]++;
    const subsets = Array.from({ length: levels }, (_, level) => ({
      bad: new Uint8Array(size[level]),
      championSafety: new Float64Array(size[level]),
      challengerSafety: new Float64Array(size[level]),
      championOrder: new Uint32Array(size[level]),
      challengerOrder: new Uint32Array(size[level]),
      filled: [0, 0],
    }));
    for (let i = 0; i < holdout.n; i++) {
      const subset = subsets[column.codes[i]];
      const at = local[i];
      subset.bad[at] = bad[i];
      subset.championSafety[at] = options.championSafety[i];
      subset.challengerSafety[at] = options.challengerSafety[i];
    }
    for (let k = 0; k < holdout.n; k++) {
      const a = options.champion.order[k];
      const subsetA = subsets[column.codes[a]];
      subsetA.championOrder[subsetA.filled[0]++] = local[a];
      const b = options.challenger.order[k];
      const subsetB = subsets[column.codes[b]];
      subsetB.challengerOrder[subsetB.filled[1]++] = local[b];
    }
    const order = [...column.levels.keys()].sort((x, y) => (column.levels[x] < column.levels[y] ? -1 : column.levels[x] > column.levels[y] ? 1 : 0));
    for (const level of order) {
      const subset = subsets[level];
      const n = size[level];
      let bads = 0;
      for (let i = 0; i < n; i++) bads += subset.bad[i];
      const goods = n - bads;
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
        pHolm: null,
        tooFewBads: bads < TOO_FEW_BADS,
        note: null,
      };
      if (goods === 0 || bads === 0) {
        row.note = n === 0 ? 'no accounts' : `only ${goods === 0 ? 'bads' : 'goods'} in this segment: Gini undefined`;
      } else {
        const result = pairedDelong(
          scoreBlocks(subset.championSafety, subset.bad, subset.championOrder),
          scoreBlocks(subset.challengerSafety, subset.bad, subset.challengerOrder),
          subset.bad,
          options.confidence,
        );
        row.championGini = result.champion.gini;
        row.challengerGini = result.challenger.gini;
        row.deltaGini = result.difference.gini;
        row.giniSe = result.difference.giniSe;
        row.p = options.sided === 'one-sided' ? result.difference.pOneSided : result.difference.pTwoSided;
      }
      rows.push(row);
    }
  }
  const adjusted = holm(rows.map((row) => row.p));
  rows.forEach((row, i) => (row.pHolm = adjusted[i]));
  return rows;
}
