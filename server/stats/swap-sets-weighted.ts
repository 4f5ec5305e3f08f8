import type { SegmentSwapCell, SwapSegmentRow, SwapSets } from '@shared/report';
import type { LocatedCutoff } from './cutoffs';
import { levelOrder } from './holdout';
import type { PreparedHoldout } from './policy-data';
import { BOTH_ACCEPT, segmentApproval, SWAP_IN, SWAP_OUT, type SwapRequest, swapResult } from './swap-result';
import { swapTest } from './swap-test';
import { kishSize, wilsonEffective } from './wilson-effective';

/**
 * Swap sets of a holdout with sampling weights or applicants without an outcome (the rules of
 * swap-sets.ts, at the same cut-offs). Per cell, in accounts (summed weights):
 *   accounts   every applicant of the cell; `count` stays the number of rows
 *   known      those with an outcome; unknown = accounts − known
 *   bads       known bads; badRate = bads / known (null when known = 0), with Wilson's interval
 *              on the Kish effective size (Σw)²/Σw² of the known rows (wilson-effective.ts)
 *   badRateBounds  [bads / accounts, (bads + unknown) / accounts]: every unknown applicant good,
 *              every one bad — what the data allow without an assumption
 *   inferred   { method, bads, badRate } with the unknown applicants' bads inferred under the
 *              report's reject inference (reject-inference.ts); null for known-only
 *   amount     the exposure column times the weight, summed
 * The swap-in vs swap-out test compares the known bad rates on the Kish effective sizes, rounded
 * to whole accounts (without weights these are the known rows themselves, exactly).
 * Common practice, no source.
 * Cost: one O(n) pass, and one more per segment column.
 */

// Per slot: rows, accounts, known, bads, Σw² of known rows, inferred bads, amount.
const FIELDS = 7;

function accumulate(data: PreparedHoldout, cells: Uint8Array, key: Uint32Array | null, slots: number): Float64Array {
  const { n, bad, exposure, weight, known } = data;
  const inferred = data.inferred?.probability ?? null;
  const sums = new Float64Array(slots * 4 * FIELDS);
  for (let i = 0; i < n; i++) {
    const at = ((key === null ? 0 : key[i]) * 4 + cells[i]) * FIELDS;
    const w = weight === null ? 1 : weight[i];
    sums[at] += 1;
    sums[at + 1] += w;
    if (known === null || known[i]) {
      sums[at + 2] += w;
      if (bad[i]) sums[at + 3] += w;
      sums[at + 4] += w * w;
    } else if (inferred !== null) sums[at + 5] += w * inferred[i];
    if (exposure !== null) sums[at + 6] += w * exposure[i];
  }
  return sums;
}

function cellAt(data: PreparedHoldout, sums: Float64Array, at: number, confidence: number): SegmentSwapCell {
  const count = sums[at];
  const accounts = sums[at + 1];
  const known = sums[at + 2];
  const bads = sums[at + 3];
  const unknown = Math.max(0, accounts - known);
  const inferredBads = bads + sums[at + 5];
  return {
    count,
    bads,
    badRate: known > 0 ? bads / known : null,
    badRateCi: wilsonEffective(bads, known, sums[at + 4], confidence),
    amount: data.exposure !== null ? sums[at + 6] : null,
    accounts,
    known,
    unknown,
    badRateBounds: accounts > 0 ? [bads / accounts, (bads + unknown) / accounts] : null,
    inferred: data.inferred === null ? null : { method: data.inferred.method, bads: inferredBads, badRate: accounts > 0 ? inferredBads / accounts : null },
  };
}

/**
 * The test compares known outcomes only: a side with accounts but none with a known outcome (e.g.
 * a swap-in the champion declined entirely) is named as such, not as an empty side.
 */
function withoutKnown(test: SwapSets['test'], accountsIn: number, accountsOut: number): SwapSets['test'] {
  if (test.p !== null || test.z !== null) return test;
  const reason = test.reason ?? '';
  const inUnknown = accountsIn > 0 && reason.includes('no swap-in');
  const outUnknown = accountsOut > 0 && reason.includes('no swap-out');
  if (inUnknown && outUnknown) return { ...test, reason: 'no swap-in or swap-out account has a known outcome: only their inferred bad rates and bounds describe them' };
  const side = inUnknown ? 'swap-in' : outUnknown ? 'swap-out' : null;
  if (side === null) return test;
  return { ...test, reason: `no ${side} account has a known outcome (the ${side} accounts were not booked): only its inferred bad rate and bounds describe it` };
}

/** Known bads and known accounts of a cell as whole effective accounts, for the swap test. */
function effective(sums: Float64Array, at: number): { bads: number; size: number } {
  const known = sums[at + 2];
  const size = Math.round(kishSize(known, sums[at + 4]));
  return { bads: known > 0 ? Math.min(size, Math.round((sums[at + 3] / known) * size)) : 0, size };
}

export function weightedSwapSets(data: PreparedHoldout, request: SwapRequest, champion: LocatedCutoff, challenger: LocatedCutoff, confidence: number): SwapSets {
  const { n } = data;
  const a = data.champion.safety;
  const b = data.challenger.safety;
  const cutA = champion.safetyCut;
  const cutB = challenger.safetyCut;
  const cells = new Uint8Array(n);
  for (let i = 0; i < n; i++) cells[i] = (a[i] >= cutA ? 1 : 0) | (b[i] >= cutB ? 2 : 0);
  const sums = accumulate(data, cells, null, 1);
  const cell = (index: number) => {
    const result = cellAt(data, sums, index * FIELDS, confidence);
    return { ...result, share: result.accounts! / data.accounts };
  };
  const swapIn = effective(sums, SWAP_IN * FIELDS);
  const swapOut = effective(sums, SWAP_OUT * FIELDS);
  const test = withoutKnown(swapTest(swapIn.bads, swapIn.size, swapOut.bads, swapOut.size), sums[SWAP_IN * FIELDS + 1], sums[SWAP_OUT * FIELDS + 1]);
  return swapResult(request, champion, challenger, cell, test, bySegment(data, cells, confidence));
}

function bySegment(data: PreparedHoldout, cells: Uint8Array, confidence: number): SwapSegmentRow[] {
  const rows: SwapSegmentRow[] = [];
  for (const { column, levels, codes } of data.segments) {
    const sums = accumulate(data, cells, codes, levels.length);
    for (const level of levelOrder(levels)) {
      const base = level * 4 * FIELDS;
      const field = (cell: number, f: number) => sums[base + cell * FIELDS + f];
      const total = (f: number) => field(0, f) + field(1, f) + field(2, f) + field(3, f);
      const accounts = total(1);
      const approval = (accepted: number, other: number) =>
        segmentApproval(accounts, field(accepted, 1) + field(other, 1), field(accepted, 2) + field(other, 2), field(accepted, 3) + field(other, 3));
      rows.push({
        column,
        value: levels[level],
        accounts,
        bads: total(3),
        unknown: Math.max(0, accounts - total(2)),
        champion: approval(BOTH_ACCEPT, SWAP_OUT),
        challenger: approval(BOTH_ACCEPT, SWAP_IN),
        swapIn: cellAt(data, sums, base + SWAP_IN * FIELDS, confidence),
        swapOut: cellAt(data, sums, base + SWAP_OUT * FIELDS, confidence),
      });
    }
  }
  return rows;
}
