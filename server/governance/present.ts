import { type ChosenModel, voteChoiceSchema, type Governance, type VerdictRecord as VerdictRecordBody } from '@shared/governance';
import { championOf, challengersOf, type ColumnMapping } from '@shared/report';
import { presentCurrentVerdict } from '../comparisons/current-verdict';
import type { Decision, Review, VerdictRecord, Vote } from '../db/entities/index';
import { iso, personRef } from './people';

/** Entities → API bodies (shared/governance.ts). Relations named here must be loaded. */

/**
 * A person as named on a record: the name stored with the record when it was written (a later
 * rename does not rewrite history); records written before names were stored fall back to the
 * person's current name.
 */
/** The person as they were at the act: the stored name and e-mail, or (records from before they were kept) the current ones. */
export function atTheTime(person: { id: number; name: string; email?: string }, storedName: string | null, storedEmail: string | null): { id: number; name: string; email?: string } {
  const email = storedEmail ?? person.email;
  return { id: person.id, name: storedName ?? personRef(person).name, ...(email === undefined ? {} : { email }) };
}

export const voteChoices = voteChoiceSchema.options;

export function presentReview(review: Review): Governance['reviews'][number] {
  return {
    id: review.id,
    outcome: review.outcome,
    findings: review.findings,
    reviewer: atTheTime(review.reviewer, review.reviewerName, review.reviewerEmail),
    runId: review.runId,
    createdAt: iso(review.createdAt),
  };
}

export function presentVote(vote: Vote): Governance['votes'][number] {
  return {
    id: vote.id,
    vote: vote.vote,
    // Adopt votes cast before several challengers were for the one challenger (index 0).
    challenger: vote.vote === 'adopt' ? (vote.challenger ?? 0) : null,
    comment: vote.comment,
    voter: atTheTime(vote.voter, vote.voterName, vote.voterEmail),
    createdAt: iso(vote.createdAt),
  };
}

/**
 * The model a decision chose: as stored, or — decisions recorded before several challengers —
 * the champion (keep) or the one challenger (adopt) of the decided run's mapping; null for defer.
 */
export function chosenOf(decision: Pick<Decision, 'outcome' | 'chosen'>, mapping: ColumnMapping | null): ChosenModel | null {
  if (decision.chosen) return decision.chosen;
  if (decision.outcome === 'defer' || mapping === null) return null;
  return chosenModel(mapping, decision.outcome === 'adopt' ? 0 : null);
}

/** The champion (index null) or challenger `index` of a mapping, as a decision names it. */
export function chosenModel(mapping: ColumnMapping, index: number | null): ChosenModel {
  if (index === null) {
    const champion = championOf(mapping);
    return { model: 'champion', challenger: null, column: champion.column, name: champion.name };
  }
  const challenger = challengersOf(mapping)[index];
  return { model: 'challenger', challenger: index, column: challenger.column, name: challenger.name };
}

export function presentDecision(decision: Decision, mapping: ColumnMapping | null = null): NonNullable<Governance['decision']> {
  return {
    id: decision.id,
    outcome: decision.outcome,
    rationale: decision.rationale,
    conditions: decision.conditions,
    effectiveDate: decision.effectiveDate,
    decidedBy: atTheTime(decision.decidedBy, decision.decidedByName, decision.decidedByEmail),
    runId: decision.runId,
    policyVersion: decision.policyVersion,
    createdAt: iso(decision.createdAt),
    tally: decision.tally,
    acknowledgedAgainstRecord: decision.acknowledgedAgainstRecord,
    strategy: decision.strategy,
    chosen: chosenOf(decision, mapping),
  };
}

/** A verdict record as the API shows it: as the current verdict is shown (comparisons/current-verdict.ts), with who recorded it. */
export function presentVerdictRecord(record: VerdictRecord): VerdictRecordBody {
  return { ...presentCurrentVerdict(record), createdBy: record.createdBy ? personRef(record.createdBy) : null };
}
