import { formatGini } from './format';
import type { VerdictOutcome } from './report';

/**
 * Which of several challengers the product recommends (issue: one champion, several
 * challengers): among the challengers whose verdict under the adoption policy is *supported*, the
 * one with the highest Gini; a tie is broken by the lower swap-in bad rate (a challenger whose
 * swap-in bad rate is unknown loses the tie), then by the order the modeler listed them. None when
 * no challenger is supported: the champion stays. The multiplicity of looking at several
 * challengers is handled in the verdicts themselves (Holm-adjusted p), not here.
 */
export interface ChallengerCandidate {
  outcome: VerdictOutcome;
  gini: number;
  /** Bad rate of the swap-in at the policy's approval rate; null when it cannot be stated. */
  swapInBadRate: number | null;
}

export function recommendedChallenger(candidates: readonly ChallengerCandidate[]): number | null {
  let best: number | null = null;
  candidates.forEach((candidate, index) => {
    if (candidate.outcome !== 'supported') return;
    if (best === null) {
      best = index;
      return;
    }
    const incumbent = candidates[best];
    if (candidate.gini > incumbent.gini) best = index;
    else if (candidate.gini === incumbent.gini && lowerBadRate(candidate.swapInBadRate, incumbent.swapInBadRate)) best = index;
  });
  return best;
}

function lowerBadRate(a: number | null, b: number | null): boolean {
  if (a === null) return false;
  return b === null || a < b;
}

/**
 * The sentence that states the choice (report.choice.summary, verdict records): the recommended
 * challenger by name and why, or that none is supported and the champion stays.
 */
export function choiceSummary(
  candidates: readonly (ChallengerCandidate & { name: string })[],
  recommended: number | null,
  policyVersion: number,
): string {
  const under = `under the adoption policy (version ${policyVersion})`;
  if (recommended === null) {
    return candidates.length === 1
      ? `The challenger is not supported ${under}: the champion stays.`
      : `None of the ${candidates.length} challengers is supported ${under}: the champion stays.`;
  }
  const chosen = candidates[recommended];
  const supported = candidates.filter((candidate) => candidate.outcome === 'supported');
  if (supported.length === 1) {
    return candidates.length === 1 ? `${chosen.name} is recommended: it is supported ${under}.` : `${chosen.name} is recommended: the only one of the ${candidates.length} challengers supported ${under}.`;
  }
  const tied = supported.filter((candidate) => candidate !== chosen && candidate.gini === chosen.gini);
  const gini = formatGini(chosen.gini);
  const lower = tied.every((candidate) => lowerBadRate(chosen.swapInBadRate, candidate.swapInBadRate));
  const tie =
    tied.length === 0
      ? ''
      : `; tied on Gini with ${tied.map((candidate) => candidate.name).join(' and ')}, ${lower ? "its swap-in bad rate at the policy's approval rate is lower" : 'it is listed first'}`;
  return `${chosen.name} is recommended: the highest Gini (${gini} points) of the ${supported.length} challengers supported ${under}${tie}.`;
}
