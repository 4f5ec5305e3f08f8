import { cn } from '@/lib/cn';
import { CheckIcon } from '@/components/icons';

export interface StepItem {
  key: string;
  label: string;
}

/**
 * Where a person is in a multi-step task: an ordered list of steps, the current one marked with
 * aria-current="step" and in words ("Step 3 of 6"), done steps with a tick.
 */
export function Steps({ steps, current, label = 'Steps', className }: { steps: StepItem[]; current: string; label?: string; className?: string }) {
  const index = Math.max(0, steps.findIndex((step) => step.key === current));
  return (
    <nav aria-label={label} className={cn('print:hidden', className)}>
      <p className="sr-only">{`Step ${index + 1} of ${steps.length}: ${steps[index]?.label ?? ''}`}</p>
      <ol className="flex flex-wrap gap-x-1 gap-y-2 text-sm">
        {steps.map((step, position) => {
          const state = position < index ? 'done' : position === index ? 'current' : 'later';
          return (
            <li key={step.key} aria-current={state === 'current' ? 'step' : undefined} className="flex items-center gap-1">
              <span
                className={cn(
                  'inline-flex items-center gap-2 rounded-full border py-1 pr-3 pl-1',
                  state === 'current' && 'border-court-700 bg-court-50 font-semibold text-court-800',
                  state === 'done' && 'border-line bg-paper-raised text-ink-soft',
                  state === 'later' && 'border-dashed border-line-strong text-ink-faint',
                )}
              >
                <span
                  aria-hidden="true"
                  className={cn(
                    'num inline-flex size-6 items-center justify-center rounded-full text-xs',
                    state === 'current' ? 'bg-court-700 text-white' : state === 'done' ? 'bg-good-soft text-good-strong' : 'bg-paper-sunk text-ink-soft',
                  )}
                >
                  {state === 'done' ? <CheckIcon className="size-3.5" /> : position + 1}
                </span>
                <span>
                  {step.label}
                  {state === 'done' ? <span className="sr-only"> (done)</span> : null}
                </span>
              </span>
              {position < steps.length - 1 ? (
                <span aria-hidden="true" className="mx-0.5 h-px w-3 bg-line-strong" />
              ) : null}
            </li>
          );
        })}
      </ol>
    </nav>
  );
}
