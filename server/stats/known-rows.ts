import type { Population } from '@shared/report';
import type { Holdout, SegmentColumn } from './holdout';

/**
 * The rows with a known outcome, as a holdout of their own (weights, exposure, ids and segment
 * codes carried along; segment levels unchanged), for the statistics that need an outcome: AUC,
 * KS, DeLong, the bootstrap, curves, economics and the segments' Ginis. The same object when every
 * outcome is known. Cost: O(n).
 */
export function knownRows(holdout: Holdout): Holdout {
  const known = holdout.known ?? null;
  if (known === null) return holdout;
  const { n } = holdout;
  let m = 0;
  for (let i = 0; i < n; i++) m += known[i];
  if (m === n) return { ...holdout, known: null, inferredBad: null };
  const rows = new Uint32Array(m);
  for (let i = 0, k = 0; i < n; i++) if (known[i]) rows[k++] = i;
  const pickF = (from: Float64Array) => {
    const out = new Float64Array(m);
    for (let k = 0; k < m; k++) out[k] = from[rows[k]];
    return out;
  };
  const bad = new Uint8Array(m);
  for (let k = 0; k < m; k++) bad[k] = holdout.bad[rows[k]];
  const pickCodes = (column: SegmentColumn): SegmentColumn => {
    const codes = new Uint32Array(m);
    for (let k = 0; k < m; k++) codes[k] = column.codes[rows[k]];
    return { ...column, codes };
  };
  return {
    n: m,
    bad,
    champion: pickF(holdout.champion),
    challenger: pickF(holdout.challenger),
    higherIs: holdout.higherIs,
    ...(holdout.moreChallengers ? { moreChallengers: holdout.moreChallengers.map((extra) => ({ ...extra, scores: pickF(extra.scores) })) } : {}),
    exposure: holdout.exposure ? pickF(holdout.exposure) : null,
    ids: holdout.ids ? Array.from(rows, (row) => holdout.ids![row]) : null,
    segments: holdout.segments.map((segment) => {
      const codes = new Uint32Array(m);
      for (let k = 0; k < m; k++) codes[k] = segment.codes[rows[k]];
      return { ...segment, codes };
    }),
    weight: holdout.weight ? pickF(holdout.weight) : null,
    known: null,
    inferredBad: null,
    // Grade and period columns (calibration and stability), when mapped.
    ...(holdout.grades
      ? { grades: { champion: holdout.grades.champion ? pickCodes(holdout.grades.champion) : null, challenger: holdout.grades.challenger ? pickCodes(holdout.grades.challenger) : null } }
      : {}),
    ...(holdout.period !== undefined ? { period: holdout.period ? pickCodes(holdout.period) : null } : {}),
  };
}

/** Who is in the holdout: rows and accounts (summed weights), split by a known outcome. Cost: O(n). */
export function population(holdout: Holdout): Population {
  const { n, bad } = holdout;
  const weight = holdout.weight ?? null;
  const known = holdout.known ?? null;
  let accounts = 0;
  let knownRowsCount = 0;
  let knownAccounts = 0;
  let bads = 0;
  for (let i = 0; i < n; i++) {
    const w = weight === null ? 1 : weight[i];
    accounts += w;
    if (known === null || known[i]) {
      knownRowsCount++;
      knownAccounts += w;
      if (bad[i]) bads += w;
    }
  }
  return {
    rows: n,
    accounts,
    known: { rows: knownRowsCount, accounts: knownAccounts, goods: knownAccounts - bads, bads },
    unknown: { rows: n - knownRowsCount, accounts: accounts - knownAccounts },
  };
}
