import type { ApprovalPatterns } from '@shared/report';
import { locateCutoff } from './cutoffs';
import type { PreparedModel } from './policy-data';

/**
 * Who each model approves at one matched approval rate (several challengers): every model at its
 * own cut-off for the rate (cutoffs.ts, the swap sets' tie rule), and for each of the 2^M
 * combinations of approve / decline across the M models the rows, applicants (weighted), those
 * with a known outcome and their bads. With two models these are the swap sets' four cells
 * (both accept, swap-in, swap-out, both reject). Common practice, no source.
 * Combination index: bit m set = model m approves (model 0 the champion); listed in index order.
 * Cost: O(M·n) for the pass, O(M log n) for the cut-offs.
 */
export interface PatternModel {
  name: string;
  column: string;
  prepared: PreparedModel;
}

export interface PatternRows {
  bad: Uint8Array;
  /** Sampling weight per row; null = 1 each. */
  weight: Float64Array | null;
  /** 1 = outcome known; null = every outcome known. */
  known: Uint8Array | null;
}

export function approvalPatterns(models: readonly PatternModel[], rows: PatternRows, approvalRate: number): ApprovalPatterns {
  const m = models.length;
  if (m < 2 || m > 8) throw new RangeError(`approval patterns need 2 to 8 models, got ${m}`);
  const n = rows.bad.length;
  const located = models.map((model) => locateCutoff(model.prepared, { approvalRate }));
  const combos = 1 << m;
  const count = new Float64Array(combos);
  const accounts = new Float64Array(combos);
  const known = new Float64Array(combos);
  const bads = new Float64Array(combos);
  const code = new Uint8Array(n);
  for (let j = 0; j < m; j++) {
    const safety = models[j].prepared.safety;
    const cut = located[j].safetyCut;
    const bit = 1 << j;
    for (let i = 0; i < n; i++) if (safety[i] >= cut) code[i] |= bit;
  }
  const { bad, weight } = rows;
  const isKnown = rows.known;
  for (let i = 0; i < n; i++) {
    const c = code[i];
    const w = weight === null ? 1 : weight[i];
    count[c]++;
    accounts[c] += w;
    if (isKnown === null || isKnown[i]) {
      known[c] += w;
      if (bad[i]) bads[c] += w;
    }
  }
  return {
    approvalRate,
    models: models.map((model, j) => ({ name: model.name, column: model.column, cutoff: located[j].position.cutoff, approvalRate: located[j].position.approvalRate })),
    combinations: Array.from({ length: combos }, (_, c) => ({
      approved: models.map((_, j) => (c & (1 << j)) !== 0),
      count: count[c],
      accounts: accounts[c],
      known: known[c],
      bads: bads[c],
      badRate: known[c] > 0 ? bads[c] / known[c] : null,
    })),
  };
}
