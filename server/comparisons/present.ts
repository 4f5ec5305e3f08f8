import { isoOrNull } from '@shared/format';
import type { AnalysisRun as AnalysisRunBody, ComparisonDetail, ComparisonSummary, CurrentVerdict } from '@shared/comparisons';
import type { AnalysisRun, Comparison } from '../db/entities/index';

/** Comparisons and runs as the API shows them (shared/comparisons.ts). Relations `createdBy` and `holdout` must be loaded. */


export function presentRun(run: AnalysisRun): AnalysisRunBody {
  return {
    id: run.id,
    status: run.status,
    progress: run.progress,
    stage: run.stage,
    attempts: run.attempts,
    error: run.error,
    engineVersion: run.engineVersion,
    queuedAt: run.queuedAt.toISOString(),
    startedAt: isoOrNull(run.startedAt),
    finishedAt: isoOrNull(run.finishedAt),
  };
}

export function presentSummary(
  comparison: Comparison,
  latestRun: AnalysisRun | null,
  currentRun: AnalysisRun | null,
  verdict: CurrentVerdict | null,
  decided: ComparisonSummary['decided'] = null,
): ComparisonSummary {
  return {
    id: comparison.id,
    name: comparison.name,
    state: comparison.state,
    createdBy: { id: comparison.createdBy.id, name: comparison.createdBy.name },
    createdAt: comparison.createdAt.toISOString(),
    updatedAt: comparison.updatedAt.toISOString(),
    holdout: { id: comparison.holdout.id, fileName: comparison.holdout.fileName, rowCount: comparison.holdout.rowCount },
    latestRun: latestRun ? { id: latestRun.id, status: latestRun.status, progress: latestRun.progress, stage: latestRun.stage } : null,
    headline: currentRun?.headline ?? null,
    verdict,
    decided: comparison.state === 'decided' ? decided : null,
  };
}

/** `runs` newest first. */
export function presentDetail(
  comparison: Comparison,
  runs: AnalysisRun[],
  authors: ReadonlySet<number>,
  verdict: CurrentVerdict | null,
  decided: ComparisonSummary['decided'] = null,
): ComparisonDetail {
  const current = runs.find((run) => run.status === 'done') ?? null;
  const summary = presentSummary(comparison, runs[0] ?? null, current, verdict, decided);
  return {
    ...summary,
    description: comparison.description,
    mapping: comparison.mapping,
    settings: comparison.settings,
    holdout: {
      id: comparison.holdout.id,
      fileName: comparison.holdout.fileName,
      sha256: comparison.holdout.sha256,
      bytes: comparison.holdout.bytes,
      rowCount: comparison.holdout.rowCount,
      uploadedAt: comparison.holdout.uploadedAt.toISOString(),
    },
    runs: runs.map(presentRun),
    currentRunId: current?.id ?? null,
    authorIds: [...authors].sort((a, b) => a - b),
  };
}
