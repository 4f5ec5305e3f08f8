import { type ComparisonState, type RunStatus, type ComparisonSummary, comparisonStateLabels } from '@shared/comparisons';
import { type VerdictOutcome } from '@shared/report';
import { type Tone } from '@/components/status-badge';

/** The badge of a comparison state: its word from shared/comparisons.ts and a tone (never alone). */
export const stateTones: Record<ComparisonState, Tone> = {
  draft: 'neutral',
  analysed: 'info',
  'in-review': 'pending',
  validated: 'good',
  returned: 'caution',
  decided: 'neutral',
};

export function stateLabel(state: ComparisonState): string {
  return comparisonStateLabels[state];
}

export const runStatusLabels: Record<RunStatus, string> = {
  queued: 'Queued',
  running: 'Running',
  done: 'Done',
  failed: 'Failed',
};

export const runStatusTones: Record<RunStatus, Tone> = { queued: 'pending', running: 'pending', done: 'good', failed: 'bad' };

export const verdictLabels: Record<VerdictOutcome, string> = {
  supported: 'Challenger supported',
  'not-proven': 'Not proven',
  'champion-better': 'Champion better',
};

export const verdictTones: Record<VerdictOutcome, Tone> = { supported: 'good', 'not-proven': 'caution', 'champion-better': 'bad' };

/** What the list shows beside the state while a run works or after it failed. */
export function runNote(summary: Pick<ComparisonSummary, 'latestRun'>): { tone: Tone; text: string } | null {
  const run = summary.latestRun;
  if (!run || run.status === 'done') return null;
  if (run.status === 'failed') return { tone: 'bad', text: 'Analysis failed' };
  return { tone: 'pending', text: run.status === 'queued' ? 'Analysis queued' : `Analysing ${Math.round(run.progress * 100)}%` };
}
