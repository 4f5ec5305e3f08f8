import { type Governance } from '@shared/governance';

/**
 * Who the server e-mails after a decision (server/governance/service.ts recordDecision): everyone
 * on the record — the authors (creator, uploaders, set-up people, submitters), the reviewers and
 * the voters — except the decider; names as the record holds them, each once, in that order.
 */
export function decisionRecipients(governance: Pick<Governance, 'authors' | 'reviews' | 'votes'>, deciderId: number): string[] {
  const names = new Map<number, string>();
  for (const person of [...governance.authors, ...governance.reviews.map((review) => review.reviewer), ...governance.votes.map((vote) => vote.voter)]) {
    if (person.id !== deciderId && !names.has(person.id)) names.set(person.id, person.name);
  }
  return [...names.values()];
}
