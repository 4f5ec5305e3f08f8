import { MIN_RATIONALE_AGAINST_RECORD, voteChoiceLabels, type DecisionInput, type Governance, type ReviewInput, type VoteChoice, type VoteInput } from '@shared/governance';
import type { ComparisonState } from '@shared/comparisons';
import { errorCodes } from '@shared/errors';
import type { MixedStrategyResult } from '@shared/mixed-strategy';
import { actingRoles, workflowSteps } from '@shared/workflow';
import { In, type EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { authorsOf } from '../comparisons/authors';
import { creatorOf } from '../comparisons/people';
import { currentVerdict, findComparison } from '../comparisons/service';
import { requireState, transition } from '../comparisons/state';
import type { AppContext } from '../context';
import { AnalysisRun, Comparison, Decision, Review, User, VerdictRecord, Vote } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { AppError, conflict } from '../errors';
import { mixedStrategyOnRun } from '../comparisons/mixed-strategy';
import type { OutgoingMail } from '../mail/mailer';
import { decideWithPack } from '../pack/service';
import { packLink } from '../pack/links';
import { currentPolicy, governingPolicy } from '../policy/service';
import { activeUsersWithRole } from '../users/service';
import { comparisonLink } from './links';
import { decidedMail, returnedMail, submittedMail, validatedMail } from './mail';
import { chosenModel, presentDecision, presentReview, presentVerdictRecord, presentVote, voteChoices } from './present';
import { challengersOf, type VerdictOutcome } from '@shared/report';
import { type ChoiceInWords, noSuchChallengerMessage } from '@shared/challengers-words';
import { authorRefs, countingVotes, currentRound, forbidOwn, latestReview, newestRun } from './records';

/**
 * The review workflow (docs/design.md "Workflow and roles"): submit (modeler), review (analyst),
 * votes and the decision (committee). Each step runs in one transaction: its checks, its record,
 * the state change through `transition()` with its audit event, and the e-mails to the people
 * who act next (queued in the outbox in the same transaction, delivered after it commits).
 *
 * Order of the checks: the route's role guard (403), the comparison exists (404), the four-eyes
 * rule — whoever created the comparison or uploaded its holdout cannot review, vote on or decide
 * it (403) —, then the state (409), then the step's own conditions (409).
 */

/** Active people holding a role that acts in `state` (shared/workflow.ts), except `excluded`. */
async function activeUsersActingIn(manager: EntityManager, state: ComparisonState, excluded: ReadonlySet<number>): Promise<User[]> {
  const roles = actingRoles[state];
  const people = await manager.getRepository(User).find({ where: { active: true }, order: { id: 'ASC' } });
  return people.filter((person) => !excluded.has(person.id) && person.roles.some((role) => roles.includes(role)));
}

async function queueAll(ctx: AppContext, manager: EntityManager, mails: OutgoingMail[]): Promise<void> {
  for (const mail of mails) await ctx.mailer.queue(manager, mail);
}

/** analysed → in review, or returned → in review after a new analysis run. */
export async function submitComparison(ctx: AppContext, actor: User, id: number, input: { message: string }): Promise<Governance> {
  await inTransaction(ctx.dataSource, async (manager) => {
    const comparison = await findComparison(manager, id);
    requireState(comparison, workflowSteps.submit.from);
    const run = await newestRun(manager, id);
    if (!run || run.status !== 'done') {
      throw conflict(
        run
          ? `The newest analysis of this comparison is ${run.status}; submit it once an analysis has finished.`
          : 'This comparison has no analysis yet.',
        { latestRun: run ? { id: run.id, status: run.status } : null },
      );
    }
    if (comparison.state === 'returned') {
      const returned = await latestReview(manager, id);
      if (returned && run.id <= returned.runId) {
        throw conflict(
          'The analyst returned this comparison on its current analysis. Change the holdout, mapping or settings and run the analysis again before submitting it once more.',
          { returnedRunId: returned.runId, currentRunId: run.id },
        );
      }
    }
    // The policy in force now governs the review and the decision until the next submission.
    const policy = await currentPolicy(manager);
    await transition(manager, comparison, workflowSteps.submit.from, 'in-review', {
      actor,
      action: 'comparison.submitted',
      details: { runId: run.id, message: input.message, policyVersion: policy.version },
    });
    await manager.getRepository(Comparison).update({ id }, { governingPolicyVersion: policy.version });
    const link = comparisonLink(ctx.config.publicUrl, id, 'review');
    const authors = await authorsOf(manager, comparison);
    // Whoever acts in review: the analysts and the policy role (shared/workflow.ts), not the authors.
    const analysts = await activeUsersActingIn(manager, 'in-review', authors);
    const choice = await currentChoice(manager, id);
    await queueAll(
      ctx,
      manager,
      analysts.map((person) =>
        submittedMail({
          to: person.email,
          name: person.name,
          comparison: comparison.name,
          link,
          submittedBy: actor.name,
          message: input.message,
          headline: run.headline,
          choice,
        }),
      ),
    );
  });
  ctx.mailer.kick();
  return getGovernance(ctx, id);
}

/** The choice among several challengers in the verdict record the comparison shows (its e-mails name the recommended one). */
async function currentChoice(manager: EntityManager, comparisonId: number): Promise<ChoiceInWords | null> {
  const shown = await currentVerdict(manager, comparisonId);
  return shown && { challengers: shown.challengers, recommended: shown.recommended, summary: shown.choiceSummary };
}

/** in review → validated or returned, with the analyst's findings on the current run. */
export async function reviewComparison(ctx: AppContext, actor: User, id: number, input: ReviewInput): Promise<Governance> {
  await inTransaction(ctx.dataSource, async (manager) => {
    const comparison = await findComparison(manager, id);
    const authors = await authorsOf(manager, comparison);
    forbidOwn(authors, actor, 'review');
    requireState(comparison, workflowSteps.validate.from);
    const run = await newestRun(manager, id);
    // Set-up is refused while in review, so the newest run is the done run that was submitted.
    if (!run || run.status !== 'done') throw new Error(`comparison ${id} is in review without a finished run`);
    const review = await manager.getRepository(Review).save(
      manager.getRepository(Review).create({
        comparisonId: id,
        runId: run.id,
        outcome: input.outcome,
        findings: input.findings,
        reviewerId: actor.id,
        reviewerName: actor.name,
        reviewerEmail: actor.email,
        createdAt: now(),
      }),
    );
    await transition(manager, comparison, workflowSteps[input.outcome === 'validated' ? 'validate' : 'return'].from, input.outcome, {
      actor,
      action: input.outcome === 'validated' ? 'comparison.validated' : 'comparison.returned',
      details: { reviewId: review.id, runId: run.id, findings: input.findings },
    });
    if (input.outcome === 'validated') {
      const { quorum } = await governingPolicy(manager, comparison);
      const link = comparisonLink(ctx.config.publicUrl, id, 'review');
      const committee = (await activeUsersWithRole(manager, 'committee')).filter((person) => !authors.has(person.id));
      const choice = await currentChoice(manager, id);
      await queueAll(
        ctx,
        manager,
        committee.map((person) =>
          validatedMail({ to: person.email, name: person.name, comparison: comparison.name, link, reviewer: actor.name, findings: input.findings, quorum, pack: packLink(ctx.config.publicUrl, id), choice }),
        ),
      );
    } else {
      const link = comparisonLink(ctx.config.publicUrl, id, 'review');
      await queueAll(
        ctx,
        manager,
        (await creatorOf(manager, comparison)).map((person) =>
          returnedMail({ to: person.email, name: person.name, comparison: comparison.name, link, reviewer: actor.name, findings: input.findings }),
        ),
      );
    }
  });
  ctx.mailer.kick();
  return getGovernance(ctx, id);
}

/** A committee member's vote in the current validation round; a second vote replaces their first. */
export async function castVote(ctx: AppContext, actor: User, id: number, input: VoteInput): Promise<Governance> {
  await inTransaction(ctx.dataSource, async (manager) => {
    const comparison = await findComparison(manager, id);
    forbidOwn(await authorsOf(manager, comparison), actor, 'vote on');
    requireState(comparison, workflowSteps.vote.from);
    const round = await currentRound(manager, id);
    if (!round) throw new Error(`comparison ${id} is validated without a validating review`);
    const challenger = await challengerChosen(manager, round.runId, input.vote, input.challenger, 'vote');
    const previous = await manager.getRepository(Vote).findOne({ where: { reviewId: round.id, voterId: actor.id }, order: { id: 'DESC' } });
    const vote = await manager.getRepository(Vote).save(
      manager.getRepository(Vote).create({
        comparisonId: id,
        reviewId: round.id,
        voterId: actor.id,
        voterName: actor.name,
        voterEmail: actor.email,
        vote: input.vote,
        challenger: challenger?.challenger ?? null,
        comment: input.comment,
        replacesId: previous?.id ?? null,
        createdAt: now(),
      }),
    );
    await recordAudit(manager, {
      actor,
      action: previous ? 'vote.changed' : 'vote.cast',
      target: { type: 'comparison', id },
      details: {
        voteId: vote.id,
        reviewId: round.id,
        vote: input.vote,
        ...(challenger ? { challenger: challenger.challenger, challengerName: challenger.name } : {}),
        comment: input.comment,
        ...(previous ? { replacesVoteId: previous.id, previousVote: previous.vote } : {}),
      },
    });
  });
  return getGovernance(ctx, id);
}

/** validated → decided: the committee's decision, once the policy's quorum of votes is reached. */
export async function recordDecision(ctx: AppContext, actor: User, id: number, input: DecisionInput): Promise<Governance> {
  // Adoption with exceptions: the mixed strategy is computed on the decided run before the
  // transaction (preparing a run can take a worker thread), after the same checks, in the same
  // order, as inside it; the transaction then checks the run has not changed.
  let strategy: MixedStrategyResult | null = null;
  if (input.strategy) {
    const comparison = await findComparison(ctx.dataSource, id);
    forbidOwn(await authorsOf(ctx.dataSource, comparison), actor, 'decide');
    requireState(comparison, workflowSteps.decide.from);
    if (input.outcome !== 'adopt') {
      throw new AppError(errorCodes.badInput, `Only an adoption can keep the champion in some segment values; this decision is “${voteChoiceLabels[input.outcome]}”.`, 400);
    }
    // The strategy is the adopted challenger's; a strategy naming another one is refused.
    if (input.strategy.challenger !== undefined && input.strategy.challenger !== (input.challenger ?? 0)) {
      throw new AppError(
        errorCodes.badInput,
        `The exceptions by segment were computed for challenger ${input.strategy.challenger} but the decision adopts challenger ${input.challenger ?? 0}; compute them for the challenger adopted.`,
        400,
      );
    }
    const round = await currentRound(ctx.dataSource, id);
    const run = round ? await ctx.dataSource.getRepository(AnalysisRun).findOneBy({ id: round.runId }) : null;
    if (!run) throw new Error(`comparison ${id} is validated without a validated run`);
    strategy = await mixedStrategyOnRun(ctx, run, { ...input.strategy, challenger: input.challenger ?? 0 });
  }
  // The decision and its pack in one transaction; the pack laid out outside it (pack/service.ts, decideWithPack).
  await decideWithPack(ctx, id, actor, async (manager, archive) => {
    const comparison = await findComparison(manager, id);
    forbidOwn(await authorsOf(manager, comparison), actor, 'decide');
    requireState(comparison, workflowSteps.decide.from);
    const round = await currentRound(manager, id);
    if (!round) throw new Error(`comparison ${id} is validated without a validating review`);
    if (strategy && strategy.runId !== round.runId) throw conflict('The validated run changed while the mixed strategy was computed; record the decision again.');
    const policy = await governingPolicy(manager, comparison);
    const votes = await countingVotes(manager, round.id);
    const tally = tallyOf(votes);
    const majority = majorityOf(tally);
    const withoutQuorum = policy.quorum > 0 && votes.length < policy.quorum;
    const againstMajority = majority !== input.outcome;
    const run = await manager.getRepository(AnalysisRun).findOneOrFail({ where: { id: round.runId }, select: { id: true, mapping: true } });
    const chosenChallenger = await challengerChosen(manager, round.runId, input.outcome, input.challenger, 'decision');
    const chosen = input.outcome === 'defer' ? null : chosenModel(run.mapping, chosenChallenger?.challenger ?? null);
    // Several challengers: adopting one the verdict does not support, or one other than the adopt
    // votes name most often, is a decision against the record too (one challenger: as before).
    const againstChoice = chosenChallenger === null ? [] : await againstTheChoice(manager, round.runId, chosenChallenger, votes);
    if (withoutQuorum || againstMajority || againstChoice.length > 0) {
      const why = [
        withoutQuorum
          ? `the adoption policy (version ${policy.version}) needs ${policy.quorum} committee ${policy.quorum === 1 ? 'vote' : 'votes'} and ${votes.length === 0 ? 'none has' : votes.length === 1 ? 'one has' : `${votes.length} have`} been cast`
          : null,
        againstMajority
          ? majority === null
            ? `the votes cast (${tallyText(tally)}) show no majority for “${voteChoiceLabels[input.outcome]}”`
            : `the majority of the votes cast (${tallyText(tally)}) is “${voteChoiceLabels[majority]}”`
          : null,
        ...againstChoice,
      ].filter((part) => part !== null);
      if (!input.acknowledgeAgainstRecord) {
        throw conflict(`This decision goes against the record: ${why.join('; ')}. Acknowledge that explicitly and give the reason in the rationale.`, {
          quorum: policy.quorum,
          votes: votes.length,
          tally,
          majority,
        });
      }
      if (input.rationale.length < MIN_RATIONALE_AGAINST_RECORD) {
        throw conflict(
          `A decision against the record (${why.join('; ')}) needs a rationale of at least ${MIN_RATIONALE_AGAINST_RECORD} characters that says why; this one has ${input.rationale.length}.`,
          { minimum: MIN_RATIONALE_AGAINST_RECORD },
        );
      }
    }
    const verdict = await manager.getRepository(VerdictRecord).findOne({ where: { runId: round.runId }, order: { id: 'DESC' } });
    const decision = await manager.getRepository(Decision).save(
      manager.getRepository(Decision).create({
        comparisonId: id,
        runId: round.runId,
        reviewId: round.id,
        policyVersion: policy.version,
        verdictId: verdict?.id ?? null,
        outcome: input.outcome,
        rationale: input.rationale,
        conditions: input.conditions ? input.conditions : null,
        effectiveDate: input.effectiveDate ?? null,
        decidedById: actor.id,
        decidedByName: actor.name,
        decidedByEmail: actor.email,
        tally,
        acknowledgedAgainstRecord: withoutQuorum || againstMajority || againstChoice.length > 0,
        strategy,
        chosen,
        createdAt: now(),
      }),
    );
    await transition(manager, comparison, workflowSteps.decide.from, 'decided', {
      actor,
      action: 'comparison.decided',
      details: {
        decisionId: decision.id,
        outcome: decision.outcome,
        rationale: decision.rationale,
        conditions: decision.conditions,
        effectiveDate: decision.effectiveDate,
        runId: decision.runId,
        reviewId: round.id,
        policyVersion: policy.version,
        verdictId: decision.verdictId,
        votes: tally,
        acknowledgedAgainstRecord: decision.acknowledgedAgainstRecord,
        keepChampion: strategy ? strategy.keepChampion : null,
        ...(strategy?.challengerName !== undefined ? { strategyChallenger: strategy.challenger, strategyChallengerName: strategy.challengerName } : {}),
        chosen,
      },
    });
    // The pack as decided, kept with the decision; its SHA-256 goes in the audit trail.
    await archive(decision.id);
    const link = comparisonLink(ctx.config.publicUrl, id, 'report');
    // Everyone on the record: the authors (creator, uploaders, set-up people, submitters), the
    // reviewers and the voters; the decider knows.
    const onRecord = new Set<number>(await authorsOf(manager, comparison));
    for (const review of await manager.getRepository(Review).find({ where: { comparisonId: id }, select: { id: true, reviewerId: true } })) onRecord.add(review.reviewerId);
    for (const vote of await manager.getRepository(Vote).find({ where: { comparisonId: id }, select: { id: true, voterId: true } })) onRecord.add(vote.voterId);
    onRecord.delete(actor.id);
    const recipients = await manager.getRepository(User).find({ where: { id: In([...onRecord]), active: true }, order: { id: 'ASC' } });
    await queueAll(
      ctx,
      manager,
      recipients.map((person) =>
        decidedMail({
          to: person.email,
          name: person.name,
          comparison: comparison.name,
          link,
          decidedBy: actor.name,
          outcome: decision.outcome,
          rationale: decision.rationale,
          conditions: decision.conditions,
          effectiveDate: decision.effectiveDate,
          strategy,
          adopted: chosen?.model === 'challenger' && challengersOf(run.mapping).length > 1 ? chosen.name : null,
        }),
      ),
    );
  });
  ctx.mailer.kick();
  return getGovernance(ctx, id);
}

/** Everything the review & decision page needs. */
export async function getGovernance(ctx: Pick<AppContext, 'dataSource'>, id: number): Promise<Governance> {
  const source = ctx.dataSource;
  const comparison = await findComparison(source, id);
  const reviews = await source.getRepository(Review).find({ where: { comparisonId: id }, order: { id: 'DESC' }, relations: { reviewer: true } });
  const round = reviews[0]?.outcome === 'validated' ? reviews[0] : null;
  const votes = round ? await countingVotes(source, round.id) : [];
  const decision = await source.getRepository(Decision).findOne({ where: { comparisonId: id }, relations: { decidedBy: true } });
  const decidedRun = decision ? await source.getRepository(AnalysisRun).findOne({ where: { id: decision.runId }, select: { id: true, mapping: true } }) : null;
  const roundRun = round ? await source.getRepository(AnalysisRun).findOne({ where: { id: round.runId }, select: { id: true, mapping: true } }) : null;
  const mapping = roundRun?.mapping ?? comparison.mapping;
  const adoptVotesByChallenger = new Array<number>(mapping ? challengersOf(mapping).length : 1).fill(0);
  for (const vote of votes) if (vote.vote === 'adopt' && (vote.challenger ?? 0) < adoptVotesByChallenger.length) adoptVotesByChallenger[vote.challenger ?? 0]++;
  const verdicts = await source
    .getRepository(VerdictRecord)
    .find({ where: { comparisonId: id }, order: { id: 'DESC' }, relations: { createdBy: true } });
  const policy = await governingPolicy(source, comparison);
  const authors = await authorRefs(source, await authorsOf(source, comparison));
  const tally = tallyOf(votes);
  return {
    state: comparison.state,
    createdBy: { id: comparison.createdBy.id, name: comparison.createdBy.name },
    reviews: reviews.map(presentReview),
    votes: votes.map(presentVote),
    decision: decision ? presentDecision(decision, decidedRun?.mapping ?? null) : null,
    verdicts: verdicts.map(presentVerdictRecord),
    quorum: policy.quorum,
    policyVersion: policy.version,
    tally,
    majority: majorityOf(tally),
    adoptVotesByChallenger,
    authors,
  };
}

/**
 * The challenger a vote or decision for adoption names (several challengers), checked against the
 * validated run's challengers: null for keep and defer (400 when one is named); absent = the
 * primary, except with two or more challengers, where it must be named (409).
 */
async function challengerChosen(
  manager: EntityManager,
  runId: number,
  choice: VoteChoice,
  index: number | undefined,
  act: 'vote' | 'decision',
): Promise<{ challenger: number; name: string } | null> {
  if (choice !== 'adopt') {
    if (index !== undefined) throw new AppError(errorCodes.badInput, `Only a ${act} to adopt names a challenger; this ${act} is “${voteChoiceLabels[choice]}”.`, 400);
    return null;
  }
  const run = await manager.getRepository(AnalysisRun).findOneOrFail({ where: { id: runId }, select: { id: true, mapping: true } });
  const challengers = challengersOf(run.mapping);
  if (index === undefined) {
    if (challengers.length > 1) {
      throw conflict(`This comparison has ${challengers.length} challengers (${challengers.map((c, k) => `${k}: ${c.name}`).join(', ')}); name the one to adopt.`);
    }
    return { challenger: 0, name: challengers[0].name };
  }
  if (index >= challengers.length) {
    throw new AppError(errorCodes.badInput, noSuchChallengerMessage(index, challengers.length), 400);
  }
  return { challenger: index, name: challengers[index].name };
}

/**
 * Why adopting this challenger goes against the record, with two or more challengers: the run's
 * newest verdict record does not support it, or the adopt votes name another challenger strictly
 * more often. Empty with one challenger (a two-model decision reads as before).
 */
async function againstTheChoice(manager: EntityManager, runId: number, chosen: { challenger: number; name: string }, votes: readonly Vote[]): Promise<string[]> {
  const verdict = await manager.getRepository(VerdictRecord).findOne({ where: { runId }, order: { id: 'DESC' } });
  const challengers = verdict?.challengers ?? [];
  if (challengers.length < 2) return [];
  const why: string[] = [];
  const own = challengers[chosen.challenger];
  if (own && own.outcome !== 'supported') {
    why.push(`the verdict (policy version ${verdict!.policyVersion}) does not support ${chosen.name} (${verdictWords[own.outcome]})`);
  }
  const counts = new Array<number>(challengers.length).fill(0);
  for (const vote of votes) if (vote.vote === 'adopt' && (vote.challenger ?? 0) < counts.length) counts[vote.challenger ?? 0]++;
  const most = Math.max(...counts);
  const leaders = counts.flatMap((count, index) => (count === most && most > 0 ? [index] : []));
  if (leaders.length === 1 && leaders[0] !== chosen.challenger) {
    why.push(`the votes to adopt name ${challengers[leaders[0]].name} most often (${most} of ${counts.reduce((a, b) => a + b, 0)})`);
  }
  return why;
}

const verdictWords: Record<VerdictOutcome, string> = { supported: 'supported', 'not-proven': 'not proven', 'champion-better': 'the champion is better' };

/** Votes per choice, every choice present. */
export function tallyOf(votes: readonly Pick<Vote, 'vote'>[]): Record<VoteChoice, number> {
  const counts = Object.fromEntries(voteChoices.map((choice) => [choice, 0])) as Record<VoteChoice, number>;
  for (const vote of votes) counts[vote.vote] += 1;
  return counts;
}

/** The choice with strictly the most votes; null without votes or on a tie. */
export function majorityOf(tally: Record<VoteChoice, number>): VoteChoice | null {
  const sorted = voteChoices.map((choice) => [choice, tally[choice]] as const).sort((a, b) => b[1] - a[1]);
  if (sorted[0][1] === 0 || sorted[0][1] === sorted[1][1]) return null;
  return sorted[0][0];
}

function tallyText(tally: Record<VoteChoice, number>): string {
  return voteChoices.map((choice) => `${tally[choice]} ${choice}`).join(', ');
}
