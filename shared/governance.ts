import { z } from 'zod';
import { comparisonStateSchema, currentVerdictSchema } from './comparisons';
import { adoptionPolicySchema, defaultSegmentRule, segmentRuleSchema } from './policy';
import { mixedStrategyQuerySchema, mixedStrategyResultSchema } from './mixed-strategy';
import { MAX_CHALLENGERS } from './report';

/**
 * API contract for the review workflow, committee decisions, notes, the adoption policy, verdict
 * records and the audit trail (issue: governance). Wrong state → 409; wrong role, or a committee
 * member acting on a comparison they created → 403.
 */

const personRefSchema = z.object({ id: z.number().int(), name: z.string() });
/** A person as they were at an act (vote, review, decision, audit event): the name and e-mail they had then. */
const personAtTheTimeSchema = personRefSchema.extend({ email: z.string().optional() });

// --- transitions --------------------------------------------------------------------------
/** POST /api/comparisons/:id/submit (modeler): analysed → in review. Body may be empty. */
export const submitInputSchema = z.object({ message: z.string().trim().max(4000).default('') });

/** POST /api/comparisons/:id/review (analyst): in review → validated | returned. */
export const reviewInputSchema = z.object({
  outcome: z.enum(['validated', 'returned']),
  findings: z.string().trim().min(1, 'Write your findings').max(20000),
});
export type ReviewInput = z.infer<typeof reviewInputSchema>;

export const voteChoiceSchema = z.enum(['adopt', 'keep', 'defer']);
export type VoteChoice = z.infer<typeof voteChoiceSchema>;
export const voteChoiceLabels: Record<VoteChoice, string> = {
  adopt: 'Adopt the challenger',
  keep: 'Keep the champion',
  defer: 'Defer',
};

/** A challenger of a comparison by its index in the report's `challengers` (0 = the primary). */
export const challengerIndexSchema = z.number().int().min(0).max(MAX_CHALLENGERS - 1);

/** POST /api/comparisons/:id/votes (committee; state validated): one vote per person, a new vote replaces theirs. */
export const voteInputSchema = z.object({
  vote: voteChoiceSchema,
  comment: z.string().trim().max(4000).default(''),
  /**
   * With vote adopt: which challenger, by its index in the report's `challengers` (0 = the primary).
   * Absent = 0; required with adopt when the comparison has two or more challengers (409 otherwise);
   * refused (400) with keep or defer, or beyond the comparison's challengers.
   */
  challenger: challengerIndexSchema.optional(),
});
export type VoteInput = z.infer<typeof voteInputSchema>;

/** POST /api/comparisons/:id/decision (committee; state validated; quorum when the policy sets one) → decided. */
export const decisionInputSchema = z.object({
  outcome: voteChoiceSchema,
  rationale: z.string().trim().min(1, 'Record the rationale').max(20000),
  conditions: z.string().trim().max(20000).optional(),
  /** ISO date (YYYY-MM-DD) from which the decision applies. */
  effectiveDate: z.iso.date().optional(),
  /**
   * Deciding against the majority of the votes cast, or without the policy's quorum, needs this
   * explicit acknowledgement and a rationale of at least MIN_RATIONALE_AGAINST_RECORD characters.
   */
  acknowledgeAgainstRecord: z.boolean().default(false),
  /**
   * Adoption with exceptions (only with outcome adopt): the segment values that keep the champion;
   * the server computes the mixed strategy's figures on the decided run for the adopted
   * challenger (`challenger` below; its `challenger`, when given, must name the same one) and
   * stores them with it.
   */
  strategy: mixedStrategyQuerySchema.optional(),
  /**
   * With outcome adopt: which challenger is adopted, by its index in the report's `challengers`
   * (0 = the primary). Absent = 0; required with adopt when the comparison has two or more
   * challengers (409 otherwise); refused (400) with keep or defer. With two or more challengers,
   * adopting one whose verdict (the run's newest verdict record) is not "supported", or one other
   * than the challenger most adopt votes named, is a decision against the record: it needs
   * acknowledgeAgainstRecord and the longer rationale, as deciding against the votes does.
   */
  challenger: challengerIndexSchema.optional(),
});
/** The shortest rationale for a decision against the votes or without quorum (a real reason, not "x"). */
export const MIN_RATIONALE_AGAINST_RECORD = 80;
export type DecisionInput = z.infer<typeof decisionInputSchema>;

export const reviewSchema = z.object({
  id: z.number().int(),
  outcome: z.enum(['validated', 'returned']),
  findings: z.string(),
  reviewer: personAtTheTimeSchema,
  runId: z.number().int(),
  createdAt: z.string(),
});
/**
 * The model a decision (or an adopt vote) chose: the champion (keep) or one challenger (adopt),
 * with its column and name as the report gives them.
 */
export const chosenModelSchema = z.object({
  model: z.enum(['champion', 'challenger']),
  /** Index into the report's `challengers`; null for the champion. */
  challenger: z.number().int().nullable(),
  column: z.string(),
  name: z.string(),
});
export type ChosenModel = z.infer<typeof chosenModelSchema>;

export const voteSchema = z.object({
  id: z.number().int(),
  vote: voteChoiceSchema,
  /** With vote adopt: the challenger's index (0 for votes cast before several challengers); null otherwise. */
  challenger: z.number().int().nullable().default(null),
  comment: z.string(),
  voter: personAtTheTimeSchema,
  createdAt: z.string(),
});
export const decisionSchema = z.object({
  id: z.number().int(),
  outcome: voteChoiceSchema,
  rationale: z.string(),
  conditions: z.string().nullable(),
  effectiveDate: z.string().nullable(),
  decidedBy: personAtTheTimeSchema,
  runId: z.number().int(),
  policyVersion: z.number().int(),
  createdAt: z.string(),
  /** The counting votes when it was recorded; null for decisions recorded before tallies were kept. */
  tally: z.record(voteChoiceSchema, z.number().int()).nullable().default(null),
  /** The decider acknowledged deciding against the majority or without the quorum. */
  acknowledgedAgainstRecord: z.boolean().default(false),
  /** Adoption with exceptions: the mixed strategy as computed when it was decided. */
  strategy: mixedStrategyResultSchema.nullable().default(null),
  /**
   * The model the committee chose: the champion (keep) or the adopted challenger (adopt); null for
   * defer. Decisions recorded before several challengers are shown with the primary challenger
   * (adopt) or the champion (keep).
   */
  chosen: chosenModelSchema.nullable().default(null),
});

// --- verdict records ----------------------------------------------------------------------
// One challenger's verdict within a verdict record: shared/comparisons.ts (the current verdict carries them too).
export { challengerVerdictSchema, type ChallengerVerdict } from './comparisons';

/**
 * A verdict as stored: the policy version it used is pinned; a new policy never rewrites it. The
 * fields of the current verdict (shared/comparisons.ts: every challenger judged under the same
 * version, the recommended one and its sentence), with who recorded it (null: Scorecourt).
 */
export const verdictRecordSchema = currentVerdictSchema.extend({
  createdBy: personRefSchema.nullable(),
});
export type VerdictRecord = z.infer<typeof verdictRecordSchema>;
// POST /api/comparisons/:id/verdicts (analyst, committee or admin): re-evaluate the current run
// under the current policy → 201 a new verdict record.

/** GET /api/comparisons/:id/governance → everything the review & decision page needs. */
export const governanceSchema = z.object({
  state: comparisonStateSchema,
  createdBy: personRefSchema,
  reviews: z.array(reviewSchema),
  /** Votes on the current validation round. */
  votes: z.array(voteSchema),
  decision: decisionSchema.nullable(),
  verdicts: z.array(verdictRecordSchema),
  quorum: z.number().int(),
  /**
   * The adoption-policy version governing the review and decision: the one in force at the last
   * submission (the current one before the first), with its quorum above.
   */
  policyVersion: z.number().int(),
  /** The counting votes of the current round by choice. */
  tally: z.record(voteChoiceSchema, z.number().int()),
  /** The choice with strictly the most votes, or null (no votes, or a tie). */
  majority: voteChoiceSchema.nullable(),
  /** Adopt votes of the current round per challenger (index into the report's `challengers`); one entry per challenger. */
  adoptVotesByChallenger: z.array(z.number().int()).default([]),
  /**
   * The people who shaped the evidence — created the comparison, uploaded one of its holdouts or
   * set up one of its analyses. The four-eyes rule bars them from reviewing, voting on or deciding it.
   */
  authors: z.array(personRefSchema),
});
export type Governance = z.infer<typeof governanceSchema>;

// --- notes --------------------------------------------------------------------------------
/** Where a note is attached: the general discussion, or one of the swap sets (policy annotations). */
export const noteAnchorSchema = z.enum(['discussion', 'swap-in', 'swap-out', 'both-accept', 'both-reject', 'swap-matrix']);
/** GET /api/comparisons/:id/notes; POST (any signed-in person; swap anchors: policy role). */
export const noteInputSchema = z.object({
  anchor: noteAnchorSchema.default('discussion'),
  body: z.string().trim().min(1, 'Write something').max(8000),
  scenarioId: z.number().int().nullable().default(null),
});
export type NoteInput = z.infer<typeof noteInputSchema>;
export const noteSchema = z.object({
  id: z.number().int(),
  anchor: noteAnchorSchema,
  body: z.string(),
  scenarioId: z.number().int().nullable(),
  author: personRefSchema,
  createdAt: z.string(),
  /** Written after the committee's decision: not part of what it saw. */
  afterDecision: z.boolean().default(false),
});
export type Note = z.infer<typeof noteSchema>;

// --- adoption policy ----------------------------------------------------------------------
/** GET /api/policy (signed in) → the current version; PUT (admin) with the fields but `version` → a new version. */
export const policyInputSchema = adoptionPolicySchema.omit({ version: true }).extend({
  /** A new version gets the segment rule on unless the input says otherwise. */
  segmentRule: segmentRuleSchema.default(defaultSegmentRule),
});
export type PolicyInput = z.infer<typeof policyInputSchema>;
/** The body of PUT /api/policy: the new fields and why they change (kept with the version). */
export const policyUpdateSchema = policyInputSchema.extend({
  reason: z.string().trim().min(1, 'Say why the policy changes').max(4000),
});
export type PolicyUpdate = z.infer<typeof policyUpdateSchema>;
export const policyVersionSchema = z.object({
  policy: adoptionPolicySchema,
  createdBy: personRefSchema.nullable(),
  createdAt: z.string(),
  /** Why the admin changed it. */
  reason: z.string(),
});
export type PolicyVersion = z.infer<typeof policyVersionSchema>;
/** GET /api/policy/versions → every version, newest first. */
export const policyVersionsSchema = z.object({ versions: z.array(policyVersionSchema) });

// --- audit --------------------------------------------------------------------------------
export const auditEventSchema = z.object({
  id: z.number().int(),
  /** Who acted, with the name and e-mail they had at the act. */
  actor: personAtTheTimeSchema.nullable(),
  action: z.string(),
  targetType: z.string(),
  targetId: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
  createdAt: z.string(),
  hash: z.string(),
  prevHash: z.string().nullable(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
/** GET /api/comparisons/:id/audit?after&limit → the comparison's events in order, a page at a time, and whether the chain verifies. */
export const auditTrailSchema = z.object({
  events: z.array(auditEventSchema),
  chainValid: z.boolean(),
  /** Paged (shared/paging.ts): the id to ask `after` for the next page, null on the last. */
  nextAfter: z.number().int().nullable().optional(),
});

// GET /api/comparisons/:id/evidence.json → the evidence pack: report, settings, hashes, verdicts,
// reviews, votes, decision and the audit trail, as one JSON download.
