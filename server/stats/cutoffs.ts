import type { CutoffPosition, HigherIs } from '@shared/report';
import { accountsAt, type PreparedModel } from './policy-data';

/**
 * Cut-offs and approval rates. Common practice, no source.
 *
 * Acceptance rule: an account whose score is on the safe side of the cut-off, the cut-off itself
 * included, is accepted: score ≥ cut-off for a higher = safer model, score ≤ cut-off for a
 * higher = riskier one. In "safety" units (higher = safer, see order.ts) that is always
 * safety ≥ safetyCut, with safetyCut = cut-off or −cut-off.
 *
 * Cut-off for a target approval rate r (tie rule): a cut-off is always a score value, and all
 * accounts with that value are accepted or declined together. The cut-off chosen is the score of
 * the k-th safest account, k = ⌈r·n⌉, so the achieved approval rate is the smallest achievable one
 * that is at least r; ties at the cut-off can push it above r, and the achieved rate is always
 * reported beside the target. (r·n within 1e-7 of an integer counts as that integer, so that
 * 0.7 · 10 is 7, not 8.) r = 0 accepts nobody: the cut-off is then the nearest number beyond the
 * safest score. r = 1 accepts everybody: the cut-off is the riskiest score.
 * With sampling weights approval rates are of accounts (summed weights): the cut-off for r is the
 * score of the safest position p whose book [p, n) holds at least r·W − 1e-7 accounts, ties again accepted together; with every weight 1
 * this is the rule above. Rows without an outcome count like every other row.
 * Cost: O(log n) per cut-off on prepared data (a binary search over the sorted scores).
 */

export type CutoffRequest = { cutoff: number } | { approvalRate: number };

export interface LocatedCutoff {
  /** What the report shows: the cut-off in the model's own units and the achieved approval rate. */
  position: CutoffPosition;
  /** The cut-off in safety units: accepted ⇔ safety ≥ safetyCut. */
  safetyCut: number;
  /** First accepted position in the model's sorted order; accepted accounts are [start, n). */
  start: number;
  /** Number of accepted rows, n − start. */
  accepted: number;
  /** Accepted accounts (summed weights; = accepted without weights). */
  acceptedAccounts: number;
}

export function locateCutoff(model: PreparedModel, request: CutoffRequest): LocatedCutoff {
  const { sorted } = model;
  const n = sorted.length;
  let safetyCut: number;
  if ('cutoff' in request) {
    if (!Number.isFinite(request.cutoff)) throw new Error(`${model.name} cut-off must be a finite number`);
    safetyCut = toSafety(request.cutoff, model.higherIs);
  } else {
    const r = request.approvalRate;
    if (!(r >= 0 && r <= 1)) throw new Error(`approval rate must be between 0 and 1, got ${r}`);
    if (model.accountsBefore === null) {
      const k = Math.min(n, Math.max(0, Math.ceil(r * n - 1e-7)));
      safetyCut = k === 0 ? nextUp(sorted[n - 1]) : sorted[n - k];
    } else {
      // The largest p whose book [p, n) holds at least r·W − 1e-7 accounts (with weights 1: the
      // rule above, the same comparisons in the same integers).
      const before = model.accountsBefore;
      const total = before[n];
      const need = r * total - 1e-7;
      let lo = 0;
      let hi = n;
      while (lo < hi) {
        const mid = (lo + hi + 1) >>> 1;
        if (total - before[mid] >= need) lo = mid;
        else hi = mid - 1;
      }
      safetyCut = lo >= n ? nextUp(sorted[n - 1]) : sorted[lo];
    }
  }
  const start = lowerBound(sorted, safetyCut);
  const accepted = n - start;
  const acceptedAccounts = model.accountsBefore === null ? accepted : accountsAt(model, n) - accountsAt(model, start);
  return {
    position: { cutoff: toSafety(safetyCut, model.higherIs), approvalRate: model.accountsBefore === null ? accepted / n : acceptedAccounts / accountsAt(model, n) },
    safetyCut,
    start,
    accepted,
    acceptedAccounts,
  };
}

/** Safety units ⇄ the model's own units (the map is its own inverse). */
function toSafety(score: number, higherIs: HigherIs): number {
  return higherIs === 'safer' ? score : -score;
}

/** First position k with sorted[k] ≥ value (n when there is none). */
function lowerBound(sorted: Float64Array, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The smallest double above x (x finite). */
function nextUp(x: number): number {
  if (x === 0) return Number.MIN_VALUE;
  const buffer = new Float64Array([x]);
  const bits = new BigInt64Array(buffer.buffer);
  bits[0] += x > 0 ? 1n : -1n;
  return buffer[0];
}
