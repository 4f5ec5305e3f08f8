import type { ComparisonHeadline } from '@shared/comparisons';
import type { Verdict } from '@shared/report';
import type { ChoiceRecord } from '../jobs/messages';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { AnalysisRun, Comparison } from '../db/entities/index';
import { storageFailureKind } from '../db/storage-errors';
import { inTransaction } from '../db/transaction';
import { comparisonLink } from '../governance/links';
import { recordRunVerdict } from '../governance/verdicts';
import type { Mailer } from '../mail/mailer';
import { analysisFinishedMail } from './mail';
import { creatorOf } from './people';
import { transition } from './state';

/**
 * The one place where a finished analysis run is handled, on the main thread, inside one
 * transaction: the run's result (report, headline) or its error, the comparison's
 * state change (draft → analysed when the newest run of a draft comparison is done; a failed run
 * leaves it draft), the audit event, and the e-mail to the comparison's creator.
 *
 * A done run's verdict is stored as a verdict record (governance/verdicts.ts) in the same
 * transaction.
 */

export type RunOutcome =
  | {
      status: 'done';
      report: string;
      engineVersion: string;
      headline: ComparisonHeadline;
      verdict: Verdict;
      /** Several challengers: every challenger's verdict and the recommended one; absent or null for none. */
      choice?: ChoiceRecord | null;
    }
  | { status: 'failed'; error: string };

export interface FinishContext {
  mailer?: Mailer;
  publicUrl?: string;
}

export async function recordFinishedRun(manager: EntityManager, runId: number, outcome: RunOutcome, context: FinishContext = {}): Promise<AnalysisRun> {
  const run = await manager.findOneByOrFail(AnalysisRun, { id: runId });
  const finishedAt = now();
  if (outcome.status === 'done') {
    await manager.update(
      AnalysisRun,
      { id: runId },
      {
        status: 'done',
        progress: 1,
        stage: 'Done',
        error: null,
        engineVersion: outcome.engineVersion,
        report: outcome.report,
        headline: outcome.headline,
        finishedAt,
      },
    );
  } else {
    await manager.update(AnalysisRun, { id: runId }, { status: 'failed', stage: 'Failed', error: outcome.error, finishedAt });
  }

  await recordAudit(manager, {
    actor: null,
    action: outcome.status === 'done' ? 'analysis.done' : 'analysis.failed',
    target: { type: 'comparison', id: run.comparisonId },
    details:
      outcome.status === 'done'
        ? {
            runId,
            attempts: run.attempts,
            engineVersion: outcome.engineVersion,
            deltaGini: outcome.headline.deltaGini,
            pOneSided: outcome.headline.pOneSided,
            verdict: outcome.verdict.outcome,
            policyVersion: outcome.verdict.policyVersion,
          }
        : { runId, attempts: run.attempts, error: outcome.error },
  });

  const comparison = await manager.findOneByOrFail(Comparison, { id: run.comparisonId });
  const newest = await manager.findOne(AnalysisRun, { where: { comparisonId: run.comparisonId }, order: { id: 'DESC' }, select: { id: true } });
  if (outcome.status === 'done' && newest?.id === runId && comparison.state === 'draft') {
    await transition(manager, comparison, ['draft'], 'analysed', { actor: null, action: 'comparison.analysed', details: { runId } });
  } else {
    await manager.update(Comparison, { id: comparison.id }, { updatedAt: finishedAt });
  }

  // The verdict record of a done run: the report's verdict under the policy version it names.
  if (outcome.status === 'done') await recordRunVerdict(manager, run, outcome.verdict, outcome.choice ?? null);

  if (context.mailer && newest?.id === runId) {
    for (const creator of await creatorOf(manager, comparison)) {
      await context.mailer.queue(
        manager,
        analysisFinishedMail({
          to: creator.email,
          name: creator.name,
          comparison: comparison.name,
          link: comparisonLink(context.publicUrl ?? '', comparison.id),
          outcome: outcome.status === 'done' ? { status: 'done', headline: outcome.headline } : { status: 'failed', error: outcome.error },
          choice: outcome.status === 'done' ? (outcome.choice ?? null) : null,
        }),
      );
    }
  }
  return manager.findOneByOrFail(AnalysisRun, { id: runId });
}

/**
 * A run whose result could not be stored (the disk is full, the database failed) is marked failed
 * with the reason, instead of staying "running" until the next restart. The reason is short, so
 * this small write often succeeds where the large result did not; if it fails too, the run stays
 * as it was and start-up's recovery (jobs/runner.ts) settles it. Returns whether it was stored.
 */
export async function recordUnstoredRun(dataSource: DataSource, runId: number, cause: unknown, context: FinishContext = {}): Promise<boolean> {
  const kind = storageFailureKind(cause);
  const why =
    kind === 'full'
      ? 'the server had no disk space left to store its result'
      : kind === 'unavailable'
        ? 'the server could not write its result to storage'
        : `its result could not be stored (${cause instanceof Error ? cause.message : String(cause)})`;
  try {
    await inTransaction(dataSource, async (manager) => {
      const run = await manager.findOneBy(AnalysisRun, { id: runId });
      if (!run || run.status !== 'running') return;
      await recordFinishedRun(manager, runId, { status: 'failed', error: `The analysis finished, but ${why}. Nothing of the result was kept; run it again once the administrator has fixed the storage.` }, context);
    });
    context.mailer?.kick();
    return true;
  } catch {
    return false;
  }
}
