import { describe, expect, it } from 'vitest';
import { type AnalysisRun } from '@shared/comparisons';
import { bodyShowsNextStep, comparisonPageState, type PageStateInput } from '@/features/comparisons/lib/page-state';

// The comparison frame's choice among its page states (src/features/comparisons/lib/page-state.ts),
// case by case; expected states worked out by hand from the rules in its header.

const run = (id: number, status: AnalysisRun['status']) => ({ id, status }) as AnalysisRun;
function input(runs: AnalysisRun[], options: { currentRunId?: number | null; active?: boolean; loaded?: boolean; pending?: boolean; errorStatus?: number | null } = {}): PageStateInput {
  return {
    comparison: { runs, currentRunId: options.currentRunId ?? null },
    active: options.active ?? false,
    report: { loaded: options.loaded ?? false, pending: options.pending ?? false, errorStatus: options.errorStatus ?? null },
  };
}

describe('the comparison page state', () => {
  it('shows the report once it is loaded, noting a newer run that is working', () => {
    expect(comparisonPageState(input([run(1, 'done')], { currentRunId: 1, loaded: true }))).toEqual({ kind: 'report', newRunActive: false });
    expect(comparisonPageState(input([run(2, 'running'), run(1, 'done')], { currentRunId: 1, loaded: true, active: true }))).toEqual({ kind: 'report', newRunActive: true });
  });

  it('shows the progress while the first analysis works, with the wizard steps only for the very first run', () => {
    expect(comparisonPageState(input([run(1, 'queued')], { active: true, pending: true }))).toEqual({ kind: 'running', firstRun: true });
    expect(comparisonPageState(input([run(2, 'running'), run(1, 'failed')], { active: true, pending: true }))).toEqual({ kind: 'running', firstRun: false });
  });

  it('shows the failure when the newest run failed and none is done', () => {
    expect(comparisonPageState(input([run(1, 'failed')], { pending: true }))).toEqual({ kind: 'failed' });
    // A failed re-run of a comparison with a done run still shows that run's report once loaded.
    expect(comparisonPageState(input([run(2, 'failed'), run(1, 'done')], { currentRunId: 1, pending: true }))).toEqual({ kind: 'loading-report' });
  });

  it('says "not mapped yet" without any run, and tells a 409 apart from other errors', () => {
    expect(comparisonPageState(input([], { pending: true }))).toEqual({ kind: 'not-mapped' });
    expect(comparisonPageState(input([run(1, 'done')], { currentRunId: 1, errorStatus: 409 }))).toEqual({ kind: 'no-finished-report' });
    expect(comparisonPageState(input([run(1, 'done')], { currentRunId: 1, errorStatus: 500 }))).toEqual({ kind: 'report-error' });
    expect(comparisonPageState(input([run(1, 'done')], { currentRunId: 1 }))).toEqual({ kind: 'report-error' });
  });

  it('lets the progress or failure panel stand as the next step only while there is no report', () => {
    expect(bodyShowsNextStep(input([run(1, 'running')], { active: true }))).toBe(true);
    expect(bodyShowsNextStep(input([run(1, 'failed')]))).toBe(true);
    expect(bodyShowsNextStep(input([run(2, 'failed'), run(1, 'done')], { currentRunId: 1, loaded: true }))).toBe(false);
    expect(bodyShowsNextStep(input([run(1, 'done')], { currentRunId: 1 }))).toBe(false);
  });
});
