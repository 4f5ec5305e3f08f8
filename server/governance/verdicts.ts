import type { VerdictRecord as VerdictRecordBody } from '@shared/governance';
import type { Report, SwapSets, Verdict } from '@shared/report';
import type { EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { preparedCacheFor } from '../comparisons/prepared-cache';
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
export async function recordRunVerdict(manager: EntityManager, run: Pick<AnalysisRun, 'id' | 'comparisonId'>, given: Verdict): Promise<VerdictRecord> {
  return storeVerdict(manager, run, given, null, 'analysis');
}

async function storeVerdict(
  manager: EntityManager,
  run: Pick<AnalysisRun, 'id' | 'comparisonId'>,
  given: Verdict,
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
      createdById: actor?.id ?? null,
      createdAt: now(),
    }),
  );
  await recordAudit(manager, {
    actor,
    action: 'verdict.recorded',
    target: { type: 'comparison', id: run.comparisonId },
    details: { verdictId: record.id, runId: run.id, policyVersion: given.policyVersion, outcome: given.outcome, reason },
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
  const entry = await preparedCacheFor(ctx.dataSource).get(ctx.dataSource, run);
  return swapSets(entry.data, { basis: 'approval-rate', approvalRate }, entry.settings.confidence);
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
  const judged = verdict(report, policy, swap);
  const record = await inTransaction(ctx.dataSource, (manager) => storeVerdict(manager, run, judged, actor, 're-evaluation'));
  const stored = await ctx.dataSource.getRepository(VerdictRecord).findOneOrFail({ where: { id: record.id }, relations: { createdBy: true } });
  return presentVerdictRecord(stored);
}
