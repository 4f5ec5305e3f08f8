import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { CautionIcon, CheckIcon, ClockIcon, CrossIcon, DotIcon, InfoIcon } from '@/components/icons';

export type Tone = 'neutral' | 'info' | 'good' | 'caution' | 'bad' | 'pending';

const tones: Record<Tone, { className: string; Icon: (props: { className?: string }) => ReactNode }> = {
  neutral: { className: 'border-line-strong bg-paper-sunk text-ink-soft', Icon: DotIcon },
  info: { className: 'border-court-200 bg-court-50 text-court-700', Icon: InfoIcon },
  good: { className: 'border-good/40 bg-good-soft text-good-strong', Icon: CheckIcon },
  caution: { className: 'border-caution/40 bg-caution-soft text-caution-strong', Icon: CautionIcon },
  bad: { className: 'border-bad/40 bg-bad-soft text-bad-strong', Icon: CrossIcon },
  pending: { className: 'border-court-200 bg-paper-raised text-court-700', Icon: ClockIcon },
};

/**
 * A state in a word and a symbol (✓ met, ✕ not met, ! caution, • neutral, clock pending), with
 * colour as a third, redundant cue. The text is what a screen reader reads.
 */
export function StatusBadge({ tone = 'neutral', children, className }: { tone?: Tone; children: ReactNode; className?: string }) {
  const { className: toneClass, Icon } = tones[tone];
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1 rounded-sm border px-1.5 py-0.5 text-xs leading-4 font-medium whitespace-nowrap print:border-ink-faint print:bg-transparent',
        toneClass,
        className,
      )}
    >
      <Icon className="size-3.5 shrink-0" />
      <span>{children}</span>
    </span>
  );
}
