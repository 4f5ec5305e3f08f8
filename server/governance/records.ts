import { comparisonStateLabels, type ComparisonState } from '@shared/comparisons';
import { In, type DataSource, type EntityManager } from 'typeorm';
import { findComparison } from '../comparisons/service';
export { authorsOf } from '../comparisons/authors';
import { AnalysisRun, Review, User, Vote, type Comparison } from '../db/entities/index';
import { conflict, forbidden } from '../errors';

/** Look-ups and rules the governance steps share. */

type Source = DataSource | EntityManager;

/** The comparison with its creator and holdout (for the four-eyes rule), or 404. */
export function loadComparison(source: Source, id: number): Promise<Comparison> {
  return findComparison(source, id);
}

/** The authors as people, in id order (for the review page). */
export async function authorRefs(source: Source, authors: ReadonlySet<number>): Promise<{ id: number; name: string }[]> {
  const people = await source.getRepository(User).find({ where: { id: In([...authors]) }, select: { id: true, name: true }, order: { id: 'ASC' } });
  return people.map((person) => ({ id: person.id, name: person.name }));
}

export function forbidOwn(authors: ReadonlySet<number>, user: { id: number }, step: 'review' | 'vote on' | 'decide'): void {
  if (authors.has(user.id)) {
    throw forbidden(
      `You created this comparison, uploaded its holdout or set up one of its analyses, so you cannot ${step} it: someone else must (four-eyes rule).`,
    );
  }
}

/** A 409 in the words `transition()` uses, for steps that need a state but do not change it. */
export function requireState(comparison: Comparison, allowed: readonly ComparisonState[]): void {
  if (allowed.includes(comparison.state)) return;
  const wanted = allowed.map((state) => comparisonStateLabels[state].toLowerCase()).join(' or ');
  throw conflict(`This comparison is ${comparisonStateLabels[comparison.state].toLowerCase()}; this step needs it ${wanted}.`, {
    state: comparison.state,
    allowedFrom: allowed,
  });
}

/** The newest run of a comparison, whatever its status. */
export function newestRun(source: Source, comparisonId: number): Promise<AnalysisRun | null> {
  return source.getRepository(AnalysisRun).findOne({ where: { comparisonId }, order: { id: 'DESC' } });
}

/** The newest review, or null. */
export function latestReview(source: Source, comparisonId: number): Promise<Review | null> {
  return source.getRepository(Review).findOne({ where: { comparisonId }, order: { id: 'DESC' } });
}

/** The validating review that opened the current round of votes (the newest review, when it validated). */
export async function currentRound(source: Source, comparisonId: number): Promise<Review | null> {
  const review = await latestReview(source, comparisonId);
  return review?.outcome === 'validated' ? review : null;
}

/** The votes that count in a round: each voter's newest, in the order they were first cast. */
export async function countingVotes(source: Source, reviewId: number): Promise<Vote[]> {
  const all = await source.getRepository(Vote).find({ where: { reviewId }, order: { id: 'ASC' }, relations: { voter: true } });
  const byVoter = new Map<number, Vote>();
  for (const vote of all) byVoter.set(vote.voterId, vote);
  const firstCast = new Map<number, number>();
  for (const vote of all) if (!firstCast.has(vote.voterId)) firstCast.set(vote.voterId, vote.id);
  return [...byVoter.values()].sort((a, b) => firstCast.get(a.voterId)! - firstCast.get(b.voterId)!);
}
