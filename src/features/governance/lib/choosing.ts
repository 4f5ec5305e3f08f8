import { verdictOutcomeLabels } from '@shared/challengers-words';
import { type Report, type VerdictOutcome } from '@shared/report';

/**
 * Choosing among several challengers in the committee's forms: the challengers to choose from (with
 * their verdicts and the recommended one), the challenger most adopt votes named, and why an
 * adoption goes against the record. Pure, for the vote and decision forms and their tests. With
 * one challenger there is nothing to choose: `challengerOptions` is empty and the forms read as
 * they always did.
 */
export interface ChallengerOption {
  index: number;
  name: string;
  outcome: VerdictOutcome;
  recommended: boolean;
}

/** The challengers a vote or decision can name; empty with one challenger. */
export function challengerOptions(report: Pick<Report, 'challengers' | 'choice'>): ChallengerOption[] {
  const challengers = report.challengers ?? [];
  if (challengers.length < 2) return [];
  return challengers.map((challenger, index) => ({
    index,
    name: challenger.name,
    outcome: challenger.verdict.outcome,
    recommended: report.choice?.recommended === index,
  }));
}

/** The option's label in a radio list: its name, verdict, adopt votes and whether it is recommended. */
export function optionLabel(option: ChallengerOption, adoptVotes?: number): string {
  const votes = adoptVotes === undefined ? '' : ` — ${adoptVotes} adopt ${adoptVotes === 1 ? 'vote' : 'votes'}`;
  return `${option.name} (${verdictOutcomeLabels[option.outcome].toLowerCase()}${option.recommended ? ', recommended' : ''})${votes}`;
}

/** The challenger strictly most adopt votes named; null with no adopt vote or a tie. */
export function mostNamedChallenger(adoptVotesByChallenger: readonly number[]): number | null {
  let best: number | null = null;
  let tie = false;
  adoptVotesByChallenger.forEach((votes, index) => {
    if (votes <= 0) return;
    if (best === null || votes > adoptVotesByChallenger[best]!) {
      best = index;
      tie = false;
    } else if (votes === adoptVotesByChallenger[best]) tie = true;
  });
  return tie ? null : best;
}

/**
 * Why adopting `challenger` goes against the record with several challengers (the server's rule:
 * its verdict is not supported, or it is not the challenger most adopt votes named). Empty when it
 * does not.
 */
export function adoptionAgainstRecord(options: readonly ChallengerOption[], adoptVotesByChallenger: readonly number[], challenger: number | undefined): string[] {
  if (options.length < 2 || challenger === undefined) return [];
  const option = options[challenger];
  if (!option) return [];
  const reasons: string[] = [];
  if (option.outcome !== 'supported') reasons.push(`${option.name}'s verdict is “${verdictOutcomeLabels[option.outcome].toLowerCase()}”, not supported.`);
  const named = mostNamedChallenger(adoptVotesByChallenger);
  if (named !== challenger) {
    reasons.push(
      named === null
        ? `No challenger has strictly the most adopt votes.`
        : `The adopt votes named ${options[named]?.name ?? `challenger ${named + 1}`} most often.`,
    );
  }
  return reasons;
}
