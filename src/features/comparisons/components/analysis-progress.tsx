import { type ReactNode } from 'react';
import { type AnalysisRun } from '@shared/comparisons';
import { formatCount, formatDateTime, isoDateTime } from '@/lib/format';
import { Callout } from '@/components/callout';
import { ProgressBar } from '@/components/progress-bar';

/**
 * A run that is queued or working: its stage in words ("Bootstrap 1,200 of 2,000") and a progress
 * bar, polled by the page. The stage is announced politely when it changes, not every percent.
 */
export function AnalysisProgress({ run, children }: { run: Pick<AnalysisRun, 'status' | 'progress' | 'stage' | 'queuedAt' | 'startedAt' | 'attempts'>; children?: ReactNode }) {
  const queued = run.status === 'queued';
  const stage = run.stage ?? (queued ? 'Waiting for a free worker' : 'Working');
  return (
    <section aria-labelledby="analysis-progress-title" className="space-y-4 rounded-lg border border-line bg-paper-raised p-5">
      {children}
      <h2 id="analysis-progress-title" className="text-base font-semibold text-ink">
        {queued ? 'The analysis is queued' : 'The analysis is running'}
      </h2>
      <ProgressBar label={stage} value={queued ? null : run.progress} valueText={queued ? 'Queued' : `${Math.round(run.progress * 100)}%`} />
      <p className="sr-only" aria-live="polite">
        {stage}
      </p>
      <p className="text-sm text-ink-soft">
        Queued <time dateTime={isoDateTime(run.queuedAt)}>{formatDateTime(run.queuedAt)}</time>
        {run.startedAt ? (
          <>
            , started <time dateTime={isoDateTime(run.startedAt)}>{formatDateTime(run.startedAt)}</time>
          </>
        ) : null}
        {run.attempts > 1 ? `, attempt ${formatCount(run.attempts)}` : ''}. The verdict appears here when it finishes; you can leave this page and come
        back.
      </p>
    </section>
  );
}

/** A run that failed: its error in words and, for modelers, the way back to the mapping. */
export function AnalysisFailed({ run, action, hasEarlier }: { run: Pick<AnalysisRun, 'error' | 'finishedAt'>; action?: ReactNode; hasEarlier?: boolean }) {
  return (
    <Callout tone="error" title={hasEarlier ? 'The latest analysis failed' : 'The analysis failed'} actions={action}>
      <p className="font-medium">{run.error ?? 'It stopped without a message.'}</p>
      <p>
        {run.finishedAt ? (
          <>
            Stopped <time dateTime={isoDateTime(run.finishedAt)}>{formatDateTime(run.finishedAt)}</time>.{' '}
          </>
        ) : null}
        {hasEarlier ? 'The pages below show the previous run. ' : ''}
        {action ? 'Check the column mapping and settings, then run it again.' : 'A modeler can fix the mapping or settings and run it again.'}
      </p>
    </Callout>
  );
}
