import { voteChoiceSchema, type Governance, type VerdictRecord as VerdictRecordBody } from '@shared/governance';
import type { Decision, Review, VerdictRecord, Vote } from '../db/entities/index';
import { iso, personRef } from './people';

/** Entities → API bodies (shared/governance.ts). Relations named here must be loaded. */

/**
 * A person as named on a record: the name stored with the record when it was written (a later
 * rename does not rewrite history); records written before names were stored fall back to the
 * person's current name.
 */
export function atTheTime(person: { id: number; name: string }, storedName: string | null): { id: number; name: string } {
  return { id: person.id, name: storedName ?? personRef(person).name };
}

export const voteChoices = voteChoiceSchema.options;

export function presentReview(review: Review): Governance['reviews'][number] {
  return {
    id: review.id,
    outcome: review.outcome,
    findings: review.findings,
    reviewer: atTheTime(review.reviewer, review.reviewerName),
    runId: review.runId,
    createdAt: iso(review.createdAt),
  };
}

export function presentVote(vote: Vote): Governance['votes'][number] {
  return { id: vote.id, vote: vote.vote, comment: vote.comment, voter: atTheTime(vote.voter, vote.voterName), createdAt: iso(vote.createdAt) };
}

export function presentDecision(decision: Decision): NonNullable<Governance['decision']> {
  return {
    id: decision.id,
    outcome: decision.outcome,
    rationale: decision.rationale,
    conditions: decision.conditions,
    effectiveDate: decision.effectiveDate,
    decidedBy: atTheTime(decision.decidedBy, decision.decidedByName),
    runId: decision.runId,
    policyVersion: decision.policyVersion,
    createdAt: iso(decision.createdAt),
    tally: decision.tally,
    acknowledgedAgainstRecord: decision.acknowledgedAgainstRecord,
    strategy: decision.strategy,
  };
}

export function presentVerdictRecord(record: VerdictRecord): VerdictRecordBody {
  return {
    id: record.id,
    runId: record.runId,
    policyVersion: record.policyVersion,
    outcome: record.outcome,
    criteria: record.criteria,
    summary: record.summary,
    createdAt: iso(record.createdAt),
    createdBy: record.createdBy ? personRef(record.createdBy) : null,
  };
}
