import { type ComparisonState } from '@shared/comparisons';
import { cn } from '@/lib/cn';
import { CheckCircleIcon } from '@/components/icons';
import { stations } from '@/features/governance/lib/workflow';

/**
 * Where the comparison stands on its way to a decision: the stations in order, the current one
 * marked with words (not colour alone). A returned comparison goes back to set-up and analysis.
 */
export function WorkflowProgress({ state }: { state: ComparisonState }) {
  const currentIndex = state === 'returned' ? stations.findIndex((station) => station.state === 'in-review') : stations.findIndex((station) => station.state === state);
  return (
    <div className="space-y-2">
      <ol className="flex flex-wrap gap-x-1 gap-y-2 text-sm" aria-label="Workflow">
        {stations.map((station, index) => {
          const done = index < currentIndex || (state === 'decided' && index === currentIndex);
          const current = index === currentIndex && state !== 'decided';
          return (
            <li key={station.state} className="flex items-center gap-1">
              {index > 0 ? <span aria-hidden="true" className="px-1 text-ink-faint">→</span> : null}
              <span
                aria-current={current ? 'step' : undefined}
                className={cn(
                  'inline-flex items-center gap-1 rounded-md border px-2 py-1',
                  current ? 'border-court-400 bg-court-50 font-semibold text-court-800' : done ? 'border-line bg-paper-raised text-ink' : 'border-dashed border-line text-ink-soft',
                )}
              >
                {done ? <CheckCircleIcon className="size-4 text-good" /> : null}
                {station.label}
                {current ? <span className="sr-only"> (current step)</span> : null}
                {done ? <span className="sr-only"> (done)</span> : null}
              </span>
            </li>
          );
        })}
      </ol>
      {state === 'returned' ? (
        <p className="text-sm text-caution-strong">Returned by the analyst: the modeler changes the set-up, runs the analysis again and resubmits it.</p>
      ) : null}
    </div>
  );
}
