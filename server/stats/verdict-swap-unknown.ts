import { formatCount, formatPercent, formatShare } from '@shared/format';
import { type AdoptionPolicy } from '@shared/policy';
import { inferenceWords } from '@shared/population-words';
import { type Criterion, inferenceOf, type AnalysisSettings, type SwapCell, type SwapSets } from '@shared/report';

/**
 * The adoption policy's swap rule for swap sets of a holdout with weights or applicants without an
 * outcome (cells carrying accounts, known, unknown, bounds and inferred; swap-sets-weighted.ts).
 * The rule is judged under the report's reject inference and says so:
 * - known-only: the swap-in's bad rate of known accounts not above the swap-out's;
 * - parcel / column: the inferred bad rates (known bads plus inferred ones, over all accounts).
 * With the policy's "must also hold at the worst case" (swapRule.worstCase) the swap-in's upper
 * bound (every unknown applicant bad) must also be at most the swap-out's lower bound (every
 * unknown applicant good).
 * Common practice, no source.
 * Cost: O(1).
 */
export function swapCriterionWithUnknowns(swap: SwapSets, policy: AdoptionPolicy, settings: Pick<AnalysisSettings, 'rejectInference'>): Criterion {
  const inference = inferenceOf(settings);
  const rate = policy.swapRule.approvalRate;
  const worstCase = policy.swapRule.worstCase ?? false;
  const under = inferenceWords(inference);
  const base = { id: 'swap-bad-rate' as const, label: `Swap-in bad rate not above swap-out (${under}${worstCase ? ', and at the worst case' : ''})` };
  const at = `at a ${percent(rate)} approval rate`;
  const { swapIn, swapOut } = swap;
  const accountsIn = swapIn.accounts ?? swapIn.count;
  const accountsOut = swapOut.accounts ?? swapOut.count;
  if (accountsIn === 0) return { ...base, met: true, detail: `${at} there is no swap-in; the swap-out is ${describe(swapOut, inference.method)}` };
  if (accountsOut === 0) return { ...base, met: false, detail: `${at} there is no swap-out to compare the swap-in (${describe(swapIn, inference.method)}) with` };
  const rateOf = (cell: SwapCell) => (inference.method === 'known-only' ? cell.badRate : (cell.inferred?.badRate ?? null));
  const rIn = rateOf(swapIn);
  const rOut = rateOf(swapOut);
  if (rIn === null || rOut === null) {
    return { ...base, met: false, detail: `${at} the ${rIn === null ? 'swap-in' : 'swap-out'} has no account with a known outcome, so its bad rate is not known (bounds ${bounds(rIn === null ? swapIn : swapOut)})` };
  }
  const centralMet = rIn <= rOut;
  const hiIn = swapIn.badRateBounds?.[1] ?? rIn;
  const loOut = swapOut.badRateBounds?.[0] ?? rOut;
  const worstMet = hiIn <= loOut;
  const met = centralMet && (!worstCase || worstMet);
  const rateWord = inference.method === 'known-only' ? 'bad rate of known outcomes' : 'inferred bad rate';
  let detail = `${at} the swap-in is ${describe(swapIn, inference.method)} and the swap-out ${describe(swapOut, inference.method)}: the swap-in ${rateWord} is ${
    centralMet ? 'not above' : 'above'
  } the swap-out's`;
  if (worstCase) {
    detail += `; at the worst case (swap-in up to ${pct(hiIn)}, swap-out down to ${pct(loOut)}) it ${worstMet ? 'still holds' : 'does not hold'}`;
  }
  return { ...base, met, detail };
}

function describe(cell: SwapCell, method: string): string {
  const accounts = cell.accounts ?? cell.count;
  const unknown = cell.unknown ?? 0;
  let text = `${count(accounts)} accounts (${count(unknown)} without an outcome), ${cell.badRate === null ? 'no known bad rate' : `${pct(cell.badRate)} bad among those with an outcome`}`;
  if (method !== 'known-only' && cell.inferred) text += `, ${cell.inferred.badRate === null ? '—' : pct(cell.inferred.badRate)} inferred`;
  if (unknown > 0) text += `, bounds ${bounds(cell)}`;
  return text;
}

function bounds(cell: SwapCell): string {
  const b = cell.badRateBounds;
  return b ? `${pct(b[0])} to ${pct(b[1])}` : '—';
}

function count(n: number): string {
  return formatCount(Math.round(n));
}

function pct(rate: number): string {
  return formatPercent(rate);
}

function percent(fraction: number): string {
  return formatShare(fraction);
}
