import { voteChoiceSchema, type Governance, type VerdictRecord as VerdictRecordBody } from '@shared/governance';
import type { Decision, Review, VerdictRecord, Vote } from '../db/entities/index';
import { iso, personRef } from './people';

/** Entities → API bodies (shared/governance.ts). Relations named here must be loaded. */

export const voteChoices = voteChoiceSchema.options;

export function presentReview(review: Review): Governance['reviews'][number] {
  return {
    id: review.id,
    outcome: review.outcome,
    findings: review.findings,
    reviewer: personRef(review.reviewer),
    runId: review.runId,
    createdAt: iso(review.createdAt),
  };
}

export function presentVote(vote: Vote): Governance['votes'][number] {
  return { id: vote.id, vote: vote.vote, comment: vote.comment, voter: personRef(vote.voter), createdAt: iso(vote.createdAt) };
}

export function presentDecision(decision: Decision): NonNullable<Governance['decision']> {
  return {
    id: decision.id,
    outcome: decision.outcome,
    rationale: decision.rationale,
    conditions: decision.conditions,
    effectiveDate: decision.effectiveDate,
    decidedBy: personRef(decision.decidedBy),
    runId: decision.runId,
    policyVersion: decision.policyVersion,
    createdAt: iso(decision.createdAt),
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
