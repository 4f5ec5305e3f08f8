import type { Scenario, ScenarioInput } from '@shared/comparisons';
import { errorCodes } from '@shared/errors';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import type { AppContext } from '../context';
import { CutoffScenario, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { AppError } from '../errors';
import { findComparison } from './service';
import { preparedCurrentRun, swapAt, swapRequestOf } from './swap';

/** Cut-off scenarios: the policy role saves cut-offs or an approval rate with the swap sets they give on the current run. */

export function presentScenario(scenario: CutoffScenario): Scenario {
  return {
    id: scenario.id,
    name: scenario.name,
    cutoffs: { champion: scenario.championCutoff, challenger: scenario.challengerCutoff },
    approvalRate: scenario.approvalRate,
    note: scenario.note,
    swapIn: scenarioCell(scenario.swap.swapIn),
    swapOut: scenarioCell(scenario.swap.swapOut),
    createdBy: { id: scenario.createdBy.id, name: scenario.createdBy.name },
    createdAt: scenario.createdAt.toISOString(),
    afterDecision: scenario.afterDecision,
  };
}

/** Rows and known bad rate; accounts and the inferred bad rate when the holdout has weights or unknown outcomes. */
function scenarioCell(cell: CutoffScenario['swap']['swapIn']): Scenario['swapIn'] {
  if (cell.accounts === undefined) return { count: cell.count, badRate: cell.badRate };
  return { count: cell.count, badRate: cell.badRate, accounts: cell.accounts, inferredBadRate: cell.inferred?.badRate ?? null };
}

/** Newest first. */
export async function listScenarios(ctx: AppContext, comparisonId: number): Promise<{ scenarios: Scenario[] }> {
  await findComparison(ctx.dataSource, comparisonId);
  const scenarios = await ctx.dataSource
    .getRepository(CutoffScenario)
    .find({ where: { comparisonId }, relations: { createdBy: true }, order: { id: 'DESC' } });
  return { scenarios: scenarios.map(presentScenario) };
}

export async function saveScenario(ctx: AppContext, actor: User, comparisonId: number, input: ScenarioInput): Promise<Scenario> {
  if (input.cutoffs === null && input.approvalRate === null) {
    throw new AppError(errorCodes.validation, 'Give cut-offs or an approval rate.', 400, { issues: [{ location: 'body', path: 'cutoffs', message: 'Give cut-offs or an approval rate' }] });
  }
  const { run, entry } = await preparedCurrentRun(ctx, comparisonId);
  const request = swapRequestOf(input);
  const { swap } = swapAt(entry, request);
  const id = await inTransaction(ctx.dataSource, async (manager) => {
    const { state } = await findComparison(manager, comparisonId);
    const saved = await manager.save(
      manager.create(CutoffScenario, {
        comparisonId,
        runId: run.id,
        name: input.name,
        championCutoff: swap.champion.cutoff,
        challengerCutoff: swap.challenger.cutoff,
        approvalRate: request.basis === 'approval-rate' ? request.approvalRate : null,
        note: input.note,
        swap,
        createdById: actor.id,
        createdAt: now(),
        // After the decision the record is closed: a later scenario is kept, marked as such.
        afterDecision: state === 'decided',
      }),
    );
    await recordAudit(manager, {
      actor,
      action: 'scenario.saved',
      target: { type: 'comparison', id: comparisonId },
      details: {
        scenarioId: saved.id,
        runId: run.id,
        name: input.name,
        basis: swap.basis,
        cutoffs: { champion: swap.champion.cutoff, challenger: swap.challenger.cutoff },
        approvalRate: saved.approvalRate,
        swapIn: { count: swap.swapIn.count, bads: swap.swapIn.bads },
        swapOut: { count: swap.swapOut.count, bads: swap.swapOut.bads },
      },
    });
    return saved.id;
  });
  const saved = await ctx.dataSource.getRepository(CutoffScenario).findOneOrFail({ where: { id }, relations: { createdBy: true } });
  return presentScenario(saved);
}
