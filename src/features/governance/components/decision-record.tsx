import { type Governance, voteChoiceLabels } from '@shared/governance';
import { chosenModelWords } from '@shared/challengers-words';
import { keptValuesText } from '@shared/mixed-strategy-words';
import { formatDate, formatDateTime, isoDateTime } from '@/lib/format';
import { StatusBadge } from '@/components/status-badge';
import { MixedStrategyView } from '@/features/governance/components/mixed-strategy-view';

/** The recorded decision, as the committee wrote it. */
export function DecisionRecord({ decision, several = false }: { decision: NonNullable<Governance['decision']>; several?: boolean }) {
  // With several challengers the decision names the model chosen (a two-model decision reads as before).
  const chosen = several ? chosenModelWords(decision.chosen) : null;
  return (
    <div className="space-y-3 text-sm" data-testid="decision">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <StatusBadge tone={decision.outcome === 'adopt' ? 'good' : decision.outcome === 'keep' ? 'neutral' : 'caution'}>
          {voteChoiceLabels[decision.outcome]}
        </StatusBadge>
        {chosen ? (
          <span className="font-medium text-ink" data-testid="decision-chosen">
            {decision.outcome === 'adopt' ? 'Adopted' : 'Kept'}: {chosen}
          </span>
        ) : null}
        {decision.strategy ? <span className="font-medium text-ink">except in {keptValuesText(decision.strategy)}, which keep the champion</span> : null}
        <span>
          recorded by <span className="font-medium text-ink">{decision.decidedBy.name}</span>,{' '}
          <time dateTime={isoDateTime(decision.createdAt)}>{formatDateTime(decision.createdAt)}</time>
        </span>
      </div>
      <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[10rem_1fr]">
        <dt className="text-ink-soft">Rationale</dt>
        <dd className="prewrap text-ink">{decision.rationale}</dd>
        <dt className="text-ink-soft">Conditions</dt>
        <dd className="prewrap text-ink">{decision.conditions ?? 'None'}</dd>
        <dt className="text-ink-soft">Effective from</dt>
        <dd className="text-ink">{decision.effectiveDate ? formatDate(`${decision.effectiveDate}T00:00:00Z`, 'UTC') : 'Not given'}</dd>
        <dt className="text-ink-soft">Evidence</dt>
        <dd className="text-ink">
          Analysis run {decision.runId}, adoption policy version {decision.policyVersion}
        </dd>
      </dl>
      {decision.strategy ? (
        <div className="space-y-2">
          <h3 className="font-medium text-ink">The strategy adopted, as computed when it was decided</h3>
          <MixedStrategyView strategy={decision.strategy} caption="The strategy adopted beside the champion and pure adoption" />
        </div>
      ) : null}
    </div>
  );
}
