import type { VerdictRecord as VerdictRecordBody } from '@shared/governance';
import { choiceSummary, recommendedChallenger } from '@shared/choose-challenger';
import type { AdoptionPolicy } from '@shared/policy';
import { type Report, statedBadRate, type SwapSets, type Verdict } from '@shared/report';
import type { ChoiceRecord } from '../jobs/messages';
import { pairData } from '../stats/policy-data';
import type { EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { findComparison, requireCurrentRun } from '../comparisons/service';
import { conflict } from '../errors';
import type { AppContext } from '../context';
import { VerdictRecord, type AnalysisRun, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { currentPolicy } from '../policy/service';
import { swapSets } from '../stats/swap-sets';
import { verdict } from '../stats/verdict';
import { presentVerdictRecord } from './present';

/**
 * Verdict records: a run's verdict under one adoption-policy version, stored as given. The first
 * is written when the run finishes (the report's own verdict, under the version the run was
 * judged by); each re-evaluation judges the current run under the current policy and appends
 * another. A stored record is never changed, so a later policy never rewrites what was advised.
 */

/** Called by recordFinishedRun (comparisons/run-finished.ts) for a done run, in its transaction. */
export async function recordRunVerdict(manager: EntityManager, run: Pick<AnalysisRun, 'id' | 'comparisonId'>, given: Verdict, choice: ChoiceRecord | null = null): Promise<VerdictRecord> {
  return storeVerdict(manager, run, given, choice, null, 'analysis');
}

async function storeVerdict(
  manager: EntityManager,
  run: Pick<AnalysisRun, 'id' | 'comparisonId'>,
  given: Verdict,
  choice: ChoiceRecord | null,
  actor: User | null,
  reason: 'analysis' | 're-evaluation',
): Promise<VerdictRecord> {
  const repository = manager.getRepository(VerdictRecord);
  const record = await repository.save(
    repository.create({
      comparisonId: run.comparisonId,
      runId: run.id,
      policyVersion: given.policyVersion,
      outcome: given.outcome,
      criteria: given.criteria,
      summary: given.summary,
      challengers: choice?.challengers ?? null,
      recommended: choice?.recommended ?? null,
      choiceSummary: choice?.summary ?? null,
      createdById: actor?.id ?? null,
      createdAt: now(),
    }),
  );
  await recordAudit(manager, {
    actor,
    action: 'verdict.recorded',
    target: { type: 'comparison', id: run.comparisonId },
    details: {
      verdictId: record.id,
      runId: run.id,
      policyVersion: given.policyVersion,
      outcome: given.outcome,
      reason,
      // Several challengers: each one's outcome and the recommended one.
      ...(choice && choice.challengers.length > 1 ? { challengers: choice.challengers.map((challenger) => challenger.outcome), recommended: choice.recommended } : {}),
    },
  });
  return record;
}

/**
 * The swap sets the policy's swap rule needs: the report's own when they were matched to the
 * policy's approval rate, otherwise recomputed from the run's prepared data (cached per run).
 */
async function swapForPolicy(ctx: AppContext, run: AnalysisRun, report: Report, approvalRate: number): Promise<SwapSets> {
  const own = report.swap;
  if (own.basis === 'approval-rate' && own.requestedApprovalRate !== null && Math.abs(own.requestedApprovalRate - approvalRate) < 1e-12) return own;
  const entry = await ctx.preparedCache.get(ctx.dataSource, run);
  return swapSets(entry.data, { basis: 'approval-rate', approvalRate }, entry.settings.confidence);
}

/**
 * A stored report judged under a policy: the primary's verdict (with two or more challengers on
 * its Holm-adjusted p), and every challenger's with the recommended one (null for reports
 * before several challengers). `swaps[k]`: challenger k's swap sets at the policy's approval rate.
 */
export function judgeChallengers(report: Report, policy: AdoptionPolicy, swaps: readonly (SwapSets | null)[]): { judged: Verdict; choice: ChoiceRecord | null } {
  const challengers = report.challengers ?? [];
  const k = challengers.length;
  const multiplicity = (index: number) => ({ challengers: k, pOneSided: challengers[index].pOneSidedHolm, pTwoSided: challengers[index].pTwoSidedHolm });
  const judged = verdict(report, policy, swaps[0], k >= 2 ? multiplicity(0) : undefined);
  if (k === 0) return { judged, choice: null };
  const verdicts = challengers.map((challenger, index) =>
    index === 0
      ? judged
      : verdict(
          {
            bads: report.bads,
            settings: report.settings,
            difference: challenger.difference,
            swap: challenger.swap,
            segments: challenger.segments ?? [],
            calibration: challenger.calibration,
            stability: challenger.stability,
          },
          policy,
          swaps[index],
          multiplicity(index),
        ),
  );
  const candidates = challengers.map((challenger, index) => ({
    name: challenger.name,
    outcome: verdicts[index].outcome,
    gini: challenger.metrics.gini,
    swapInBadRate: statedBadRate((swaps[index] ?? challenger.swap).swapIn),
  }));
  const recommended = recommendedChallenger(candidates);
  return {
    judged,
    choice: {
      challengers: challengers.map((challenger, index) => ({
        challenger: index,
        column: challenger.column,
        name: challenger.name,
        outcome: verdicts[index].outcome,
        criteria: verdicts[index].criteria,
        summary: verdicts[index].summary,
      })),
      recommended,
      summary: choiceSummary(candidates, recommended, policy.version),
    },
  };
}

/** Judges the current run under the current policy → a new verdict record (409 while no run is done). */
export async function reEvaluate(ctx: AppContext, actor: User, comparisonId: number): Promise<VerdictRecordBody> {
  // After the decision the record is closed: the verdict the committee decided on stays the verdict.
  const { state } = await findComparison(ctx.dataSource, comparisonId);
  if (state === 'decided') {
    throw conflict('This comparison is decided: its record is closed, and the verdict the committee decided on stays its verdict. Start a new comparison to judge it again.');
  }
  const run = await requireCurrentRun(ctx.dataSource, comparisonId, true);
  if (run.report === null) throw new Error(`analysis run ${run.id} is done but has no report`);
  const report = JSON.parse(run.report) as Report;
  const policy = await currentPolicy(ctx.dataSource);
  // Slow work (decoding and preparing the run's data) stays outside the transaction.
  const swap = policy.swapRule.enabled ? await swapForPolicy(ctx, run, report, policy.swapRule.approvalRate) : null;
  const challengers = report.challengers ?? [];
  // Several challengers: each further one's swap sets at the policy's rate (its own when they match).
  const more: (SwapSets | null)[] = [];
  for (let k = 1; k < challengers.length; k++) {
    const own = challengers[k].swap;
    if (!policy.swapRule.enabled) more.push(null);
    else if (own.requestedApprovalRate !== null && Math.abs(own.requestedApprovalRate - policy.swapRule.approvalRate) < 1e-12) more.push(own);
    else {
      const entry = await ctx.preparedCache.get(ctx.dataSource, run);
      more.push(swapSets(pairData(entry.data, k), { basis: 'approval-rate', approvalRate: policy.swapRule.approvalRate }, entry.settings.confidence));
    }
  }
  const { judged, choice } = judgeChallengers(report, policy, [swap, ...more]);
  const record = await inTransaction(ctx.dataSource, (manager) => storeVerdict(manager, run, judged, choice, actor, 're-evaluation'));
  const stored = await ctx.dataSource.getRepository(VerdictRecord).findOneOrFail({ where: { id: record.id }, relations: { createdBy: true } });
  return presentVerdictRecord(stored);
}
