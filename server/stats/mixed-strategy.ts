import type { MixedStrategyResult, SegmentValueRef, StrategyBook, StrategyWithSwaps } from '@shared/mixed-strategy';
import { locateCutoff } from './cutoffs';
import type { SegmentColumn } from './holdout';
import type { PreparedHoldout } from './policy-data';

/**
 * Conditional adoption ("adopt, except for brokered cards"): the challenger decides every account
 * except those in the kept segment values, which the champion decides. Both cut-offs are the ones
 * each model has at the approval rate on the whole holdout (tie rule of cutoffs.ts), so the pure
 * adoption here is the report's swap sets at that rate; an account is approved by the mixed
 * strategy when it is in a kept value and on the safe side of the champion's cut-off, or outside
 * the kept values and on the safe side of the challenger's. Figures: for the champion, pure
 * adoption and the mixed strategy, accounts approved, known bads approved, approval rate and bad
 * rate; for pure and mixed, the swap-in (champion declines, the strategy approves) and swap-out
 * (champion approves, the strategy declines) with their bad rates; the same per value of every
 * segment column. An account in more than one kept value is kept once.
 * With weights and applicants without an outcome: accounts are summed weights; bads and bad rates
 * are of the accounts with a known outcome; when the run infers the unknown applicants' bads
 * (parcel or column, reject-inference.ts) each such account also counts w·p inferred bads, and
 * `inferredBadRate` = (known bads + inferred bads) / accounts, as the swap cells' inferred rate.
 * Common practice, no source.
 * Cost: O(n · (segment columns + kept values)) on prepared data, one pass.
 */

/** The kept values as a per-account mask, and the references that name no value of the holdout. */
export function resolveKept(segments: readonly SegmentColumn[], refs: readonly SegmentValueRef[], n: number): { kept: Uint8Array; unknown: SegmentValueRef[] } {
  const kept = new Uint8Array(n);
  const unknown: SegmentValueRef[] = [];
  for (const ref of refs) {
    const segment = segments.find((candidate) => candidate.column === ref.column);
    const code = segment ? segment.levels.indexOf(ref.value) : -1;
    if (!segment || code < 0) {
      unknown.push(ref);
      continue;
    }
    const { codes } = segment;
    for (let i = 0; i < n; i++) if (codes[i] === code) kept[i] = 1;
  }
  return { kept, unknown };
}

/** Sums for one group: [accounts, champion accepted, bads, known] and the same for pure and mixed with their swaps. */
class Tally {
  accounts = 0;
  readonly champion = { accepted: 0, bads: 0, known: 0, inferred: 0 };
  readonly pure = newStrategySums();
  readonly mixed = newStrategySums();

  /** `inferred`: the account's bads with inference (w·bad when known, w·p when not). */
  add(w: number, known: boolean, bad: boolean, inferred: number, champion: boolean, pure: boolean, mixed: boolean): void {
    this.accounts += w;
    const k = known ? w : 0;
    const b = known && bad ? w : 0;
    if (champion) {
      this.champion.accepted += w;
      this.champion.known += k;
      this.champion.bads += b;
      this.champion.inferred += inferred;
    }
    addStrategy(this.pure, w, k, b, inferred, champion, pure);
    addStrategy(this.mixed, w, k, b, inferred, champion, mixed);
  }
}

function newStrategySums() {
  return { accepted: 0, bads: 0, known: 0, inferred: 0, inCount: 0, inBads: 0, inKnown: 0, inInferred: 0, outCount: 0, outBads: 0, outKnown: 0, outInferred: 0 };
}

function addStrategy(sums: Tally['pure'], w: number, k: number, b: number, inferred: number, champion: boolean, accepted: boolean): void {
  if (accepted) {
    sums.accepted += w;
    sums.known += k;
    sums.bads += b;
    sums.inferred += inferred;
    if (!champion) {
      sums.inCount += w;
      sums.inKnown += k;
      sums.inBads += b;
      sums.inInferred += inferred;
    }
  } else if (champion) {
    sums.outCount += w;
    sums.outKnown += k;
    sums.outBads += b;
    sums.outInferred += inferred;
  }
}

const rate = (part: number, whole: number): number | null => (whole > 0 ? part / whole : null);

/** The inferred rate, only when the run infers (otherwise the field is absent and plain reports look as before). */
const inferredRate = (inferring: boolean, inferred: number, accounts: number) => (inferring ? { inferredBadRate: rate(inferred, accounts) } : {});

function book(sums: { accepted: number; bads: number; known: number; inferred: number }, accounts: number, inferring: boolean): StrategyBook {
  return {
    accepted: sums.accepted,
    bads: sums.bads,
    approvalRate: rate(sums.accepted, accounts),
    badRate: rate(sums.bads, sums.known),
    ...inferredRate(inferring, sums.inferred, sums.accepted),
  };
}

function withSwaps(sums: Tally['pure'], accounts: number, inferring: boolean): StrategyWithSwaps {
  return {
    ...book(sums, accounts, inferring),
    swapIn: { count: sums.inCount, bads: sums.inBads, badRate: rate(sums.inBads, sums.inKnown), ...inferredRate(inferring, sums.inInferred, sums.inCount) },
    swapOut: { count: sums.outCount, bads: sums.outBads, badRate: rate(sums.outBads, sums.outKnown), ...inferredRate(inferring, sums.outInferred, sums.outCount) },
  };
}

export function mixedStrategy(data: PreparedHoldout, approvalRate: number, keepChampion: readonly SegmentValueRef[]): MixedStrategyResult {
  if (!(approvalRate > 0 && approvalRate < 1)) throw new Error(`approval rate must be between 0 and 1, got ${approvalRate}`);
  const { n, segments, weight, known, bad } = data;
  const { kept, unknown } = resolveKept(segments, keepChampion, n);
  if (unknown.length > 0) throw new Error(`no such segment value: ${unknown.map((ref) => `${ref.column} = ${ref.value}`).join(', ')}`);
  const champion = locateCutoff(data.champion, { approvalRate });
  const challenger = locateCutoff(data.challenger, { approvalRate });
  const championSafety = data.champion.safety;
  const challengerSafety = data.challenger.safety;

  const inference = data.inferred;
  const inferring = inference !== null;
  const total = new Tally();
  const bySegment = segments.map((segment) => segment.levels.map(() => new Tally()));
  let keptAccounts = 0;
  for (let i = 0; i < n; i++) {
    const w = weight === null ? 1 : weight[i];
    const isKnown = known === null || known[i] === 1;
    const isBad = bad[i] === 1;
    const byChampion = championSafety[i] >= champion.safetyCut;
    const byChallenger = challengerSafety[i] >= challenger.safetyCut;
    const byMixed = kept[i] ? byChampion : byChallenger;
    if (kept[i]) keptAccounts += w;
    const inferred = !inferring ? 0 : isKnown ? (isBad ? w : 0) : w * inference.probability[i];
    total.add(w, isKnown, isBad, inferred, byChampion, byChallenger, byMixed);
    for (let s = 0; s < segments.length; s++) bySegment[s][segments[s].codes[i]].add(w, isKnown, isBad, inferred, byChampion, byChallenger, byMixed);
  }

  const isKept = (column: string, value: string) => keepChampion.some((ref) => ref.column === column && ref.value === value);
  return {
    approvalRate,
    cutoffs: { champion: champion.position.cutoff, challenger: challenger.position.cutoff },
    keepChampion: keepChampion.map((ref) => ({ column: ref.column, value: ref.value })),
    keptAccounts,
    accounts: total.accounts,
    ...(inferring ? { inference: inference.method } : {}),
    champion: book(total.champion, total.accounts, inferring),
    pure: withSwaps(total.pure, total.accounts, inferring),
    mixed: withSwaps(total.mixed, total.accounts, inferring),
    bySegment: segments.flatMap((segment, s) =>
      segment.levels
        .map((value, code) => ({ value, tally: bySegment[s][code] }))
        .filter(({ tally }) => tally.accounts > 0)
        .map(({ value, tally }) => ({
          column: segment.column,
          value,
          kept: isKept(segment.column, value),
          accounts: tally.accounts,
          champion: book(tally.champion, tally.accounts, inferring),
          mixed: withSwaps(tally.mixed, tally.accounts, inferring),
        })),
    ),
  };
}
