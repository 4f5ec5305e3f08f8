import { type Verdict } from '@shared/report';
import { verdictExplanation } from '@shared/verdict-words';
import { cn } from '@/lib/cn';
import { StatusBadge } from '@/components/status-badge';
import { verdictLabels, verdictTones } from '@/features/comparisons/lib/state-tone';


const frames: Record<Verdict['outcome'], string> = {
  supported: 'border-good/50',
  'not-proven': 'border-caution/50',
  'champion-better': 'border-bad/50',
};

/** The verdict in a word and a symbol, and the engine's one-sentence summary of the evidence. */
export function VerdictHeadline({ verdict, title = 'Verdict' }: { verdict: Pick<Verdict, 'outcome' | 'criteria' | 'summary' | 'policyVersion'>; title?: string }) {
  return (
    <section aria-labelledby="verdict-title" className={cn('space-y-3 rounded-lg border-2 bg-paper-raised p-5', frames[verdict.outcome])}>
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="verdict-title" className="text-sm font-semibold tracking-wide text-ink-soft uppercase">
          {title}
        </h2>
        <StatusBadge tone={verdictTones[verdict.outcome]} className="px-2 py-1 text-sm">
          {verdictLabels[verdict.outcome]}
        </StatusBadge>
      </div>
      <p className="max-w-4xl text-xl leading-snug font-medium text-ink" data-testid="verdict-summary">
        {verdict.summary}
      </p>
      <p className="text-sm text-ink-soft">{verdictExplanation(verdict)} Judged under adoption policy version {verdict.policyVersion}. The verdict advises; the committee decides.</p>
    </section>
  );
}
