import type { RejectInference } from '@shared/report';
import type { PreparedModel } from './policy-data';
import { StatisticError } from './statistic-error';

/**
 * Reject inference: a probability of bad for each applicant without an outcome, under the method
 * chosen in the analysis settings, so that a swap cell can state an inferred bad rate beside the
 * observed one (never in its place).
 * - known-only: nothing inferred (null); the cells carry the bounds instead.
 * - parcel (fuzzy parcelling; common practice, no source; see e.g. N. Siddiqi 2006, "Credit Risk
 *   Scorecards", Wiley, ch. on reject inference): an unknown row in champion score band b counts
 *   min(1, K·r_b) bads, r_b being the weighted bad rate of the known rows of band b. The bands are
 *   the band table's (policy-data.ts, over all rows); a band with no known rows takes the nearest
 *   band that has some, the riskier side first on equal distance.
 * - column: the probability from the mapped inferred-bad column (e.g. bureau performance at other
 *   lenders), 0 to 1, required on every unknown row (the reader checks it, naming row and column).
 * Returns the probability per row (0 on known rows), or null when nothing is inferred.
 * Cost: O(n).
 */
export function inferBads(
  inference: RejectInference,
  rows: { n: number; bad: Uint8Array; known: Uint8Array | null; weight: Float64Array | null; inferredBad: Float64Array | null },
  champion: PreparedModel,
): Float64Array | null {
  const { n, bad, known, weight } = rows;
  if (inference.method === 'known-only' || known === null) return null;
  const out = new Float64Array(n);
  if (inference.method === 'column') {
    const given = rows.inferredBad;
    if (given === null) throw new StatisticError('reject inference by column needs an inferred-bad column in the mapping', 'no_inferred_column');
    for (let i = 0; i < n; i++) {
      if (known[i]) continue;
      const p = given[i];
      if (!(p >= 0 && p <= 1)) throw new StatisticError(`reject inference by column: account ${i + 1} has no probability of bad between 0 and 1`, 'bad_inferred');
      out[i] = p;
    }
    return out;
  }
  const K = inference.parcelFactor;
  const bands = champion.bandEnds.length;
  const knownWeight = new Float64Array(bands);
  const badWeight = new Float64Array(bands);
  for (let i = 0; i < n; i++) {
    if (!known[i]) continue;
    const w = weight === null ? 1 : weight[i];
    knownWeight[champion.band[i]] += w;
    badWeight[champion.band[i]] += bad[i] ? w : 0;
  }
  const rate = new Float64Array(bands);
  for (let b = 0; b < bands; b++) {
    let source = -1;
    for (let d = 0; d < bands && source < 0; d++) {
      if (b - d >= 0 && knownWeight[b - d] > 0) source = b - d;
      else if (b + d < bands && knownWeight[b + d] > 0) source = b + d;
    }
    rate[b] = source < 0 ? 0 : Math.min(1, (K * badWeight[source]) / knownWeight[source]);
  }
  for (let i = 0; i < n; i++) if (!known[i]) out[i] = rate[champion.band[i]];
  return out;
}
