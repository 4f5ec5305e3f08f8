import type { ComparisonHeadline } from '@shared/comparisons';
import type { AdoptionPolicy } from '@shared/policy';
import type { Report, SwapMatrix, Verdict } from '@shared/report';
import type { PreparedHoldout } from '../stats/policy-data';

/** What the main thread gives an analysis worker (workerData). */
export interface AnalysisJob {
  databasePath: string;
  runId: number;
  /** 1 for the first try. */
  attempt: number;
  policy: AdoptionPolicy;
}

/** What an analysis worker posts back. */
export type WorkerMessage =
  | { type: 'progress'; fraction: number; stage: string }
  | {
      type: 'done';
      /** The report as the JSON text the API serves. */
      report: string;
      engineVersion: string;
      headline: ComparisonHeadline;
      verdict: Verdict;
      /**
       * The data prepared for swap sets (its `order`s are stored; the whole is cached on the main
       * thread so the first swap request does not prepare it again). Transferred, not copied.
       */
      prepared: PreparedHoldout;
      swapMatrix: SwapMatrix;
    }
  /** `permanent`: the data or settings cannot give a report (trying again would fail the same way). */
  | { type: 'failed'; message: string; permanent: boolean };

/** The list's headline numbers, from a report. */
export function headlineOf(report: Report): ComparisonHeadline {
  return {
    rows: report.rows,
    bads: report.bads,
    championGini: report.champion.gini,
    challengerGini: report.challenger.gini,
    deltaGini: report.difference.gini,
    deltaGiniCi: report.difference.giniCi,
    pOneSided: report.difference.pOneSided,
    pTwoSided: report.difference.pTwoSided,
    verdict: report.verdict.outcome,
  };
}
