import { type ComparisonDetail } from '@shared/comparisons';

/**
 * What the comparison's frame shows in place of its tabs' content (app/routes/comparisons/
 * layout.tsx renders it): the report's pages (with a note when a newer run is working), the
 * progress of the first analysis, its failure, "not mapped yet", the report loading, "no finished
 * report" (the server answered 409: a new run raced the page), or an error loading the report.
 */
export type ComparisonPageState =
  | { kind: 'report'; newRunActive: boolean }
  | { kind: 'running'; firstRun: boolean }
  | { kind: 'failed' }
  | { kind: 'not-mapped' }
  | { kind: 'loading-report' }
  | { kind: 'no-finished-report' }
  | { kind: 'report-error' };

export interface PageStateInput {
  comparison: Pick<ComparisonDetail, 'runs' | 'currentRunId'>;
  /** The newest run is queued or running (get-comparison.ts `isRunActive`). */
  active: boolean;
  report: { loaded: boolean; pending: boolean; errorStatus: number | null };
}

/** Chooses among the page states; the first that applies wins, in the order of the type above. */
export function comparisonPageState({ comparison, active, report }: PageStateInput): ComparisonPageState {
  const latest = comparison.runs[0] ?? null;
  if (report.loaded) return { kind: 'report', newRunActive: active && latest !== null };
  if (active && latest) return { kind: 'running', firstRun: comparison.currentRunId === null && comparison.runs.length === 1 };
  if (latest?.status === 'failed' && comparison.currentRunId === null) return { kind: 'failed' };
  if (comparison.runs.length === 0) return { kind: 'not-mapped' };
  if (report.pending) return { kind: 'loading-report' };
  if (report.errorStatus === 409) return { kind: 'no-finished-report' };
  return { kind: 'report-error' };
}

/**
 * With no report loaded and the newest run working or failed, the body's progress or failure
 * panel is the next step, so the header offers no second way on ("Change mapping or settings").
 */
export function bodyShowsNextStep({ comparison, active, report }: PageStateInput): boolean {
  return !report.loaded && (active || comparison.runs[0]?.status === 'failed');
}
