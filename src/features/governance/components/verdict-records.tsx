import { type VerdictRecord } from '@shared/governance';
import { type VerdictOutcome } from '@shared/report';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { StatusBadge, type Tone } from '@/components/status-badge';
import { useReEvaluateVerdict } from '@/features/governance/api/re-evaluate-verdict';

const outcomeWords: Record<VerdictOutcome, [string, Tone]> = {
  supported: ['Challenger supported', 'good'],
  'not-proven': ['Not proven', 'caution'],
  'champion-better': ['Champion better', 'bad'],
};

export function VerdictOutcomeBadge({ outcome }: { outcome: VerdictOutcome }) {
  const [word, tone] = outcomeWords[outcome];
  return <StatusBadge tone={tone}>{word}</StatusBadge>;
}

/**
 * Every verdict given on this comparison, newest first, each under the policy version it used. A
 * stored verdict never changes when the policy does; re-evaluating adds one under the current policy.
 */
export function VerdictRecords({
  comparisonId,
  records,
  currentRunId,
  canReEvaluate,
  showCriteria = false,
}: {
  comparisonId: number;
  records: VerdictRecord[];
  currentRunId: number | null;
  canReEvaluate: boolean;
  showCriteria?: boolean;
}) {
  const reEvaluate = useReEvaluateVerdict(comparisonId);
  return (
    <div className="space-y-3">
      {canReEvaluate ? (
        <div className="flex flex-wrap items-center gap-3 print:hidden">
          <Button size="sm" onClick={() => reEvaluate.mutate()} loading={reEvaluate.isPending} loadingText="Re-evaluating…">
            Re-evaluate under the current policy
          </Button>
          <span className="text-sm text-ink-soft">Adds a record; the ones below stay as they were.</span>
        </div>
      ) : null}
      {reEvaluate.isError ? (
        <Alert tone="error" title="The verdict was not re-evaluated">
          <p>{errorMessage(reEvaluate.error)}</p>
        </Alert>
      ) : null}
      {records.length === 0 ? <p className="text-sm text-ink-soft">No verdict has been recorded yet.</p> : null}
      <ol className="divide-y divide-line rounded-md border border-line bg-paper-raised">
        {records.map((record) => (
          <li key={record.id} className="break-inside-avoid px-4 py-3 text-sm" data-testid="verdict-record">
            <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
              <VerdictOutcomeBadge outcome={record.outcome} />
              <span className="font-medium text-ink">Policy version {record.policyVersion}</span>
              <span className="text-ink-soft">
                run {record.runId}
                {record.runId === currentRunId ? ' (current)' : ''} · {record.createdBy ? `re-evaluated by ${record.createdBy.name}` : 'when the analysis finished'} ·{' '}
                <time dateTime={isoDateTime(record.createdAt)}>{formatDateTime(record.createdAt)}</time>
              </span>
            </div>
            <p className="mt-1 text-ink-soft">{record.summary}</p>
            {record.challengers.length >= 2 ? (
              <div className="mt-2 space-y-1" data-testid="verdict-record-challengers">
                <ul className="flex flex-wrap gap-x-4 gap-y-1">
                  {record.challengers.map((challenger) => (
                    <li key={challenger.challenger} className="inline-flex items-center gap-1.5">
                      <span className="text-ink">{challenger.name}</span>
                      <VerdictOutcomeBadge outcome={challenger.outcome} />
                      {record.recommended === challenger.challenger ? <span className="text-xs font-medium text-good-strong">recommended</span> : null}
                    </li>
                  ))}
                </ul>
                {record.choiceSummary ? <p className="text-ink">{record.choiceSummary}</p> : null}
              </div>
            ) : null}
            {showCriteria ? (
              <ul className="mt-2 space-y-1">
                {record.criteria.map((criterion) => (
                  <li key={criterion.id} className="flex gap-2">
                    <span className={criterion.met ? 'w-16 shrink-0 font-medium text-good-strong' : 'w-16 shrink-0 font-medium text-bad-strong'}>
                      {criterion.met ? 'Met' : 'Not met'}
                    </span>
                    <span>
                      <span className="font-medium text-ink">{criterion.label}</span>: {criterion.detail}
                    </span>
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ol>
    </div>
  );
}
