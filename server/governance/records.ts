import { In, type DataSource, type EntityManager } from 'typeorm';
import { AnalysisRun, Review, User, Vote } from '../db/entities/index';
import { forbidden } from '../errors';

/** Look-ups and rules the governance steps share. */

type Source = DataSource | EntityManager;

/** The authors as people, in id order (for the review page). */
export async function authorRefs(source: Source, authors: ReadonlySet<number>): Promise<{ id: number; name: string }[]> {
  const people = await source.getRepository(User).find({ where: { id: In([...authors]) }, select: { id: true, name: true }, order: { id: 'ASC' } });
  return people.map((person) => ({ id: person.id, name: person.name }));
}

export function forbidOwn(authors: ReadonlySet<number>, user: { id: number }, step: 'review' | 'vote on' | 'decide'): void {
  if (authors.has(user.id)) {
    throw forbidden(
      `You created this comparison, uploaded one of its holdouts, set up one of its analyses or submitted it, so you cannot ${step} it: someone else must (four-eyes rule).`,
    );
  }
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
