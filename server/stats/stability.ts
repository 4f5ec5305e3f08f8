import type { PeriodRow } from '@shared/calibration';
import type { HigherIs } from '@shared/report';
import { pairedDelong } from './delong';
import { levelOrder, type SegmentColumn } from './holdout';
import { ks } from './ks';
import { safety, scoreBlocks } from './order';
import { psi } from './psi';
import { StatisticError } from './statistic-error';

/**
 * Discrimination by period (a mapped month or vintage column): for each period value, in the
 * values' order, both models' Gini with its DeLong interval, KS, and ΔGini with the paired DeLong
 * interval (delong.ts, ks.ts — each period on its own accounts); the uplift's sign is compared
 * with the whole holdout's, and a period with at least `minBads` bads whose ΔGini has the other
 * sign is flagged (the count of bads that makes a period's Gini worth reading is a rule of
 * thumb, no source). Each model's PSI between consecutive periods (psi.ts, the earlier period as
 * the reference, its own quantile bands) shows when the scored population moved.
 * Gini and KS are unweighted here, as in the rest of the comparison; the PSI takes the weights.
 * Cost: O(n log n) over all periods (each period sorted on its own).
 */

export interface StabilityInput {
  bad: Uint8Array;
  champion: Float64Array;
  challenger: Float64Array;
  higherIs: { champion: HigherIs; challenger: HigherIs };
  weights: Float64Array | null;
  period: SegmentColumn;
  /** ΔGini of the whole holdout (challenger − champion). */
  overallDeltaGini: number;
  minBads: number;
  confidence: number;
  bands: number;
  alpha: number;
}

function subset<T extends Float64Array | Uint8Array>(source: T, rows: Uint32Array, Kind: { new (length: number): T }): T {
  const out = new Kind(rows.length);
  for (let k = 0; k < rows.length; k++) out[k] = source[rows[k]];
  return out;
}

export function stabilityByPeriod(input: StabilityInput): PeriodRow[] {
  const { period, bad } = input;
  const levels = period.levels.length;
  const size = new Uint32Array(levels);
  for (let i = 0; i < period.codes.length; i++) size[period.codes[i]]++;
  const members = Array.from({ length: levels }, (_, level) => new Uint32Array(size[level]));
  const fill = new Uint32Array(levels);
  for (let i = 0; i < period.codes.length; i++) members[period.codes[i]][fill[period.codes[i]]++] = i;

  const overallSign = Math.sign(input.overallDeltaGini);
  const rows: PeriodRow[] = [];
  let previous: { champion: Float64Array; challenger: Float64Array } | null = null;
  for (const level of levelOrder(period.levels)) {
    const rowsOf = members[level];
    if (rowsOf.length === 0) continue;
    const b = subset(bad, rowsOf, Uint8Array);
    const champion = subset(input.champion, rowsOf, Float64Array);
    const challenger = subset(input.challenger, rowsOf, Float64Array);
    const weights = input.weights === null ? null : subset(input.weights, rowsOf, Float64Array);
    let bads = 0;
    for (let k = 0; k < b.length; k++) bads += b[k];
    const row: PeriodRow = {
      period: period.levels[level],
      accounts: rowsOf.length,
      bads,
      championGini: null,
      championGiniCi: null,
      challengerGini: null,
      challengerGiniCi: null,
      championKs: null,
      challengerKs: null,
      deltaGini: null,
      deltaGiniCi: null,
      enoughBads: bads >= input.minBads,
      signChanged: false,
      championPsiFromPrevious: null,
      challengerPsiFromPrevious: null,
      note: null,
    };
    if (bads === 0 || bads === rowsOf.length) {
      row.note = `only ${bads === 0 ? 'goods' : 'bads'} in this period: Gini undefined`;
    } else {
      const championBlocks = scoreBlocks(safety(champion, input.higherIs.champion), b);
      const challengerBlocks = scoreBlocks(safety(challenger, input.higherIs.challenger), b);
      const delong = pairedDelong(championBlocks, challengerBlocks, b, input.confidence);
      row.championGini = delong.champion.gini;
      row.championGiniCi = delong.champion.giniCi;
      row.challengerGini = delong.challenger.gini;
      row.challengerGiniCi = delong.challenger.giniCi;
      row.championKs = ks(championBlocks, input.higherIs.champion).ks;
      row.challengerKs = ks(challengerBlocks, input.higherIs.challenger).ks;
      row.deltaGini = delong.difference.gini;
      row.deltaGiniCi = delong.difference.giniCi;
      const sign = Math.sign(row.deltaGini);
      row.signChanged = row.enoughBads && overallSign !== 0 && sign !== 0 && sign !== overallSign;
      if (!row.enoughBads) row.note = `fewer than ${input.minBads} bads: not counted for the sign rule`;
    }
    if (previous !== null) {
      const psiOf = (name: 'champion' | 'challenger', actual: Float64Array) => {
        try {
          return psi({ reference: previous![name], actual, actualWeights: weights, higherIs: input.higherIs[name], bands: input.bands, alpha: input.alpha }).psi;
        } catch (error) {
          if (error instanceof StatisticError) return null; // e.g. a previous period with a single score value has no bands
          throw error;
        }
      };
      row.championPsiFromPrevious = psiOf('champion', champion);
      row.challengerPsiFromPrevious = psiOf('challenger', challenger);
    }
    previous = { champion, challenger };
    rows.push(row);
  }
  return rows;
}
