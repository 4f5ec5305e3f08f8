import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { CautionIcon, CheckCircleIcon, ClockIcon, InfoIcon } from '@/components/icons';
import { type NextStep } from '@/features/comparisons/lib/next-step';

const looks: Record<NextStep['kind'], { box: string; icon: ReactNode; word: string }> = {
  action: { box: 'border-court-300 bg-court-50', icon: <InfoIcon className="size-5 text-court-600" />, word: 'Your next step' },
  waiting: { box: 'border-line bg-paper-raised', icon: <ClockIcon className="size-5 text-ink-soft" />, word: 'Next' },
  problem: { box: 'border-bad/50 bg-bad-soft', icon: <CautionIcon className="size-5 text-bad-strong" />, word: 'Needs attention' },
  done: { box: 'border-good/40 bg-good-soft', icon: <CheckCircleIcon className="size-5 text-good-strong" />, word: 'Done' },
};

/** The next step for the person looking at the comparison, with its button when they can act. */
export function NextStepCallout({ step, action, className }: { step: NextStep; action?: ReactNode; className?: string }) {
  const look = looks[step.kind];
  return (
    <div data-testid="next-step" className={cn('flex flex-wrap items-center gap-3 rounded-lg border px-4 py-3', look.box, className)}>
      <span aria-hidden="true">{look.icon}</span>
      <div className="min-w-0 flex-1 text-sm">
        <p className="text-xs font-semibold tracking-wide text-ink-soft uppercase">{look.word}</p>
        <p className="font-semibold text-ink">{step.title}</p>
        <p className="text-ink-soft">{step.text}</p>
      </div>
      {action ? <div className="shrink-0 print:hidden">{action}</div> : null}
    </div>
  );
}
